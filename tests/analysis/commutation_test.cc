#include "analysis/commutation.h"

#include <gtest/gtest.h>

#include <cmath>

#include "analysis/edge_finder.h"

namespace zvsmap {
namespace {

// A synthetic half-bridge period (T = 1 us, 48 V rail): the low switch turns
// off at 0.1 us, the node ramps linearly from 0 to 48 V in 20 ns, the high
// switch turns on at 0.15 us and off at 0.5 us; the node falls in 40 ns only
// 70 % of the way and the low switch turns on at 0.55 us.
class CommutationTest : public ::testing::Test {
 protected:
  void SetUp() override {
    cell_.name = "leg";
    cell_.node = "sw";
    cell_.rail_high = "in";
    cell_.rail_low = "0";
    cell_.current = "vsense";
    cell_.high_cmd = "ch";
    cell_.low_cmd = "cl";
    std::vector<double> t, sw, in, i, ch, cl;
    for (int k = 0; k <= 20000; ++k) {
      double x = k * 1e-10;  // 0 .. 2 us, 0.1 ns grid
      double ph = std::fmod(x, 1e-6);
      t.push_back(x);
      in.push_back(48);
      i.push_back(-3.0);
      ch.push_back(ph >= 0.15e-6 && ph < 0.5e-6 ? 1 : 0);
      cl.push_back(ph < 0.1e-6 || ph >= 0.55e-6 ? 1 : 0);
      double v;
      if (ph < 0.1e-6)
        v = 0;
      else if (ph < 0.12e-6)
        v = 48 * (ph - 0.1e-6) / 20e-9;
      else if (ph < 0.5e-6)
        v = 48;
      else if (ph < 0.54e-6)
        v = 48 - 0.7 * 48 * (ph - 0.5e-6) / 40e-9;
      else if (ph < 0.551e-6)
        v = 48 * 0.3;
      else
        v = 0;
      sw.push_back(v);
    }
    waves_.SetTime(t);
    waves_.Set("v(sw)", sw);
    waves_.Set("v(in)", in);
    waves_.Set("i(vsense)", i);
    waves_.Set("v(ch)", ch);
    waves_.Set("v(cl)", cl);
  }
  CellSpec cell_;
  Waveforms waves_;
};

TEST_F(CommutationTest, FindsTheLatestCompleteEdges) {
  auto edges = FindEdges(cell_, waves_, 0.02e-6);
  ASSERT_EQ(edges.size(), 2u);
  EXPECT_EQ(edges[0].edge, "high_on");
  EXPECT_TRUE(edges[0].incoming_high);
  // Command steps lie on the 0.1 ns grid: crossings within half a sample.
  EXPECT_NEAR(edges[0].t_off_s, 1.1e-6, 1e-10);
  EXPECT_NEAR(edges[0].t_on_s, 1.15e-6, 1e-10);
  EXPECT_NEAR(edges[0].t_end_s, 1.5e-6, 1e-10);
  EXPECT_EQ(edges[1].edge, "low_on");
  EXPECT_NEAR(edges[1].t_off_s, 1.5e-6, 1e-10);
  EXPECT_NEAR(edges[1].t_on_s, 1.55e-6, 1e-10);
}

TEST_F(CommutationTest, RisingEdgeIsFullZvsWithTenToNinetyTime) {
  auto edges = FindEdges(cell_, waves_, 0.02e-6);
  ZvsCriterion crit;  // 10 % of the rail
  EdgeMeasurement m = MeasureEdge(cell_, waves_, edges[0], crit);
  EXPECT_EQ(m.zvs, ZvsClass::kFull);
  EXPECT_NEAR(m.Get("rail_v"), 48, 1e-9);
  EXPECT_NEAR(m.Get("i_commutated_a"), -3, 1e-9);
  EXPECT_NEAR(m.Get("v_turn_on_v"), 0, 1e-6);
  EXPECT_NEAR(m.Get("v_residual_limit_v"), 4.8, 1e-9);
  // 10-90 % of a linear 20 ns ramp is 0.8 x 20 ns (definition of rise time,
  // common practice).
  EXPECT_NEAR(m.Get("t_transition_s"), 16e-9, 0.05e-9);
  EXPECT_NEAR(m.Get("t_dead_s"), 50e-9, 0.2e-9);
}

// A measured run's edges: the first occurrence whose turn-off command falls in
// the measured period, not the latest in the data.
TEST_F(CommutationTest, FindsTheFirstEdgesOfTheMeasuredPeriod) {
  auto edges = FindEdgesFrom(cell_, waves_, 1e-6, 0.3e-6);
  ASSERT_EQ(edges.size(), 2u);
  EXPECT_EQ(edges[0].edge, "high_on");
  EXPECT_NEAR(edges[0].t_off_s, 1.1e-6, 1e-10);  // the one at 0.1 us is before the period
  EXPECT_NEAR(edges[0].t_on_s, 1.15e-6, 1e-10);
  EXPECT_EQ(edges[1].edge, "low_on");
  EXPECT_NEAR(edges[1].t_off_s, 0.5e-6, 1e-10);  // not the later one at 1.5 us
  EXPECT_NEAR(edges[1].t_on_s, 0.55e-6, 1e-10);
  EXPECT_NEAR(edges[1].t_end_s, 1.1e-6, 1e-10);
  EXPECT_NEAR(edges[1].conduction_s, 0.55e-6, 1e-10);
}

// The run's last edge ends with the data: the incoming switch's conduction
// then comes from the period before (the commands repeat every period), and an
// edge whose turn-on is within the guard of the end is not complete.
TEST_F(CommutationTest, TheLastEdgeOfARunTakesItsConductionFromThePeriodBefore) {
  Waveforms run = waves_.Window(0, 1.3e-6);
  auto edges = FindEdgesFrom(cell_, run, 1e-6, 1.0e-6);
  ASSERT_EQ(edges.size(), 1u);  // low_on's turn-off at 1.5 us lies beyond the data
  EXPECT_EQ(edges[0].edge, "high_on");
  EXPECT_NEAR(edges[0].t_on_s, 1.15e-6, 1e-10);
  EXPECT_NEAR(edges[0].t_end_s, run.time().back(), 1e-12);
  EXPECT_NEAR(edges[0].conduction_s, 0.35e-6, 1e-10);  // 0.15 us to 0.5 us
  // Turn-on at 1.15 us against an end at 1.16 us: inside the 0.02 us guard.
  EXPECT_TRUE(FindEdgesFrom(cell_, waves_.Window(0, 1.16e-6), 1e-6, 1.0e-6).empty());
}

// The node's average in the energy needed (netlists/references.md sec. 2) is a
// period average: over the data's last whole period it is the same for a run
// of 1.3 periods as for two whole periods.
TEST_F(CommutationTest, TheEnergyNeededAveragesTheNodeOverOnePeriod) {
  EdgeParams params;
  params.coss_f = 1e-9;
  params.inductance_h = 1e-6;
  params.period_s = 1e-6;
  ZvsCriterion crit;
  auto whole = FindEdgesFrom(cell_, waves_, 1e-6, 1.0e-6);
  Waveforms run = waves_.Window(0, 1.3e-6);
  auto part = FindEdgesFrom(cell_, run, 1e-6, 1.0e-6);
  ASSERT_FALSE(whole.empty());
  ASSERT_FALSE(part.empty());
  double need_whole = MeasureEdge(cell_, waves_, whole[0], crit, params).Get("e_needed_j");
  double need_part = MeasureEdge(cell_, run, part[0], crit, params).Get("e_needed_j");
  // The waveform repeats every period, so any whole period has the same
  // average; equal to a part in 1e-3 (the 0.1 ns grid against the window).
  ASSERT_TRUE(std::isfinite(need_whole));
  EXPECT_NEAR(need_part, need_whole, 1e-3 * std::fabs(need_whole));
  params.period_s = NAN;  // all of the 1.3-period data: biased toward the high plateau
  double biased = MeasureEdge(cell_, run, part[0], crit, params).Get("e_needed_j");
  EXPECT_GT(std::fabs(biased - need_whole), 0.05 * std::fabs(need_whole));
}

// The exported list of metric names is exactly what MeasureEdge gives, in
// order (the up-front name checks rely on it; README "Metrics" lists them).
TEST_F(CommutationTest, MetricNamesAreTheExportedList) {
  auto edges = FindEdges(cell_, waves_, 0.02e-6);
  for (const EdgeTiming& e : edges) {
    EdgeMeasurement m = MeasureEdge(cell_, waves_, e, ZvsCriterion());
    std::vector<std::string> names;
    for (const Metric& metric : m.metrics) names.push_back(metric.column);
    EXPECT_EQ(names, EdgeMetricNames());
  }
}

TEST_F(CommutationTest, FallingEdgeThatStallsIsPartialWithoutTransitionTime) {
  auto edges = FindEdges(cell_, waves_, 0.02e-6);
  ZvsCriterion crit;
  EdgeMeasurement m = MeasureEdge(cell_, waves_, edges[1], crit);
  // The low switch sees 30 % of the rail at turn-on: above 10 %, below 50 %.
  EXPECT_NEAR(m.Get("v_turn_on_v"), 14.4, 1e-6);
  EXPECT_EQ(m.zvs, ZvsClass::kPartial);
  // The node then falls to 0 V at turn-on (0.55 us), within the window: the
  // 90 % point is reached at the hard-switched drop.
  EXPECT_TRUE(std::isfinite(m.Get("t_transition_s")));
  crit.kind = ZvsCriterion::Kind::kAbsolute;
  crit.value = 20;
  EXPECT_EQ(MeasureEdge(cell_, waves_, edges[1], crit).zvs, ZvsClass::kFull);
  crit.value = 1;
  EdgeMeasurement hard_check = MeasureEdge(cell_, waves_, edges[1], crit);
  EXPECT_EQ(hard_check.zvs, ZvsClass::kPartial);
}

// Timing margins on the fixture's linear ramps: the values follow from the
// ramp's equation; the ramps' knees lie on the 0.1 ns grid, the command
// steps do not: their 0.5 crossing is interpolated half a sample (0.05 ns)
// before the step. Class and margin agree (definition in commutation.h).
TEST_F(CommutationTest, TimingMarginsOfTheRampsAreExact) {
  auto edges = FindEdges(cell_, waves_, 0.02e-6);
  ZvsCriterion crit;  // 10 % of the rail: 4.8 V
  // Rising 0 -> 48 V in 20 ns: the high switch's v_ds falls to 4.8 V after
  // 0.9 x 20 = 18 ns after the step; turn-on 50 ns after it. It stays
  // clamped past turn-on: the run cannot see the late end.
  EdgeMeasurement up = MeasureEdge(cell_, waves_, edges[0], crit);
  EXPECT_NEAR(up.Get("zvs_timing_margin_early_s"), (50e-9 - 0.05e-9) - 18e-9, 1e-12);
  EXPECT_NEAR(up.Get("t_dead_s") - up.Get("t_clamp_s"), up.Get("zvs_timing_margin_early_s"), 1e-15);
  EXPECT_TRUE(std::isnan(up.Get("zvs_timing_margin_late_s")));
  EXPECT_EQ(up.zvs, ZvsClass::kFull);
  // Falling edge stalls at 14.4 V > 4.8 V: never meets the criterion.
  EdgeMeasurement down = MeasureEdge(cell_, waves_, edges[1], crit);
  EXPECT_TRUE(std::isnan(down.Get("zvs_timing_margin_early_s")));
  EXPECT_TRUE(std::isnan(down.Get("zvs_timing_margin_late_s")));
  EXPECT_NE(down.zvs, ZvsClass::kFull);
  // With a 20 V limit it does: 48 - 33.6 V * t / 40 ns = 20 V at t = 33.33 ns.
  crit.kind = ZvsCriterion::Kind::kAbsolute;
  crit.value = 20;
  down = MeasureEdge(cell_, waves_, edges[1], crit);
  EXPECT_NEAR(down.Get("zvs_timing_margin_early_s"), (50e-9 - 0.05e-9) - 28.0 / 33.6 * 40e-9,
              1e-12);
  EXPECT_EQ(down.zvs, ZvsClass::kFull);
}

// A rising edge that rings back before turn-on: 0 -> 48 V in 20 ns after
// t_off = 100 ns, held until 150 ns, back down to 30 V by 170 ns; turn-on
// at 180 ns. The energy view cannot see this; the late margin does.
TEST(TimingMarginTest, RingBackBeforeTurnOnIsLateNotEarly) {
  CellSpec cell;
  cell.name = "leg";
  cell.node = "sw";
  cell.rail_high = "in";
  cell.rail_low = "0";
  cell.current = "vsense";
  cell.high_cmd = "ch";
  cell.low_cmd = "cl";
  std::vector<double> t, sw, in, i, ch, cl;
  for (int k = 0; k <= 5000; ++k) {
    double x = k * 1e-10;  // 0 .. 500 ns
    t.push_back(x);
    in.push_back(48);
    i.push_back(-3.0);
    ch.push_back(x >= 180e-9 && x < 400e-9 ? 1 : 0);
    cl.push_back(x < 100e-9 ? 1 : 0);
    double v = x < 100e-9   ? 0
               : x < 120e-9 ? 48 * (x - 100e-9) / 20e-9
               : x < 150e-9 ? 48
               : x < 170e-9 ? 48 - 18 * (x - 150e-9) / 20e-9
                            : 30;
    sw.push_back(v);
  }
  Waveforms waves;
  waves.SetTime(t);
  waves.Set("v(sw)", sw);
  waves.Set("v(in)", in);
  waves.Set("i(vsense)", i);
  waves.Set("v(ch)", ch);
  waves.Set("v(cl)", cl);
  EdgeTiming e{"high_on", true, 100e-9, 180e-9, 400e-9};
  EdgeMeasurement m = MeasureEdge(cell, waves, e, ZvsCriterion());
  // v_ds = 18 V at turn-on: partial (above 4.8 V, below 24 V).
  EXPECT_EQ(m.zvs, ZvsClass::kPartial);
  // In the criterion from 118 ns (0.9 x 20 ns after t_off) until the node
  // falls below 43.2 V: 150 ns + 4.8/18 x 20 ns = 155.33 ns.
  EXPECT_NEAR(m.Get("zvs_timing_margin_early_s"), 80e-9 - 18e-9, 1e-12);
  EXPECT_NEAR(m.Get("zvs_timing_margin_late_s"), (50e-9 + 4.8 / 18 * 20e-9) - 80e-9, 1e-12);
  // Turn-on at 140 ns, within the criterion: full, 22 ns early margin. The
  // window ends at turn-on (no gate threshold named), so the later exit is
  // not seen: late margin NaN.
  e.t_on_s = 140e-9;
  m = MeasureEdge(cell, waves, e, ZvsCriterion());
  EXPECT_EQ(m.zvs, ZvsClass::kFull);
  EXPECT_NEAR(m.Get("zvs_timing_margin_early_s"), 22e-9, 1e-12);
  EXPECT_TRUE(std::isnan(m.Get("zvs_timing_margin_late_s")));
}

// Class and timing margins never disagree, over dead times that cut the
// ramp, the clamp and the ring-back of the waveform above (definition in
// commutation.h; the criterion and the class read the same v_ds).
TEST(TimingMarginTest, ClassAgreesWithTheMarginsAtEveryDeadTime) {
  CellSpec cell;
  cell.name = "leg";
  cell.node = "sw";
  cell.rail_high = "in";
  cell.rail_low = "0";
  cell.current = "vsense";
  cell.high_cmd = "ch";
  cell.low_cmd = "cl";
  std::vector<double> t, sw, in, i, ch, cl;
  for (int k = 0; k <= 5000; ++k) {
    double x = k * 1e-10;
    t.push_back(x);
    in.push_back(48);
    i.push_back(-3.0);
    ch.push_back(0);
    cl.push_back(x < 100e-9 ? 1 : 0);
    sw.push_back(x < 100e-9   ? 0
                 : x < 120e-9 ? 48 * (x - 100e-9) / 20e-9
                 : x < 150e-9 ? 48
                 : x < 170e-9 ? 48 - 18 * (x - 150e-9) / 20e-9
                              : 30);
  }
  Waveforms waves;
  waves.SetTime(t);
  waves.Set("v(sw)", sw);
  waves.Set("v(in)", in);
  waves.Set("i(vsense)", i);
  waves.Set("v(ch)", ch);
  waves.Set("v(cl)", cl);
  int full = 0;
  for (double dead = 1.05e-9; dead < 95e-9; dead += 1e-9) {
    EdgeTiming e{"high_on", true, 100e-9, 100e-9 + dead, 400e-9};
    EdgeMeasurement m = MeasureEdge(cell, waves, e, ZvsCriterion());
    double early = m.Get("zvs_timing_margin_early_s");
    double late = m.Get("zvs_timing_margin_late_s");
    bool margins_say_full = early >= 0 && !(late < 0);
    EXPECT_EQ(m.zvs == ZvsClass::kFull, margins_say_full) << "dead time " << dead;
    full += m.zvs == ZvsClass::kFull;
  }
  // 18 ns .. 55.33 ns meets the criterion: dead times 18.05 .. 55.05 ns.
  EXPECT_EQ(full, 38);
}

TEST(CrossingsTest, InterpolatesLinearly) {
  std::vector<double> t = {0, 1, 2, 3};
  std::vector<double> v = {0, 2, 0, 2};
  auto up = Crossings(t, v, 1.0, true, 0, 3);
  ASSERT_EQ(up.size(), 2u);
  EXPECT_DOUBLE_EQ(up[0], 0.5);
  EXPECT_DOUBLE_EQ(up[1], 2.5);
  auto down = Crossings(t, v, 1.0, false, 0, 3);
  ASSERT_EQ(down.size(), 1u);
  EXPECT_DOUBLE_EQ(down[0], 1.5);
  EXPECT_TRUE(Crossings(t, v, 1.0, true, 0.6, 2.4).empty());
}

}  // namespace
}  // namespace zvsmap
