#include "handcalc/fullbridge_psm_model.h"

#include <algorithm>
#include <cmath>

#include "core/spice_number.h"

namespace zvsmap {

namespace {

constexpr double kPi = 3.14159265358979323846;

std::string N(double v) { return std::isnan(v) ? "n/a" : FormatEngineering(v, 4); }

constexpr const char* kSrcSabate =
    "Sabate, Vlatkovic, Ridley, Lee & Cho, APEC 1990; netlists/references.md sec. 4";
constexpr const char* kSrcLagCharge = "netlists/references.md sec. 4 [derived] (charge-based)";
constexpr const char* kSrcDerived = "netlists/references.md sec. 4 [derived]";

class FullBridgePsm : public TopologyModel {
 public:
  std::string Name() const override { return "fullbridge_psm"; }
  std::string Assumptions() const override {
    return "phase-shift-modulated full bridge, continuous conduction, ideal transformer and "
           "rectifier, constant Vo, equal switches with linear Coss, C_TR across the bridge "
           "output; leading leg driven by the reflected load current, lagging leg by Lr alone";
  }
  std::vector<ModelInput> Inputs() const override {
    return {{"vin", "input voltage, V", true},
            {"vout", "output voltage, V", true},
            {"iout", "load current, A", true},
            {"fsw", "switching frequency, Hz", true},
            {"n", "turns ratio Np/Ns", true},
            {"lr", "series (leakage + added) inductance, H", true},
            {"lm", "magnetising inductance, H", true},
            {"lo", "output inductance, H", true},
            {"coss", "output capacitance per switch (linear), F", true},
            {"ctr", "transformer capacitance at the bridge terminals, F (default 0)", false},
            {"d", "commanded effective duty (default n*Vo/Vin + duty-cycle loss)", false},
            {"td", "the leg's dead time, s (default: the cell's high_dead)", false}};
  }
  bool Predict(const ModelContext& ctx, std::vector<Prediction>* out,
               std::string* error) const override;
};

bool FullBridgePsm::Predict(const ModelContext& ctx, std::vector<Prediction>* out,
                            std::string* error) const {
  if (!CheckRequiredInputs(*this, ctx, error)) return false;
  const double vin = ctx.Input("vin"), vo = ctx.Input("vout"), io = ctx.Input("iout"),
               fs = ctx.Input("fsw"), n = ctx.Input("n"), lr = ctx.Input("lr"),
               lm = ctx.Input("lm"), lo = ctx.Input("lo"), coss = ctx.Input("coss");
  double ctr = ctx.Input("ctr");
  if (std::isnan(ctr)) ctr = 0;
  if (!(vin > 0) || !(vo > 0) || !(n > 0) || !(n * vo < vin) || !(fs > 0) || !(lr > 0) ||
      !(lm > 0) || !(lo > 0) || !(coss > 0) || !(io >= 0) || !(ctr >= 0)) {
    *error = "model 'fullbridge_psm' needs 0 < n*vout < vin, positive fsw, lr, lm, lo, coss, "
             "iout >= 0 and ctr >= 0";
    return false;
  }
  double td = NAN;
  if (ctx.bindings.count("td")) {
    td = ctx.Input("td");
  } else if (ctx.cell && !ctx.cell->high_dead.empty()) {
    auto it = ctx.params->find(ctx.cell->high_dead);
    if (it != ctx.params->end()) td = it->second;
  }
  const bool lag = ctx.cell && ctx.cell->name.find("lag") != std::string::npos;

  // ---- Whole converter (Sabate et al., APEC 1990).
  const double d_loss = 4 * lr * fs * io / (n * vin);
  AddPrediction(out, "duty_loss", d_loss, "dD = 4*Lr*fs*Io/(n*Vin)", kSrcSabate,
      {"dD = 4 * " + N(lr) + " * " + N(fs) + " * " + N(io) + " / (" + N(n) + " * " + N(vin) +
       ") = " + N(d_loss)});
  double d = ctx.Input("d");
  if (std::isnan(d)) d = n * vo / vin + d_loss;
  const double vo_est = vin / n * (d - d_loss);
  AddPrediction(out, "vout_v", vo_est, "Vo = (Vin/n)*(D - dD) (rectifier drops neglected)", kSrcSabate,
      {"Vo = " + N(vin) + "/" + N(n) + " * (" + N(d) + " - " + N(d_loss) + ") = " + N(vo_est) +
       " V"});
  // The rectified voltage is Vin/n for Deff*T/2 of every half period, so the
  // output inductor ripples at 2*fs: dILo = Vo*(1 - Deff)/(2*Lo*fs), Deff = n*Vo/Vin.
  const double deff = n * vo / vin;
  const double ripple = vo * (1 - deff) / (2 * lo * fs);
  AddPrediction(out, "i_lo_ripple_a", ripple, "dILo = Vo*(1 - n*Vo/Vin)/(2*Lo*fs)", kSrcDerived,
      {"dILo = " + N(vo) + " * (1 - " + N(deff) + ") / (2 * " + N(lo) + " * " + N(fs) + ") = " +
       N(ripple) + " A"});
  // The winding sees about n*Vo on average over a half period:
  // Im_pk = n*Vo/(4*Lm*fs).
  const double im = n * vo / (4 * lm * fs);
  AddPrediction(out, "i_mag_peak_a", im, "Im = n*Vo/(4*Lm*fs)", kSrcDerived,
      {"Im = " + N(n) + " * " + N(vo) + " / (4 * " + N(lm) + " * " + N(fs) + ") = " + N(im) +
       " A"});
  const double q_node = 2 * coss * vin + ctr * vin;  // charge moved per transition
  const double ceq = 2 * coss + ctr;
  AddPrediction(out, "q_node_c", q_node, "Q = 2*Qoss(Vin) + C_TR*Vin", kSrcSabate,
      {"Q = 2 * " + N(coss) + " * " + N(vin) + " + " + N(ctr) + " * " + N(vin) + " = " +
       N(q_node) + " C"});

  if (!lag) {
    // ---- Leading leg: nearly constant current (Sabate et al., APEC 1990).
    const double ip = (io + ripple / 2) / n + im;
    AddPrediction(out, "i_primary_a", ip, "Ip = (Io + dILo/2)/n + Im", kSrcSabate,
        {"Ip = (" + N(io) + " + " + N(ripple) + "/2)/" + N(n) + " + " + N(im) + " = " + N(ip) +
         " A"});
    const double t = ip > 0 ? q_node / ip : NAN;
    for (const char* edge : {"high_on", "low_on"}) {
      const std::string E = edge;
      const double sign = E == "low_on" ? 1 : -1;  // > 0 out of the node
      Prediction& pc = AddPrediction(out, E + "_i_commutated_a", sign * ip, "i = +-Ip", kSrcSabate,
                           {"i_commutated = " + N(sign * ip) + " A (out of the node)"}, E);
      pc.metric = "i_commutated_a";
      pc.tolerance = {0.1, 0.1};
      AddPrediction(out, E + "_t_linear_s", t, "t = (2*Qoss(Vin) + C_TR*Vin)/Ip", kSrcSabate,
          {"t = " + N(q_node) + " / " + N(ip) + " = " + N(t) + " s"}, E);
      Prediction& pt = AddPrediction(out, E + "_t_transition_s", 0.8 * t, "t(10-90 %) = 0.8*t", kSrcSabate,
                           {"t_transition = 0.8 * " + N(t) + " = " + N(0.8 * t) + " s"}, E);
      pt.metric = "t_transition_s";
      pt.tolerance = {0.05, 0.5e-9};
      const bool zvs = !std::isnan(td) && ip * td >= q_node;
      const double v_on = std::isnan(td) ? NAN : std::max(0.0, vin - ip * td / ceq);
      Prediction& pv = AddPrediction(out, E + "_v_turn_on_v", v_on, "Vds(td) = max(0, Vin - Ip*td/Ceq)",
                           kSrcSabate, {"td = " + N(td) + " s: v_turn_on = " + N(v_on) + " V"}, E);
      pv.metric = "v_turn_on_v";
      pv.tolerance = {0.05, 2.0};
      Prediction& vz = AddPrediction(out, E + "_zvs_charge", zvs ? 1 : 0, "ZVS iff Ip*td >= Q", kSrcSabate,
                           {"Ip*td = " + N(ip * td) + " C vs Q = " + N(q_node) + " C"}, E);
      vz.metric = "zvs_full";
      vz.tolerance = {0, 0.5};
    }
    return true;
  }

  // ---- Lagging leg: the rectifier shorts the winding; Lr alone swings the
  // node through the resonance with Ceq (netlists/references.md sec. 4).
  const double ip = std::max(0.0, (io - ripple / 2) / n + im);
  AddPrediction(out, "i_primary_a", ip, "Ip = (Io - dILo/2)/n + Im", kSrcDerived,
      {"Ip = (" + N(io) + " - " + N(ripple) + "/2)/" + N(n) + " + " + N(im) + " = " + N(ip) +
       " A"});
  const double need = vin * coss * vin + 0.5 * ctr * vin * vin;
  const double i_zvs = std::sqrt(2 * need / lr);
  AddPrediction(out, "i_zvs_a", i_zvs, "1/2*Lr*Ip^2 >= Vin*Qoss(Vin) + 1/2*C_TR*Vin^2", kSrcLagCharge,
      {"I_zvs = sqrt(2 * " + N(need) + " / " + N(lr) + ") = " + N(i_zvs) + " A"});
  // Minimum load: (Io - dILo/2)/n + Im = I_zvs.
  const double io_min = std::max(0.0, n * (i_zvs - im) + ripple / 2);
  AddPrediction(out, "iout_min_zvs_a", io_min, "Io_min = n*(I_zvs - Im) + dILo/2", kSrcLagCharge,
      {"Io_min = " + N(n) + " * (" + N(i_zvs) + " - " + N(im) + ") + " + N(ripple) + "/2 = " +
       N(io_min) + " A"});
  const double zr = std::sqrt(lr / ceq), wr = 1 / std::sqrt(lr * ceq);
  AddPrediction(out, "z_res_ohm", zr, "Zr = sqrt(Lr/Ceq), Ceq = 2*Coss + C_TR", kSrcSabate,
      {"Zr = sqrt(" + N(lr) + " / " + N(ceq) + ") = " + N(zr) + " ohm"});
  const double a = ip * zr;  // the resonant amplitude: v(t) = Ip*Zr*sin(wr*t)
  const bool reach = a >= vin;
  const double t_zvs = reach ? std::asin(vin / a) / wr : NAN;
  const double i_end = reach ? std::sqrt(ip * ip - (vin / zr) * (vin / zr)) : NAN;
  const double t_max = reach ? t_zvs + lr * i_end / vin : NAN;
  for (const char* edge : {"high_on", "low_on"}) {
    const std::string E = edge;
    const double sign = E == "low_on" ? 1 : -1;  // > 0 out of the node
    Prediction& pc = AddPrediction(out, E + "_i_commutated_a", sign * ip, "i = +-Ip", kSrcDerived,
                         {"i_commutated = " + N(sign * ip) + " A (out of the node)"}, E);
    pc.metric = "i_commutated_a";
    pc.tolerance = {0.1, 0.1};
    Prediction& pz =
        AddPrediction(out, E + "_t_zvs_s", t_zvs, "wr*t = asin(Vin/(Ip*Zr))", kSrcSabate,
            {reach ? "t = asin(" + N(vin) + " / " + N(a) + ") / " + N(wr) + " = " + N(t_zvs) + " s"
                   : "Ip*Zr = " + N(a) + " V < Vin: the node peaks short of the rail"},
            E);
    pz.metric = "t_zvs_s";
    pz.tolerance = {0.03, 0.5e-9};
    const double t10 = 0.1 * vin <= a ? std::asin(0.1 * vin / a) / wr : NAN;
    const double t90 = 0.9 * vin <= a ? std::asin(0.9 * vin / a) / wr : NAN;
    Prediction& pt = AddPrediction(out, E + "_t_transition_s", t90 - t10,
                         "t(v) = asin(v/(Ip*Zr))/wr, t90 - t10", kSrcSabate,
                         {"t10 = " + N(t10) + " s, t90 = " + N(t90) + " s"}, E);
    pt.metric = "t_transition_s";
    pt.tolerance = {0.03, 0.5e-9};
    AddPrediction(out, E + "_t_dead_max_s", t_max, "td_max = t_ZVS + Lr*i_end/Vin", kSrcDerived,
        {"i_end = sqrt(Ip^2 - (Vin/Zr)^2) = " + N(i_end) + " A, td_max = " + N(t_max) + " s"},
        E);
    double v_on = NAN;
    if (!std::isnan(td)) {
      if (reach && td >= t_zvs && td <= t_max) {
        v_on = 0;
      } else if (!reach && wr * td <= kPi) {
        v_on = vin - a * std::sin(wr * td);
      }
    }
    Prediction& pv = AddPrediction(out, E + "_v_turn_on_v", v_on, "Vds(td) = Vin - Ip*Zr*sin(wr*td)",
                         kSrcDerived, {"td = " + N(td) + " s: v_turn_on = " + N(v_on) + " V"}, E);
    pv.metric = "v_turn_on_v";
    pv.tolerance = {0.05, 2.0};
    Prediction& vz = AddPrediction(out, E + "_zvs_charge", ip >= i_zvs ? 1 : 0, "ZVS iff Ip >= I_zvs",
                         kSrcLagCharge, {"Ip = " + N(ip) + " A vs " + N(i_zvs) + " A"}, E);
    vz.metric = "zvs_full";
    vz.tolerance = {0, 0.5};
  }
  return true;
}

}  // namespace

const TopologyModel& FullBridgePsmModel() {
  static const FullBridgePsm model;
  return model;
}

}  // namespace zvsmap
