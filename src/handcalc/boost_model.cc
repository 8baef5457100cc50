#include "handcalc/boost_model.h"

#include <algorithm>
#include <cmath>

#include "core/spice_number.h"

namespace zvsmap {

namespace {

constexpr double kPi = 3.14159265358979323846;

std::string N(double v) { return std::isnan(v) ? "n/a" : FormatEngineering(v, 4); }

constexpr const char* kSrcBoost =
    "Erickson & Maksimovic 2001, ch. 2 (volt-second and charge balance); netlists/references.md sec. 1";
constexpr const char* kSrcTcm = "netlists/references.md sec. 5 [derived]";
constexpr const char* kSrcZvs =
    "netlists/references.md sec. 5 [derived]; mirror image of sec. 2 (Vorperian, IEEE TPEL 3(2), 1988)";
constexpr const char* kSrcLinear =
    "Mohan, Undeland & Robbins 2003, soft-switching chapter; netlists/references.md sec. 2";

class Boost : public TopologyModel {
 public:
  std::string Name() const override { return "boost"; }
  std::string Assumptions() const override {
    return "synchronous boost, continuous conduction (current may reverse), ideal switches, "
           "constant Vin and Vout over a period, equal switches with linear Coss, resonant "
           "low-side transition; transition times neglected in the frequency";
  }
  std::vector<ModelInput> Inputs() const override {
    return {{"vin", "input voltage, V", true},
            {"vout", "output voltage, V", true},
            {"iout", "output current, A", true},
            {"l", "inductance, H", true},
            {"coss", "output capacitance per switch (linear), F", true},
            {"fsw", "switching frequency used, Hz", true},
            {"tcm", "1: triangular current mode (default 0)", false},
            {"ir", "chosen reverse current in triangular current mode, A", false},
            {"td_high", "dead time before the high-side turn-on, s (default: cell high_dead)",
             false},
            {"td_low", "dead time before the low-side turn-on, s (default: cell low_dead)",
             false}};
  }
  bool Predict(const ModelContext& ctx, std::vector<Prediction>* out,
               std::string* error) const override;
};

bool Boost::Predict(const ModelContext& ctx, std::vector<Prediction>* out,
                    std::string* error) const {
  if (!CheckRequiredInputs(*this, ctx, error)) return false;
  const double vin = ctx.Input("vin"), vo = ctx.Input("vout"), io = ctx.Input("iout"),
               l = ctx.Input("l"), coss = ctx.Input("coss"), fs = ctx.Input("fsw");
  if (!(vin > 0) || !(vo > vin) || !(l > 0) || !(coss > 0) || !(fs > 0) || !(io >= 0)) {
    *error = "model 'boost' needs 0 < vin < vout, positive l, coss, fsw and iout >= 0";
    return false;
  }
  const double tcm = ctx.Input("tcm"), ir = ctx.Input("ir");
  auto dead_time = [&](const char* input, const std::string& cell_param) -> double {
    if (ctx.bindings.count(input)) return ctx.Input(input);
    if (cell_param.empty()) return NAN;
    auto it = ctx.params->find(cell_param);
    return it == ctx.params->end() ? NAN : it->second;
  };
  const double td_high = dead_time("td_high", ctx.cell ? ctx.cell->high_dead : "");
  const double td_low = dead_time("td_low", ctx.cell ? ctx.cell->low_dead : "");

  // ---- Balances (Erickson & Maksimovic 2001, ch. 2).
  const double d = 1 - vin / vo;
  AddPrediction(out, "duty", d, "D = 1 - Vin/Vout (low switch)", kSrcBoost,
      {"D = 1 - " + N(vin) + "/" + N(vo) + " = " + N(d)});
  const double iin = vo * io / vin;
  AddPrediction(out, "i_in_a", iin, "Iin = Vout*Iout/Vin", kSrcBoost,
      {"Iin = " + N(vo) + " * " + N(io) + " / " + N(vin) + " = " + N(iin) + " A"});
  if (tcm == 1 && !std::isnan(ir)) {
    // Triangle from -IR to Ipk = 2*Iin + IR, rise Vin*D*T/L = 2*(Iin + IR).
    const double f = vin * (vo - vin) / (2 * l * vo * (iin + ir));
    AddPrediction(out, "f_tcm_hz", f, "fs = Vin*(Vout - Vin)/(2*L*Vout*(Iin + IR))", kSrcTcm,
        {"fs = " + N(vin) + " * " + N(vo - vin) + " / (2 * " + N(l) + " * " + N(vo) + " * (" +
         N(iin) + " + " + N(ir) + ")) = " + N(f) + " Hz (transition times neglected)"});
  }
  const double ripple = vin * d / (l * fs);
  AddPrediction(out, "ripple_a", ripple, "dI = Vin*D/(L*fs)", kSrcBoost,
      {"dI = " + N(vin) + " * " + N(d) + " / (" + N(l) + " * " + N(fs) + ") = " + N(ripple) +
       " A"});
  const double ipk = iin + ripple / 2, irev = ripple / 2 - iin;
  AddPrediction(out, "i_peak_a", ipk, "Ipk = Iin + dI/2", kSrcBoost, {"Ipk = " + N(ipk) + " A"});
  AddPrediction(out, "i_reverse_a", irev, "I_R = dI/2 - Iin (> 0: current flows back to the input)",
      kSrcBoost, {"I_R = " + N(irev) + " A"});
  const double q = coss * vo, ceq = 2 * coss;
  const double z = std::sqrt(l / ceq), w = 1 / std::sqrt(l * ceq);

  // ---- High-side turn-on: Ipk charges the node from 0 to Vout.
  {
    const std::string E = "high_on";
    Prediction& pc = AddPrediction(out, E + "_i_commutated_a", -ipk, "i = -Ipk (into the node)", kSrcBoost,
                         {"i_commutated = " + N(-ipk) + " A"}, E);
    pc.metric = "i_commutated_a";
    pc.tolerance = {0.1, 0.1};
    const double t = ipk > 0 ? 2 * q / ipk : NAN;
    Prediction& pt = AddPrediction(out, E + "_t_transition_s", 0.8 * t,
                         "t(10-90 %) = 0.8*2*Qoss(Vout)/Ipk (large current)", kSrcLinear,
                         {"t = 0.8 * 2 * " + N(q) + " / " + N(ipk) + " = " + N(0.8 * t) + " s"},
                         E);
    pt.metric = "t_transition_s";
    pt.tolerance = {0.1, 0.5e-9};
    const bool zvs = ipk > 0 && (std::isnan(td_high) || td_high >= t);
    Prediction& vz = AddPrediction(out, E + "_zvs_charge", zvs ? 1 : 0, "ZVS iff Ipk > 0 and td >= t",
                         kSrcLinear, {"Ipk = " + N(ipk) + " A, t = " + N(t) + " s"}, E);
    vz.metric = "zvs_full";
    vz.tolerance = {0, 0.5};
  }

  // ---- Low-side turn-on: the node falls from Vout, the inductor returns it
  // toward 2*Vin - Vout; ZVS iff 1/2*L*I_R^2 >= Qoss(Vout)*(2*Vin - Vout).
  {
    const std::string E = "low_on";
    const double i0 = std::max(0.0, irev);
    Prediction& pc = AddPrediction(out, E + "_i_commutated_a", irev, "i = I_R (out of the node)", kSrcBoost,
                         {"i_commutated = " + N(irev) + " A"}, E);
    pc.metric = "i_commutated_a";
    pc.tolerance = {0.1, 0.1};
    const double swing = std::max(0.0, 2 * vin - vo);
    const double i_zvs = std::sqrt(2 * q * swing / l);
    AddPrediction(out, E + "_i_zvs_a", i_zvs, "I_zvs = sqrt(2*Qoss(Vout)*(2*Vin - Vout)/L)", kSrcZvs,
        {"I_zvs = sqrt(2 * " + N(q) + " * " + N(swing) + " / " + N(l) + ") = " + N(i_zvs) +
         " A" + (swing == 0 ? " (Vin <= Vout/2: free)" : "")},
        E);
    // v(t) = Vin + (Vout - Vin)*cos wt - I0*Z*sin wt: lowest at
    // Vin - sqrt((Vout - Vin)^2 + (I0*Z)^2).
    const double amp = std::hypot(vo - vin, i0 * z);
    const double v_min = vin - amp;
    const double t_valley = (kPi - std::atan2(i0 * z, vo - vin)) / w;
    AddPrediction(out, E + "_v_valley_v", v_min, "v_min = Vin - sqrt((Vout - Vin)^2 + (I_R*Z)^2)",
        kSrcZvs, {"v_min = " + N(v_min) + " V at t = " + N(t_valley) + " s"}, E);
    double v_on = NAN;
    if (!std::isnan(td_low)) {
      if (v_min <= 0) {
        // Reaches zero at wt = acos((Vin)/amp)... first time v(t) = 0.
        const double phi = std::atan2(i0 * z, vo - vin);
        const double t0 = (std::acos(-vin / amp) - phi) / w;
        v_on = td_low >= t0 ? 0.0 : vin + amp * std::cos(w * td_low + phi);
      } else if (w * td_low <= 2 * kPi) {
        v_on = vin + amp * std::cos(w * td_low + std::atan2(i0 * z, vo - vin));
      }
    }
    Prediction& pv = AddPrediction(out, E + "_v_turn_on_v", v_on, "Vds(td) = v(td), clamped at 0",
                         kSrcZvs, {"td = " + N(td_low) + " s: v_turn_on = " + N(v_on) + " V"}, E);
    pv.metric = "v_turn_on_v";
    pv.tolerance = {0.05, 2.0};
    Prediction& vz =
        AddPrediction(out, E + "_zvs_charge", (i0 >= i_zvs && (irev >= 0 || swing == 0)) ? 1 : 0,
            "ZVS iff I_R >= I_zvs", kSrcZvs, {"I_R = " + N(irev) + " A vs " + N(i_zvs) + " A"}, E);
    vz.metric = "zvs_full";
    vz.tolerance = {0, 0.5};
  }
  return true;
}

}  // namespace

const TopologyModel& BoostModel() {
  static const Boost model;
  return model;
}

}  // namespace zvsmap
