// The probe analysis on synthetic probe runs whose window is known by
// construction (piecewise-linear node voltage, so every instant is exact).
#include "analysis/dead_time_window.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <functional>

#include "analysis/edge_finder.h"

namespace zvsmap {
namespace {

constexpr double kNs = 1e-9;

CellSpec Cell() {
  CellSpec cell;
  cell.name = "leg";
  cell.node = "sw";
  cell.rail_high = "in";
  cell.rail_low = "0";
  cell.current = "vsense";
  cell.high_cmd = "ch";
  cell.low_cmd = "cl";
  return cell;
}

// A high_on probe on a 0.1 ns grid from 0 to 260 ns: the low command falls
// through 0.5 V at 10 ns, the high command stays off (withheld), the rail is 48 V. `node(t)`
// and `current(t)` give the node voltage and i(vsense).
Waveforms Probe(const std::function<double(double)>& node,
                const std::function<double(double)>& current) {
  std::vector<double> t, sw, in, i, ch, cl;
  for (int k = 0; k <= 2600; ++k) {
    double x = k * 0.1 * kNs;
    t.push_back(x);
    sw.push_back(node(x));
    in.push_back(48);
    i.push_back(current(x));
    ch.push_back(0);
    cl.push_back(std::min(1.0, std::max(0.0, 0.5 - (x - 10 * kNs) / kNs)));  // 0.5 V at 10 ns
  }
  Waveforms w;
  w.SetTime(t);
  w.Set("v(sw)", sw);
  w.Set("v(in)", in);
  w.Set("i(vsense)", i);
  w.Set("v(ch)", ch);
  w.Set("v(cl)", cl);
  return w;
}

// Node: 0 V until 10 ns, 0 -> 48 V over 10..30 ns, 48 -> 48.7 V over 30..31 ns
// (the high body diode takes over), 48.7 V until 110 ns, then falls at
// 18.7 V / 40 ns (ring-back) to 30 V. Current -4 A throughout.
double RingBackNode(double t) {
  double ns = t / kNs;
  if (ns < 10) return 0;
  if (ns < 30) return 48 * (ns - 10) / 20;
  if (ns < 31) return 48 + 0.7 * (ns - 30);
  if (ns < 110) return 48.7;
  if (ns < 150) return 48.7 - 18.7 * (ns - 110) / 40;
  return 30;
}

ProbeInput Input(double t_dead_s) {
  ProbeInput in;
  in.incoming_high = true;
  in.t_off_hint_s = 10 * kNs;
  in.bound_s = 240 * kNs;
  in.limit_v = 4.8;  // 10 % of the rail
  in.rail_v = 48;
  in.t_dead_s = t_dead_s;
  in.coss_f = 1e-9;
  return in;
}

TEST(DeadTimeWindowTest, WindowEndsDiodeAndOptimumOfARingBack) {
  Waveforms w = Probe(RingBackNode, [](double) { return -4.0; });
  DeadTimeWindow win;
  std::string why;
  ASSERT_TRUE(AnalyseProbe(Cell(), w, Input(50 * kNs), &win, &why)) << why;
  // v_ds = 48 - v(sw) <= 4.8 V from v(sw) = 43.2 V: 10 + 20 * 43.2 / 48 = 28 ns.
  EXPECT_NEAR(win.t_min_s, 18 * kNs, 1e-12);
  EXPECT_NEAR(win.t_rail_s, 20 * kNs, 1e-12);
  // Back above 4.8 V where the fall passes 43.2 V: 110 + 5.5 / 18.7 * 40 ns.
  double t_exit = 110 + 5.5 / 18.7 * 40;
  EXPECT_NEAR(win.t_max_s, (t_exit - 10) * kNs, 1e-12);
  EXPECT_EQ(win.max_at_bound, 0);
  EXPECT_NEAR(win.bound_s, 240 * kNs, 1e-15);
  // v_ds < -0.1 V while v(sw) > 48.1 V: from 30 + 0.1 / 0.7 ns to 110 + 0.6 / 18.7 * 40 ns.
  EXPECT_NEAR(win.t_diode_s, (110 + 0.6 / 18.7 * 40 - 30 - 0.1 / 0.7) * kNs, 1e-12);
  // 4 A times the area of v_ds below 0 between t_rail and t_max: the 1 ns ramp,
  // 79 ns at 0.7 V and the fall back to 0 V (0.7 / 18.7 * 40 ns).
  double area = 0.5 * 0.7 * 1 + 0.7 * 79 + 0.5 * 0.7 * (0.7 / 18.7 * 40);
  EXPECT_NEAR(win.e_diode_j, 4 * area * kNs, 1e-3 * 4 * area * kNs);
  EXPECT_NEAR(win.v_valley_v, -0.7, 1e-9);
  EXPECT_NEAR(win.t_valley_s, 21 * kNs, 0.1 * kNs);
  // Coss * v^2 falls to 0 at the rail and the diode loss only grows after it.
  EXPECT_NEAR(win.t_dead_optimal_s, 20 * kNs, 1e-12);
  EXPECT_NEAR(win.e_dead_optimal_j, 0, 1e-15);
  // The set dead time (50 ns) against the window.
  EXPECT_NEAR(win.margin_early_s, 32 * kNs, 1e-12);
  EXPECT_NEAR(win.margin_late_s, (t_exit - 10 - 50) * kNs, 1e-12);
}

TEST(DeadTimeWindowTest, NoRingBackBeforeTheBoundHoldsTheMaximumThere) {
  Waveforms w = Probe([](double t) { return t < 110 * kNs ? RingBackNode(t) : 48.7; },
                      [](double) { return -4.0; });
  DeadTimeWindow win;
  std::string why;
  ASSERT_TRUE(AnalyseProbe(Cell(), w, Input(50 * kNs), &win, &why)) << why;
  EXPECT_EQ(win.max_at_bound, 1);
  EXPECT_DOUBLE_EQ(win.t_max_s, win.bound_s);
  EXPECT_NEAR(win.margin_late_s, win.bound_s - 50 * kNs, 1e-15);
}

// The node never reaches the criterion: up to 30 V at 40 ns, back to 10 V.
TEST(DeadTimeWindowTest, ImpossibleZvsGivesTheValleyAndAChargeEstimate) {
  auto node = [](double t) {
    double ns = t / kNs;
    if (ns < 10) return 0.0;
    if (ns < 40) return 30 * (ns - 10) / 30;
    if (ns < 80) return 30 - 20 * (ns - 40) / 40;
    return 10.0;
  };
  Waveforms w = Probe(node, [](double) { return -4.0; });
  ProbeInput in = Input(50 * kNs);
  in.coss_f = std::nan("");
  DeadTimeWindow win;
  std::string why;
  ASSERT_TRUE(AnalyseProbe(Cell(), w, in, &win, &why)) << why;
  EXPECT_TRUE(std::isnan(win.t_min_s));
  EXPECT_TRUE(std::isnan(win.t_rail_s));
  EXPECT_TRUE(std::isnan(win.t_max_s));
  EXPECT_TRUE(std::isnan(win.margin_early_s));
  EXPECT_NEAR(win.v_valley_v, 18, 1e-9);
  EXPECT_NEAR(win.t_valley_s, 30 * kNs, 1e-12);
  // 4 A for 30 ns moved 120 nC over a 30 V swing: 4 nF at the node, 2 nF per
  // switch (charge balance, netlists/references.md sec. 2); the optimum is the
  // valley, Coss * v^2 = 2 nF * (18 V)^2 (sec. 3, linear equal switches).
  EXPECT_NEAR(win.t_dead_optimal_s, 30 * kNs, 1e-12);
  EXPECT_NEAR(win.e_dead_optimal_j, 2e-9 * 18 * 18, 1e-3 * 2e-9 * 18 * 18);
}

// The class read off the compact curve equals the class of the dense data at
// every dead time (0.5 ns steps over the whole probe).
TEST(DeadTimeWindowTest, CurveClassMatchesTheDenseDataAtEveryDeadTime) {
  Waveforms w = Probe(RingBackNode, [](double) { return -4.0; });
  DeadTimeWindow win;
  std::string why;
  ASSERT_TRUE(AnalyseProbe(Cell(), w, Input(50 * kNs), &win, &why)) << why;
  ASSERT_LE(win.curve.t_dead_s.size(), DeadTimeCurve::kMaxSamples);
  ASSERT_GE(win.curve.t_dead_s.size(), 4u);
  EXPECT_DOUBLE_EQ(win.curve.t_dead_s.front(), 0);
  EXPECT_NEAR(win.curve.t_dead_s.back(), 240 * kNs, 1e-15);
  for (double td = 0.25 * kNs; td <= 240 * kNs; td += 0.5 * kNs) {  // off the data's grid
    double v = 48 - RingBackNode(10 * kNs + td);
    EXPECT_EQ(ClassAtDeadTime(win.curve, td, 4.8, 48), ClassifyTurnOn(v, 4.8, 48))
        << "dead time " << td / kNs << " ns";
  }
  EXPECT_EQ(ClassAtDeadTime(win.curve, 300 * kNs, 4.8, 48), ZvsClass::kUnknown);
}

TEST(DeadTimeWindowTest, CompactCurveKeepsCrossingsAndFollowsASine) {
  std::vector<double> t, v;
  for (int k = 0; k <= 5000; ++k) {
    t.push_back(k * 1e-3);
    v.push_back(10 * std::sin(6.0 * t.back()));
  }
  DeadTimeCurve c = CompactCurve(t, v, {2.5}, 128);
  ASSERT_LE(c.t_dead_s.size(), 128u);
  for (size_t k = 1; k < c.t_dead_s.size(); ++k) EXPECT_GT(c.t_dead_s[k], c.t_dead_s[k - 1]);
  // Each crossing of 2.5 is a sample of its own (asin(0.25) / 6 + k pi / 6 ...).
  double first = std::asin(0.25) / 6;
  // The crossing is interpolated between input samples 1 ms apart, so it lies within
  // one input step of the exact instant and holds the level exactly.
  bool kept = false;
  for (size_t k = 0; k < c.t_dead_s.size(); ++k) {
    if (c.v_ds_v[k] == 2.5 && std::fabs(c.t_dead_s[k] - first) < 1e-3) kept = true;
  }
  EXPECT_TRUE(kept);
  double worst = 0;
  for (size_t k = 0; k < t.size(); ++k) worst = std::max(worst, std::fabs(c.At(t[k]) - v[k]));
  // Linear interpolation on spacing h errs by at most h^2/8 * max|f''| (Burden & Faires,
  // Numerical Analysis, 9th ed. 2011, Theorem 3.3 with n = 1). With 128 samples spread
  // evenly over 5 s, h = 5/127 and max|f''| = 10 * 36: about 0.070. The greedy selection
  // spends samples on the crossings it keeps, so allow twice the even-spacing bound.
  const double h = 5.0 / 127;
  EXPECT_LT(worst, 2 * h * h / 8 * 360);
}

TEST(DeadTimeWindowTest, ApplyReplacesTheTimingMarginsAndFillsTheProbeMetrics) {
  EdgeMeasurement m;
  m.metrics = {{"zvs_timing_margin_early_s", 1}, {"zvs_timing_margin_late_s", NAN},
               {"probe_t_min_s", NAN}};
  DeadTimeWindow w;
  w.margin_early_s = 2e-9;
  w.margin_late_s = 3e-9;
  w.t_min_s = 4e-9;
  w.curve.t_dead_s = {0, 1e-9};
  w.curve.v_ds_v = {48, 0};
  ApplyDeadTimeWindow(w, &m);
  EXPECT_EQ(m.Get("zvs_timing_margin_early_s"), 2e-9);
  EXPECT_EQ(m.Get("zvs_timing_margin_late_s"), 3e-9);
  EXPECT_EQ(m.Get("probe_t_min_s"), 4e-9);
  EXPECT_EQ(m.probe_curve.v_ds_v.size(), 2u);
}

}  // namespace
}  // namespace zvsmap
