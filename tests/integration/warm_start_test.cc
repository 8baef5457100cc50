// Warm starts with real ngspice on the bundled buck template: a point settled
// from its chain predecessor's state and Jacobian reaches the steady state a
// cold start reaches, within issue 16's accuracy bar (0.5 % of the commutated
// current's swing and of the rail), with fewer simulated periods.
#include <gtest/gtest.h>

#include <cmath>

#include "run/chain_memory.h"
#include "run/point_evaluator.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::EdgeOf;
using testing_support::SharedNgspice;
using testing_support::SourcePath;

class WarmStartTest : public ::testing::TestWithParam<SimulationSettings::Loop> {
 protected:
  void SetUp() override {
    Diagnostic error;
    ASSERT_TRUE(LoadTemplate(SourcePath("netlists/buck_halfbridge.cir"), &tmpl_, &error))
        << error.Format();
    spec_.simulation.loop = GetParam();
    spec_.simulation.warm_start = true;  // the default, stated for the reader
  }
  static Point At(size_t index, double iout) {
    return Point{index, {{"Vin", 48}, {"Vout", 12}, {"fsw", 500e3}, {"L", 1.5e-6}, {"Iout", iout}}};
  }
  // The same edges within issue 16's bar: 0.5 % of |peak - valley| for the
  // commutated current, 0.5 % of the rail for the turn-on voltage.
  static void ExpectSameEdges(const PointResult& got, const PointResult& want) {
    const double swing = std::fabs(EdgeOf(want, "low_on").Get("i_commutated_a") -
                                   EdgeOf(want, "high_on").Get("i_commutated_a"));
    for (const char* edge : {"high_on", "low_on"}) {
      const EdgeMeasurement& g = EdgeOf(got, edge);
      const EdgeMeasurement& w = EdgeOf(want, edge);
      EXPECT_NEAR(g.Get("i_commutated_a"), w.Get("i_commutated_a"), 0.005 * swing) << edge;
      EXPECT_NEAR(g.Get("v_turn_on_v"), w.Get("v_turn_on_v"), 0.005 * w.Get("rail_v")) << edge;
    }
  }
  Template tmpl_;
  SweepSpec spec_;
};

// Point 1 (Iout = 5 A) warm from point 0 (Iout = 4 A), against point 1 cold.
TEST_P(WarmStartTest, AWarmStartedPointSettlesWhereAColdStartDoes) {
  PointEvaluator evaluator(spec_, tmpl_);
  Point first = At(0, 4), second = At(1, 5);
  PointResult before = evaluator.EvaluateWarm(first, SharedNgspice(), nullptr);
  ASSERT_EQ(before.status, PointStatus::kOk) << before.reason;
  ASSERT_FALSE(before.settle.jacobian.empty());  // handed on for the chain
  ChainLink link;
  link.previous = 0;
  ChainMemory memory({ChainLink(), link});
  memory.Remember(before);
  std::optional<WarmStart> warm = memory.For(1);
  ASSERT_TRUE(warm.has_value());
  EXPECT_EQ(warm->jacobian.size(), before.settle.initial_state.size());

  PointResult cold = evaluator.EvaluateWarm(second, SharedNgspice(), nullptr);
  PointResult warmed = evaluator.EvaluateWarm(second, SharedNgspice(), &*warm);
  ASSERT_EQ(cold.status, PointStatus::kOk) << cold.reason;
  ASSERT_EQ(warmed.status, PointStatus::kOk) << warmed.reason;
  ExpectSameEdges(warmed, cold);
  EXPECT_LT(warmed.settle.periods, cold.settle.periods);
  EXPECT_LE(warmed.settle.residual, spec_.simulation.settle_tolerance);
}

// A point started from its own settled state is settled at once: its
// one-period first run is the check, then the measured run (its lead, the
// measured period and the tail, run/point_evaluator.h MeasuredRun), and the
// same edges as the cold run.
TEST_P(WarmStartTest, AStartAtTheSettledStateTakesNoNewtonStep) {
  PointEvaluator evaluator(spec_, tmpl_);
  Point point = At(0, 4);
  PointResult cold = evaluator.EvaluateWarm(point, SharedNgspice(), nullptr);
  ASSERT_EQ(cold.status, PointStatus::kOk) << cold.reason;
  WarmStart warm;
  for (const SettledState& s : cold.settle.initial_state) warm.unknowns.push_back(s.value);
  PointResult again = evaluator.EvaluateWarm(point, SharedNgspice(), &warm);
  ASSERT_EQ(again.status, PointStatus::kOk) << again.reason;
  EXPECT_EQ(again.settle.iterations, 0);
  Variables resolved;
  Diagnostic error;
  ASSERT_TRUE(ResolveParams(tmpl_, point.values, &resolved, &error)) << error.Format();
  const double period = 1 / resolved.at("fsw");  // the template's '*@ period 1/fsw'
  EXPECT_DOUBLE_EQ(again.settle.periods,
                   1 + MeasuredRunFor(spec_, tmpl_, resolved, period).periods);
  ExpectSameEdges(again, cold);
}

INSTANTIATE_TEST_SUITE_P(Loops, WarmStartTest,
                         ::testing::Values(SimulationSettings::Loop::kOpen,
                                           SimulationSettings::Loop::kDefault));

}  // namespace
}  // namespace zvsmap
