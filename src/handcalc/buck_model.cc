#include "handcalc/buck_model.h"

#include <algorithm>
#include <cmath>
#include <memory>

#include "core/spice_number.h"
#include "handcalc/output_capacitance.h"

namespace zvsmap {

namespace {

constexpr double kPi = 3.14159265358979323846;

std::string N(double v) { return std::isnan(v) ? "n/a" : FormatEngineering(v, 4); }

// The sources, as netlists/references.md tags them.
constexpr const char* kSrcBuck =
    "Erickson & Maksimovic 2001, ch. 2; Mohan, Undeland & Robbins 2003, ch. 7; "
    "netlists/references.md sec. 1";
constexpr const char* kSrcLinear =
    "Mohan, Undeland & Robbins 2003, soft-switching chapter; netlists/references.md sec. 2";
constexpr const char* kSrcResonant =
    "netlists/references.md sec. 2 [derived]; same analysis as Vorperian, IEEE TPEL 3(2), 1988";
constexpr const char* kSrcCharge =
    "netlists/references.md sec. 2 [derived]; Costinett, Maksimovic & Zane, IEEE TPEL 30(2), 2015";
constexpr const char* kSrcWindow = "netlists/references.md sec. 2 [derived]";
constexpr const char* kSrcLoss = "netlists/references.md sec. 3 [derived]; Costinett et al. 2015";
constexpr const char* kSrcDiode = "netlists/references.md sec. 3 [common practice]";

// Collects predictions of one cell.
class Sheet {
 public:
  explicit Sheet(std::vector<Prediction>* out) : out_(out) {}
  Prediction& Add(std::string name, double value, std::string formula, std::string source,
                  std::vector<std::string> steps, std::string edge = "") {
    return AddPrediction(out_, std::move(name), value, std::move(formula), std::move(source),
                         std::move(steps), std::move(edge));
  }

 private:
  std::vector<Prediction>* out_;
};

// Energy lost when a switch turns on with `vr` across it while the other
// switch of the leg sits at vin - vr and is charged to vin through the
// channel: E = Eoss(vr) + vin*(Q(vin) - Q(vin - vr)) - (E(vin) - E(vin - vr)).
// Equal devices, hard turn-on (vr = vin): vin*Q(vin); linear Coss: Coss*vr^2.
// netlists/references.md sec. 3 [derived]; Costinett et al. 2015.
double TurnOnCapacitiveLoss(const OutputCapacitance& c, double vin, double vr) {
  vr = std::clamp(vr, 0.0, vin);
  double other = vin - vr;
  return c.Energy(vr) + vin * (c.Charge(vin) - c.Charge(other)) - (c.Energy(vin) - c.Energy(other));
}

class Buck : public TopologyModel {
 public:
  std::string Name() const override { return "buck"; }
  std::string Assumptions() const override {
    return "synchronous buck, continuous conduction, ideal switches, constant Vo over a "
           "period, equal switches, resonant dead-time transition with the charge-equivalent "
           "node capacitance";
  }
  std::vector<ModelInput> Inputs() const override {
    return {
        {"vin", "input voltage, V", true},
        {"vout", "output voltage, V", true},
        {"fsw", "switching frequency, Hz", true},
        {"l", "inductance, H", true},
        {"iout", "load current, A", true},
        {"coss", "output capacitance per switch (linear), F", false},
        {"c0", "junction Coss C0, F (with vj, mj; replaces coss when bound)", false},
        {"vj", "junction potential, V", false},
        {"mj", "junction grading coefficient", false},
        {"cext", "extra switch-node capacitance, F (default 0)", false},
        {"vf", "body-diode forward drop, V (for the diode loss)", false},
        {"td_high", "dead time before the high-side turn-on, s (default: cell high_dead)", false},
        {"td_low", "dead time before the low-side turn-on, s (default: cell low_dead)", false}};
  }
  bool Predict(const ModelContext& ctx, std::vector<Prediction>* out,
               std::string* error) const override;
};

bool Buck::Predict(const ModelContext& ctx, std::vector<Prediction>* out,
                   std::string* error) const {
  if (!CheckRequiredInputs(*this, ctx, error)) return false;
  const double vin = ctx.Input("vin"), vo = ctx.Input("vout"), fs = ctx.Input("fsw"),
               l = ctx.Input("l"), io = ctx.Input("iout");
  if (!(vin > 0) || !(vo > 0) || !(vo < vin) || !(fs > 0) || !(l > 0)) {
    *error = "model 'buck' needs 0 < vout < vin, fsw > 0 and l > 0 (got vin=" + N(vin) +
             ", vout=" + N(vo) + ", fsw=" + N(fs) + ", l=" + N(l) + ")";
    return false;
  }
  std::unique_ptr<OutputCapacitance> cap;
  if (ctx.bindings.count("c0")) {
    double c0 = ctx.Input("c0"), vj = ctx.Input("vj"), mj = ctx.Input("mj");
    if (!(c0 > 0) || !(vj > 0) || !(mj > 0 && mj < 1)) {
      *error = "model 'buck' with junction Coss needs c0 > 0, vj > 0 and 0 < mj < 1";
      return false;
    }
    cap = MakeJunctionCapacitance(c0, vj, mj);
  } else {
    double coss = ctx.Input("coss");
    if (!(coss > 0)) {
      *error = "model 'buck' needs input 'coss' > 0 (or a junction Coss: c0, vj, mj)";
      return false;
    }
    cap = MakeLinearCapacitance(coss);
  }
  double cext = ctx.Input("cext");
  if (std::isnan(cext)) cext = 0;
  double vf = ctx.Input("vf");
  auto dead_time = [&](const char* input, const std::string& cell_param) {
    bool bound = ctx.bindings.count(input) > 0;
    double v = bound ? ctx.Input(input) : NAN;
    if (!bound && !cell_param.empty()) {
      auto it = ctx.params->find(cell_param);
      if (it != ctx.params->end()) v = it->second;
    }
    return v;
  };
  const double td_high = dead_time("td_high", ctx.cell ? ctx.cell->high_dead : "");
  const double td_low = dead_time("td_low", ctx.cell ? ctx.cell->low_dead : "");

  Sheet s(out);
  // ---- Section 1: the buck in continuous conduction (Erickson & Maksimovic
  // 2001, ch. 2; Mohan et al. 2003, ch. 7).
  const double d = vo / vin;
  s.Add("duty", d, "D = Vo/Vin", kSrcBuck, {"D = " + N(vo) + " / " + N(vin) + " = " + N(d)});
  const double ripple = (vin - vo) * d / (l * fs);
  s.Add("ripple_a", ripple, "dI = (Vin - Vo)*D/(L*fs)", kSrcBuck,
        {"dI = (" + N(vin) + " - " + N(vo) + ") * " + N(d) + " / (" + N(l) + " * " + N(fs) +
         ") = " + N(ripple) + " A"});
  const double ipk = io + ripple / 2, iv = io - ripple / 2;
  s.Add("i_peak_a", ipk, "Ipk = Io + dI/2", kSrcBuck,
        {"Ipk = " + N(io) + " + " + N(ripple) + "/2 = " + N(ipk) + " A"});
  s.Add("i_valley_a", iv, "Iv = Io - dI/2", kSrcBuck,
        {"Iv = " + N(io) + " - " + N(ripple) + "/2 = " + N(iv) + " A"});

  // ---- Section 2: node capacitance. Charge moved per transition
  // 2*Qoss(Vin) + Cext*Vin [derived]; the charge-equivalent Ceq sets the
  // linear-resonant analysis, the energy-equivalent one is shown beside it.
  const double q = cap->Charge(vin), e = cap->Energy(vin);
  s.Add("q_oss_c", q, "Qoss(Vin) = integral_0^Vin C dv (" + cap->Describe() + ")",
        "netlists/references.md sec. 6", {"Qoss(" + N(vin) + " V) = " + N(q) + " C"});
  s.Add("e_oss_j", e, "Eoss(Vin) = integral_0^Vin v*C dv", "netlists/references.md sec. 6",
        {"Eoss(" + N(vin) + " V) = " + N(e) + " J"});
  const double q_node = 2 * q + cext * vin;
  const double q_node_energy = 2 * (2 * e / vin) + cext * vin;
  const double ceq = q_node / vin;
  s.Add("c_eq_f", ceq, "Ceq = 2*Co(tr)(Vin) + Cext = (2*Qoss(Vin) + Cext*Vin)/Vin", kSrcResonant,
        {"Ceq = (2 * " + N(q) + " + " + N(cext) + " * " + N(vin) + ") / " + N(vin) + " = " +
         N(ceq) + " F"});
  const double z = std::sqrt(l / ceq), w = 1 / std::sqrt(l * ceq);
  s.Add("z_res_ohm", z, "Z = sqrt(L/Ceq)", kSrcResonant,
        {"Z = sqrt(" + N(l) + " / " + N(ceq) + ") = " + N(z) + " ohm"});
  s.Add("f_res_hz", w / (2 * kPi), "f_res = 1/(2*pi*sqrt(L*Ceq))", kSrcResonant,
        {"w = 1/sqrt(" + N(l) + " * " + N(ceq) + ") = " + N(w) + " rad/s",
         "f_res = w/(2*pi) = " + N(w / (2 * kPi)) + " Hz"});

  // ---- High-side turn-on: the node rises from 0 carrying I0 = -Iv into it.
  {
    const std::string E = "high_on";
    const double i0 = -iv;
    Prediction& pc = s.Add("high_on_i_commutated_a", iv, "i at the low-side turn-off = Iv",
                           kSrcBuck, {"i_commutated = Iv = " + N(iv) + " A (out of the node)"}, E);
    pc.metric = "i_commutated_a";
    pc.tolerance = {0.05, 0.1};
    // Threshold: 1/2*L*I0^2 >= (Qoss(Vin) + Cext*Vin/2)*(Vin - 2*Vo), i.e.
    // I0 >= sqrt(Ceq*Vin*(Vin - 2*Vo)/L) for linear Ceq (netlists/references.md sec. 2).
    const double swing = std::max(0.0, vin - 2 * vo);
    const double th_q = std::sqrt(q_node * swing / l), th_e = std::sqrt(q_node_energy * swing / l);
    s.Add("high_on_i_zvs_charge_a", th_q, "I0 >= sqrt((2*Qoss(Vin) + Cext*Vin)*(Vin - 2*Vo)/L)",
          kSrcCharge,
          {"I_zvs = sqrt(" + N(q_node) + " * " + N(swing) + " / " + N(l) + ") = " + N(th_q) + " A",
           "have I0 = -Iv = " + N(i0) + " A: " + (i0 >= th_q ? "ZVS" : "no ZVS")},
          E);
    s.Add("high_on_i_zvs_energy_a", th_e,
          "I0 >= sqrt((4*Eoss(Vin)/Vin + Cext*Vin)*(Vin - 2*Vo)/L) (energy-equivalent Co(er); "
          "understates the need when Coss is nonlinear)",
          kSrcCharge,
          {"I_zvs,E = sqrt(" + N(q_node_energy) + " * " + N(swing) + " / " + N(l) +
           ") = " + N(th_e) + " A"},
          E);
    // ZVS verdicts (1/0) beside the simulated class: the charge-based one is
    // the condition (netlists/references.md sec. 2), the energy-based one shows how
    // far an Eoss-sized design would be off.
    Prediction& vq = s.Add("high_on_zvs_charge", i0 >= th_q ? 1 : 0, "ZVS iff I0 >= I_zvs",
                           kSrcCharge, {"I0 = " + N(i0) + " A vs " + N(th_q) + " A"}, E);
    vq.metric = "zvs_full";
    vq.tolerance = {0, 0.5};
    Prediction& ve = s.Add("high_on_zvs_energy", i0 >= th_e ? 1 : 0, "ZVS iff I0 >= I_zvs,E",
                           kSrcCharge, {"I0 = " + N(i0) + " A vs " + N(th_e) + " A"}, E);
    ve.metric = "zvs_full";
    ve.tag = "pred_energy";
    ve.tolerance = {0, 0.5};
    const double t_lin = i0 > 0 ? q_node / i0 : NAN;
    s.Add("high_on_t_linear_s", t_lin, "t = (2*Qoss(Vin) + Cext*Vin)/|I| (= 2*C*Vin/|I|)",
          kSrcLinear, {"t = " + N(q_node) + " / " + N(i0) + " = " + N(t_lin) + " s"}, E);
    // v(t) = Vo*(1 - cos wt) + I0*Z*sin wt = Vo + R*sin(wt - phi),
    // i(t) = I0*cos wt + (Vo/Z)*sin wt (netlists/references.md sec. 2).
    const double r = std::hypot(vo, i0 * z), phi = std::atan2(vo, i0 * z);
    auto v_at = [&](double t) { return vo * (1 - std::cos(w * t)) + i0 * z * std::sin(w * t); };
    auto t_for = [&](double v) {  // first time the rising node reaches v
      double a = (v - vo) / r;
      return (i0 > 0 && a <= 1) ? (phi + std::asin(a)) / w : NAN;
    };
    const bool zvs = i0 > 0 && r >= vin - vo;
    const double t_zvs = zvs ? t_for(vin) : NAN;
    const double i_end = zvs ? i0 * std::cos(w * t_zvs) + vo / z * std::sin(w * t_zvs) : NAN;
    s.Add("high_on_t_resonant_s", t_zvs,
          "wt = phi + asin((Vin - Vo)/R), R = sqrt(Vo^2 + (I0*Z)^2),"
          " phi = atan2(Vo, I0*Z)",
          kSrcResonant,
          {"R = sqrt(" + N(vo) + "^2 + (" + N(i0) + " * " + N(z) + ")^2) = " + N(r) + " V",
           "phi = atan2(" + N(vo) + ", " + N(i0 * z) + ") = " + N(phi) + " rad",
           zvs ? "t = " + N(t_zvs) + " s"
               : "R < Vin - Vo: the node peaks at Vo + R = " + N(vo + r) + " V, short of the rail"},
          E);
    s.Add("high_on_i_end_a", i_end, "i_end = I0*cos wt + (Vo/Z)*sin wt", kSrcResonant,
          {"i_end = " + N(i_end) + " A"}, E);
    // 10 % -> 90 % of the swing, as the t_transition_s metric measures it. A
    // turn-on before 90 % cuts it short: then the node jumps at td (approximate).
    double t10 = t_for(0.1 * vin), t90 = t_for(0.9 * vin);
    std::string note = "t10 = " + N(t10) + " s, t90 = " + N(t90) + " s";
    if (!std::isnan(td_high) && !std::isnan(t10) && (std::isnan(t90) || t90 > td_high)) {
      t90 = std::max(td_high, t10);
      note += "; turn-on at td = " + N(td_high) + " s comes first: t90 ~ td (approximate)";
    }
    Prediction& pt =
        s.Add("high_on_t_transition_s", t90 - t10, "t(90 %) - t(10 %) of the resonant swing",
              kSrcResonant, {note, "t_transition = " + N(t90 - t10) + " s"}, E);
    pt.metric = "t_transition_s";
    pt.tolerance = {0.05, 0.5e-9};
    // Dead-time window: min = t_ZVS; max = t_ZVS + L*i_end/(Vin - Vo), when the
    // current reverses and the node rings back (netlists/references.md sec. 2).
    const double t_max = zvs ? t_zvs + l * i_end / (vin - vo) : NAN;
    s.Add("high_on_t_dead_min_s", t_zvs, "td_min = t_ZVS", kSrcWindow,
          {"td_min = " + N(t_zvs) + " s"}, E);
    s.Add("high_on_t_dead_max_s", t_max, "td_max = t_ZVS + L*i_end/(Vin - Vo)", kSrcWindow,
          {"td_max = " + N(t_zvs) + " + " + N(l) + " * " + N(i_end) + " / " + N(vin - vo) + " = " +
           N(t_max) + " s"},
          E);
    // The incoming (high) switch's voltage at its turn-on command.
    double v_on = NAN;
    std::string how;
    if (!std::isnan(td_high)) {
      if (zvs && td_high >= t_zvs) {
        v_on = td_high <= t_max ? 0.0 : NAN;
        how = td_high <= t_max ? "td >= t_ZVS: node at the rail (diode conducts)"
                               : "td > td_max: ring-back, not modelled";
      } else if (i0 <= 0) {
        v_on = vin;
        how = "Iv >= 0: the node does not rise (hard turn-on)";
      } else {
        double wt = w * td_high;
        double node = wt >= 2 * phi + kPi ? 0.0 : std::max(0.0, v_at(td_high));
        v_on = vin - node;
        how = "node at td = " + N(node) + " V";
      }
    }
    Prediction& pv =
        s.Add("high_on_v_turn_on_v", v_on, "Vds(td) = Vin - v(td)", kSrcResonant,
              {"td = " + N(td_high) + " s; " + how, "v_turn_on = " + N(v_on) + " V"}, E);
    pv.metric = "v_turn_on_v";
    pv.tolerance = {0.05, 2.0};
    const double e_cap = std::isnan(v_on) ? NAN : TurnOnCapacitiveLoss(*cap, vin, v_on);
    s.Add("high_on_e_cap_j", e_cap,
          "E = Eoss(Vr) + Vin*(Q(Vin) - Q(Vin - Vr)) - (E(Vin) - E(Vin - Vr)) (linear: Coss*Vr^2)",
          kSrcLoss, {"Vr = " + N(v_on) + " V: E = " + N(e_cap) + " J"}, E);
    // Body diode from t_ZVS to td; the current falls at (Vin - Vo)/L meanwhile.
    double e_diode = NAN;
    if (!std::isnan(vf) && !std::isnan(td_high)) {
      double t_d = zvs ? std::clamp(std::min(td_high, t_max) - t_zvs, 0.0, 1.0) : 0.0;
      e_diode = vf * (i_end * t_d - (vin - vo) * t_d * t_d / (2 * l));
      if (std::isnan(e_diode)) e_diode = 0;
    }
    s.Add("high_on_e_diode_j", e_diode, "E = Vf * integral |i| dt over the diode time", kSrcDiode,
          {"Vf = " + N(vf) + " V: E = " + N(e_diode) + " J"}, E);
  }

  // ---- Low-side turn-on: the node falls from Vin carrying Ipk out of it.
  {
    const std::string E = "low_on";
    Prediction& pc =
        s.Add("low_on_i_commutated_a", ipk, "i at the high-side turn-off = Ipk", kSrcBuck,
              {"i_commutated = Ipk = " + N(ipk) + " A (out of the node)"}, E);
    pc.metric = "i_commutated_a";
    pc.tolerance = {0.05, 0.1};
    // ZVS iff Ipk*Z >= sqrt(Vin*(2*Vo - Vin)); always when D <= 0.5.
    const double swing = std::max(0.0, 2 * vo - vin);
    const double th_q = std::sqrt(q_node * swing / l), th_e = std::sqrt(q_node_energy * swing / l);
    s.Add("low_on_i_zvs_charge_a", th_q, "Ipk >= sqrt((2*Qoss(Vin) + Cext*Vin)*(2*Vo - Vin)/L)",
          kSrcCharge, {"I_zvs = " + N(th_q) + " A (0 when D <= 0.5)"}, E);
    s.Add("low_on_i_zvs_energy_a", th_e, "Ipk >= sqrt((4*Eoss(Vin)/Vin + Cext*Vin)*(2*Vo - Vin)/L)",
          kSrcCharge, {"I_zvs,E = " + N(th_e) + " A"}, E);
    Prediction& vq = s.Add("low_on_zvs_charge", ipk >= th_q ? 1 : 0, "ZVS iff Ipk >= I_zvs",
                           kSrcCharge, {"Ipk = " + N(ipk) + " A vs " + N(th_q) + " A"}, E);
    vq.metric = "zvs_full";
    vq.tolerance = {0, 0.5};
    Prediction& ve = s.Add("low_on_zvs_energy", ipk >= th_e ? 1 : 0, "ZVS iff Ipk >= I_zvs,E",
                           kSrcCharge, {"Ipk = " + N(ipk) + " A vs " + N(th_e) + " A"}, E);
    ve.metric = "zvs_full";
    ve.tag = "pred_energy";
    ve.tolerance = {0, 0.5};
    const double t_lin = ipk > 0 ? q_node / ipk : NAN;
    s.Add("low_on_t_linear_s", t_lin, "t = (2*Qoss(Vin) + Cext*Vin)/|I| (= 2*C*Vin/|I|)",
          kSrcLinear, {"t = " + N(q_node) + " / " + N(ipk) + " = " + N(t_lin) + " s"}, E);
    // v(t) = Vo + (Vin - Vo)*cos wt - Ipk*Z*sin wt = Vo + R*cos(wt + psi).
    const double r = std::hypot(vin - vo, ipk * z), psi = std::atan2(ipk * z, vin - vo);
    auto v_at = [&](double t) {
      return vo + (vin - vo) * std::cos(w * t) - ipk * z * std::sin(w * t);
    };
    auto t_for = [&](double v) {  // first time the falling node reaches v
      double a = (v - vo) / r;
      return (ipk > 0 && a >= -1 && a <= 1) ? (std::acos(a) - psi) / w : NAN;
    };
    const bool zvs = ipk > 0 && r >= vo;
    const double t_zvs = zvs ? t_for(0) : NAN;
    const double i_end =
        zvs ? ipk * std::cos(w * t_zvs) + (vin - vo) / z * std::sin(w * t_zvs) : NAN;
    s.Add(
        "low_on_t_resonant_s", t_zvs,
        "wt = acos(-Vo/R) - psi, R = sqrt((Vin - Vo)^2 + (Ipk*Z)^2), psi = atan2(Ipk*Z, Vin - Vo)",
        kSrcResonant,
        {"R = " + N(r) + " V, psi = " + N(psi) + " rad",
         zvs ? "t = " + N(t_zvs) + " s"
             : "R < Vo: the node bottoms at Vo - R = " + N(vo - r) + " V"},
        E);
    s.Add("low_on_i_end_a", i_end, "i_end = Ipk*cos wt + ((Vin - Vo)/Z)*sin wt", kSrcResonant,
          {"i_end = " + N(i_end) + " A"}, E);
    double t10 = t_for(0.9 * vin), t90 = t_for(0.1 * vin);
    std::string note = "t10 = " + N(t10) + " s, t90 = " + N(t90) + " s";
    if (!std::isnan(td_low) && !std::isnan(t10) && (std::isnan(t90) || t90 > td_low)) {
      t90 = std::max(td_low, t10);
      note += "; turn-on at td = " + N(td_low) + " s comes first: t90 ~ td (approximate)";
    }
    Prediction& pt =
        s.Add("low_on_t_transition_s", t90 - t10, "t(90 %) - t(10 %) of the resonant swing",
              kSrcResonant, {note, "t_transition = " + N(t90 - t10) + " s"}, E);
    pt.metric = "t_transition_s";
    pt.tolerance = {0.05, 0.5e-9};
    // A long low-side dead time only costs diode conduction (netlists/references.md sec. 2).
    s.Add("low_on_t_dead_min_s", t_zvs, "td_min = t_ZVS (no ring-back limit)", kSrcWindow,
          {"td_min = " + N(t_zvs) + " s"}, E);
    double v_on = NAN;
    std::string how;
    if (!std::isnan(td_low)) {
      if (zvs && td_low >= t_zvs) {
        v_on = 0;
        how = "td >= t_ZVS: node at 0 V (diode conducts)";
      } else if (ipk <= 0) {
        v_on = vin;
        how = "Ipk <= 0: the node does not fall (hard turn-on)";
      } else {
        double wt = w * td_low;
        v_on = wt >= 2 * kPi - 2 * psi ? vin : std::clamp(v_at(td_low), 0.0, vin);
        how = "node at td = " + N(v_on) + " V";
      }
    }
    Prediction& pv =
        s.Add("low_on_v_turn_on_v", v_on, "Vds(td) = v(td)", kSrcResonant,
              {"td = " + N(td_low) + " s; " + how, "v_turn_on = " + N(v_on) + " V"}, E);
    pv.metric = "v_turn_on_v";
    pv.tolerance = {0.05, 2.0};
    const double e_cap = std::isnan(v_on) ? NAN : TurnOnCapacitiveLoss(*cap, vin, v_on);
    s.Add("low_on_e_cap_j", e_cap,
          "E = Eoss(Vr) + Vin*(Q(Vin) - Q(Vin - Vr)) - (E(Vin) - E(Vin - Vr)) (linear: Coss*Vr^2)",
          kSrcLoss, {"Vr = " + N(v_on) + " V: E = " + N(e_cap) + " J"}, E);
    double e_diode = NAN;
    if (!std::isnan(vf) && !std::isnan(td_low)) {
      double t_d = zvs ? std::max(0.0, td_low - t_zvs) : 0.0;
      e_diode = zvs ? vf * std::fabs(i_end) * t_d : 0.0;
    }
    s.Add("low_on_e_diode_j", e_diode, "E = Vf*|i_end|*(td - t_ZVS)", kSrcDiode,
          {"Vf = " + N(vf) + " V: E = " + N(e_diode) + " J"}, E);
  }
  return true;
}

}  // namespace

const TopologyModel& BuckModel() {
  static const Buck model;
  return model;
}

}  // namespace zvsmap
