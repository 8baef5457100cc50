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
      if (ph < 0.1e-6) v = 0;
      else if (ph < 0.12e-6) v = 48 * (ph - 0.1e-6) / 20e-9;
      else if (ph < 0.5e-6) v = 48;
      else if (ph < 0.54e-6) v = 48 - 0.7 * 48 * (ph - 0.5e-6) / 40e-9;
      else if (ph < 0.551e-6) v = 48 * 0.3;
      else v = 0;
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

// The listing `zvsmap params` prints is the list MeasureEdge writes (the
// definitions block of analysis/commutation.h).
TEST_F(CommutationTest, ListedMetricColumnsAreTheOnesMeasured) {
  auto edges = FindEdges(cell_, waves_, 0.02e-6);
  EdgeMeasurement m = MeasureEdge(cell_, waves_, edges[0], ZvsCriterion());
  std::vector<std::string> measured;
  for (const Metric& metric : m.metrics) measured.push_back(metric.column);
  EXPECT_EQ(measured, EdgeMetricColumns());
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
