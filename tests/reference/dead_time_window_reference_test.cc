// The probe's dead-time window against the resonant-transition closed forms
// (linear Coss), and its class prediction against brute force (the dead time
// swept as an axis). netlists/references.md sec. 2, 8 and 10.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <map>
#include <string>
#include <vector>

#include "analysis/edge_finder.h"
#include "netlist/template.h"
#include "run/point_evaluator.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::EdgeOf;
using testing_support::SharedNgspice;
using testing_support::SourcePath;

constexpr double kPeriod = 2e-6;
constexpr double kVin = 48, kL = 1e-6, kCoss = 1e-9, kVf = 0.3, kLimit = 0.5;

const Template& LoadOnce(const std::string& relative) {
  static std::map<std::string, Template> cache;
  Template& tmpl = cache[relative];
  if (tmpl.path.empty()) {
    Diagnostic error;
    if (!LoadTemplate(SourcePath(relative), &tmpl, &error)) throw Error(error.Format());
  }
  return tmpl;
}

// The linear check case of sec. 8 on the reference tests' own netlist (as in
// resonant_check_case_test.cc: near-ideal switches, Vf 0.3 V, criterion 0.5 V).
PointResult RunCheckCase(Waveforms* waves) {
  SweepSpec spec;
  spec.simulation.max_step_s = 0.2e-9;
  spec.zvs.kind = ZvsCriterion::Kind::kAbsolute;
  spec.zvs.value = kLimit;
  PointEvaluator evaluator(spec, LoadOnce("tests/reference/data/buck_check_case.cir"));
  const double d = 0.25 + 0.5 * (24.32e-9 - 6.82e-9) / kPeriod;
  return evaluator.Evaluate(
      Point{0, {{"Vin", kVin}, {"Vout", 12}, {"fsw", 1 / kPeriod}, {"L", kL}, {"Iout", 5},
                {"c0", kCoss}, {"mj", 0}, {"Ron", 1e-3}, {"Rs", 1e-3}, {"Vf", kVf},
                {"tedge", 0.2e-9}, {"td_lh", 40e-9}, {"td_hl", 20e-9}, {"D", d},
                {"Cout", 22e-6}}},
      SharedNgspice(), waves);
}

// The resonant arc of sec. 2 [derived; same analysis as Vorperian, "Quasi-square-
// wave converters", IEEE Trans. Power Electron. 3(2), 1988], Ceq = 2 Coss,
// from the state at the turn-off command (i0 > 0 drives the node toward the
// incoming rail, vo the output voltage), for the high-side turn-on (node
// 0 -> Vin) and, mirrored, the low-side one (node Vin -> 0: the same arc
// with Vo replaced by Vin - Vo). Returns the times from the turn-off command
// to v_ds = limit (t_min), to v_ds = 0 (t_rail), and the end of the window
// (t_max): the current left at the rail, i_end = sqrt(i0^2 - (Vin*(Vin -
// 2*Vo))/Z^2) (energy balance, sec. 2), ramps to zero against the clamp
// (L*i_end/(Vin + Vf - Vo), sec. 2; the diode holds the node Vf beyond the
// rail), then the node swings back from the clamp with no current and v_ds
// reaches the limit after acos((Vin - Vo - limit)/(Vin + Vf - Vo))/w.
struct Window {
  double t_min, t_rail, t_max;
};
Window ClosedForm(double i0, double vo) {
  const double ceq = 2 * kCoss, z = std::sqrt(kL / ceq), w = 1 / std::sqrt(kL * ceq);
  // Vo*(1 - cos wt) + I0*Z*sin wt = Vo - R*cos(wt + phi).
  double rr = std::hypot(vo, i0 * z), phi = std::atan2(i0 * z, vo);
  auto arc = [&](double v) { return (std::acos((vo - v) / rr) - phi) / w; };
  Window out;
  out.t_min = arc(kVin - kLimit);
  out.t_rail = arc(kVin);
  double i_end = std::sqrt(i0 * i0 - kVin * (kVin - 2 * vo) / (z * z));
  double tau = std::acos((kVin - vo - kLimit) / (kVin + kVf - vo)) / w;
  out.t_max = out.t_rail + kL * i_end / (kVin + kVf - vo) + tau;
  return out;
}

// Both edges' window ends within 3 % of the closed forms (issue 15 item 5).
TEST(DeadTimeWindowReferenceTest, LinearCossWindowEndsMatchTheResonantArc) {
  Waveforms waves;
  PointResult r = RunCheckCase(&waves);
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  const CellSpec& cell = LoadOnce("tests/reference/data/buck_check_case.cir").cells[0];
  for (const EdgeTiming& e : FindEdges(cell, waves, 0.02 * kPeriod)) {
    const EdgeMeasurement& m = EdgeOf(r, e.edge);
    double vo = waves.At("v(out)", e.t_off_s);
    double i = m.Get("i_commutated_a");
    // The low-side turn-on is the high-side one mirrored about Vin/2.
    Window ref = e.incoming_high ? ClosedForm(-i, vo) : ClosedForm(i, kVin - vo);
    std::printf("[ window   ] %s: i %.3f A, Vo %.3f V: t_min %.2f / %.2f ns, t_rail %.2f / %.2f "
                "ns, t_max %.2f / %.2f ns (probe / closed form), bound %.1f ns\n",
                e.edge.c_str(), i, vo, m.Get("probe_t_min_s") * 1e9, ref.t_min * 1e9,
                m.Get("probe_t_rail_s") * 1e9, ref.t_rail * 1e9, m.Get("probe_t_max_s") * 1e9,
                ref.t_max * 1e9, m.Get("probe_bound_s") * 1e9);
    EXPECT_NEAR(m.Get("probe_t_min_s"), ref.t_min, 0.03 * ref.t_min) << e.edge;
    EXPECT_NEAR(m.Get("probe_t_rail_s"), ref.t_rail, 0.03 * ref.t_rail) << e.edge;
    EXPECT_NEAR(m.Get("probe_t_max_s"), ref.t_max, 0.03 * ref.t_max) << e.edge;
    EXPECT_EQ(m.Get("probe_max_at_bound"), 0) << e.edge;  // ring-back within the bound
    // The set dead time against the window (contract of the timing margins).
    EXPECT_NEAR(m.Get("zvs_timing_margin_early_s"), m.Get("t_dead_s") - m.Get("probe_t_min_s"),
                1e-12);
    EXPECT_NEAR(m.Get("zvs_timing_margin_late_s"), m.Get("probe_t_max_s") - m.Get("t_dead_s"),
                1e-12);
    // Body diode between the rail and the window's end: Vf*|i|*t (sec. 10),
    // bounded by the diode's drop at the largest and at no current.
    double t_diode = m.Get("probe_t_diode_s"), e_diode = m.Get("probe_e_diode_j");
    EXPECT_GT(t_diode, 0.9 * (ref.t_max - ref.t_rail)) << e.edge;
    EXPECT_GT(e_diode, 0) << e.edge;
    EXPECT_LT(e_diode, 0.5 * std::fabs(i) * t_diode) << e.edge;
    // Loss-optimal dead time: Coss*v^2 falls to zero at the rail, the diode
    // loss grows after it, so the optimum is where the node reaches the rail
    // (sec. 10), within a step of the probe's data.
    EXPECT_NEAR(m.Get("t_dead_optimal_s"), m.Get("probe_t_rail_s"), 0.5e-9) << e.edge;
    EXPECT_LT(m.Get("e_dead_optimal_j"), 1e-9) << e.edge;
    EXPECT_FALSE(m.probe_curve.empty());
    EXPECT_LE(m.probe_curve.t_dead_s.size(), DeadTimeCurve::kMaxSamples);
  }
}

// Brute force against the probe: the point is evaluated once at its set dead
// times (40 ns both edges) and its probe curves predict the class of a
// turn-on at any other dead time (ClassAtDeadTime); then the dead time is
// swept as an axis, 5 ns apart (the high-side one 5..250 ns across the
// window, the ring-back and the hard turn-on after it; the low-side one
// 5..100 ns), each a point of its own, settled and measured with no probe.
// The shipped buck template (netlists/buck_halfbridge.cir; 48 -> 12 V, 500 kHz,
// 1 uH, linear 1 nF switches, 5 A: valley current about -4 A), the default
// criterion (10 % of the rail). The class must agree at >= 95 % of the
// swept points (issue 15 item 5). Runs regulated (the template's default
// loop): every brute-force point settles at v(out) = Vout with its own duty,
// as a closed-loop converter would (70 of 70 agreed when written; open loop,
// 69 of 70).
//
// Where the two can disagree, and why (common practice, no source): the
// probe predicts from ONE settled state, while each brute-force point settles
// again with its own dead time. While the node sits clamped at the rail (the
// window), a longer dead time changes nothing (the node is where the turn-on
// would put it), so inside the window they agree by construction (causality).
// Past the ring-back the node falls back during the dead time and the switch
// node's average drops: the regulated solve raises the duty to hold Vout, the
// valley current stays close, and the prediction holds. Open loop the
// converter would settle at a lower output and another valley current, and the
// partial/hard boundary moved by one 5 ns point. A point closer to a class
// boundary than the data's step (1 ns) can still fall either way.
TEST(DeadTimeWindowReferenceTest, ProbeClassPredictionAgreesWithBruteForce) {
  const Template& tmpl = LoadOnce("netlists/buck_halfbridge.cir");
  SweepSpec spec;
  spec.simulation.max_step_s = 1e-9;
  auto values = [](double td_lh, double td_hl) {
    return std::vector<ParamValue>{{"Iout", 5}, {"td_lh", td_lh}, {"td_hl", td_hl}};
  };
  PointEvaluator probing(spec, tmpl);
  PointResult nominal = probing.Evaluate(Point{0, values(40e-9, 40e-9)}, SharedNgspice());
  ASSERT_EQ(nominal.status, PointStatus::kOk) << nominal.reason << "\n" << nominal.log;
  ASSERT_TRUE(nominal.reason.empty()) << nominal.reason;
  spec.simulation.probe = false;
  PointEvaluator brute(spec, tmpl);

  int points = 0, agree = 0;
  std::string log;
  for (const char* edge : {"high_on", "low_on"}) {
    const EdgeMeasurement& predicted = EdgeOf(nominal, edge);
    ASSERT_FALSE(predicted.probe_curve.empty()) << edge;
    const bool high = std::string(edge) == "high_on";
    const double last = high ? 250e-9 : 100e-9;
    for (int k = 1; k * 5e-9 <= last + 1e-12; ++k) {
      double td = k * 5e-9;
      PointResult r = brute.Evaluate(Point{static_cast<size_t>(k), high ? values(td, 40e-9)
                                                                         : values(40e-9, td)},
                                     SharedNgspice());
      ASSERT_EQ(r.status, PointStatus::kOk) << edge << " " << td << ": " << r.reason;
      const EdgeMeasurement& m = EdgeOf(r, edge);
      ZvsClass guess = ClassAtDeadTime(predicted.probe_curve, m.Get("t_dead_s"),
                                       predicted.Get("v_residual_limit_v"),
                                       predicted.Get("rail_v"));
      ++points;
      if (guess == m.zvs) {
        ++agree;
      } else {
        char line[200];
        std::snprintf(line, sizeof line,
                      "  %s at %.0f ns: probe says %s (v_ds %.2f V), brute force %s (v_turn_on "
                      "%.2f V, i_commutated %.2f A)\n",
                      edge, td * 1e9, ZvsClassName(guess),
                      predicted.probe_curve.At(m.Get("t_dead_s")), ZvsClassName(m.zvs),
                      m.Get("v_turn_on_v"), m.Get("i_commutated_a"));
        log += line;
      }
    }
  }
  std::printf("[ brute    ] probe vs brute force: %d of %d points agree (%.1f %%)\n%s", agree,
              points, 100.0 * agree / points, log.c_str());
  EXPECT_GE(agree, 0.95 * points) << log;
}

}  // namespace
}  // namespace zvsmap
