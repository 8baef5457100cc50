// The built-in buck model beside real ngspice on points where its assumptions
// hold (linear Coss, large output capacitor, continuous conduction, ZVS on
// both edges): ripple, valley current and transition time within 3 %.
// Formulas: netlists/references.md sections 1 and 2.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "handcalc/hand_calculation.h"
#include "netlist/render.h"
#include "run/point_evaluator.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::SharedNgspice;
using testing_support::SourcePath;

class HandcalcReferenceTest : public ::testing::TestWithParam<std::pair<double, double>> {
 protected:
  void SetUp() override {
    Diagnostic error;
    ASSERT_TRUE(LoadTemplate(SourcePath("netlists/buck_halfbridge.cir"), &tmpl_, &error))
        << error.Format();
    tmpl_.model = "buck";  // as `*@ model buck` would choose it
  }
  Template tmpl_;
  SweepSpec spec_;
};

TEST_P(HandcalcReferenceTest, RippleValleyAndTransitionWithinThreePercent) {
  auto [l, iout] = GetParam();
  Point point{0, {{"Vin", 48}, {"Vout", 12}, {"fsw", 500e3}, {"L", l}, {"Iout", iout}}};
  PointEvaluator evaluator(spec_, tmpl_);
  Waveforms waves;
  PointResult r = evaluator.Evaluate(point, SharedNgspice(), &waves);
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  ASSERT_TRUE(r.reason.empty()) << r.reason;

  // The simulated operating point over the last period: the open-loop output
  // sits a little below the Vout parameter (conduction and dead-time losses),
  // so the model is fed the simulated average Vo and inductor current, as an
  // engineer checking a measured converter would.
  const auto& t = waves.time();
  const auto& il = waves.Get("i(l1)");
  const auto& vout = waves.Get("v(out)");
  double period = 2e-6, t_end = t.back();
  double lo = 1e9, hi = -1e9, il_sum = 0, vo_sum = 0, dt_sum = 0;
  for (size_t k = 1; k < t.size(); ++k) {
    if (t[k] < t_end - period) continue;
    lo = std::min(lo, il[k]);
    hi = std::max(hi, il[k]);
    double dt = t[k] - t[k - 1];
    il_sum += 0.5 * (il[k] + il[k - 1]) * dt;
    vo_sum += 0.5 * (vout[k] + vout[k - 1]) * dt;
    dt_sum += dt;
  }
  Variables resolved;
  Diagnostic error;
  ASSERT_TRUE(ResolveParams(tmpl_, point.values, &resolved, &error)) << error.Format();
  resolved["vout"] = vo_sum / dt_sum;
  resolved["iout"] = il_sum / dt_sum;
  HandCalculation calc;
  ASSERT_TRUE(ComputeHandCalculation(spec_, tmpl_, resolved, &calc, &error)) << error.Format();
  const CellCalculation& cell = calc.cells.at(0);
  auto edge = [&](const char* name) -> const EdgeMeasurement& {
    for (const auto& e : r.edges)
      if (e.edge == name) return e;
    throw Error(std::string("no edge ") + name);
  };

  // dI = (Vin - Vo)*D/(L*fs): Erickson & Maksimovic 2001, ch. 2.
  double ripple = cell.Find("ripple_a")->value;
  EXPECT_NEAR(hi - lo, ripple, 0.03 * ripple) << "Vo = " << resolved["vout"];
  // Iv = Io - dI/2 (same source), the current at the low-side turn-off.
  double valley = cell.Find("i_valley_a")->value;
  EXPECT_NEAR(edge("high_on").Get("i_commutated_a"), valley, 0.03 * std::fabs(valley));
  // Ipk = Io + dI/2 (same source), the current at the high-side turn-off.
  double peak = cell.Find("i_peak_a")->value;
  EXPECT_NEAR(edge("low_on").Get("i_commutated_a"), peak, 0.03 * peak);
  // 10-90 % of the resonant swing: netlists/references.md sec. 2 (derived; Vorperian 1988).
  for (const char* name : {"high_on", "low_on"}) {
    double predicted = cell.Find(std::string(name) + "_t_transition_s")->value;
    ASSERT_FALSE(std::isnan(predicted)) << name;
    EXPECT_NEAR(edge(name).Get("t_transition_s"), predicted, 0.03 * predicted) << name;
    // The run itself carries the same pairing as columns (model fed the
    // Vout/Iout parameters there, so only present and finite is checked).
    EXPECT_FALSE(std::isnan(edge(name).Get("t_transition_s__pred"))) << name;
  }
}

// The run's own comparison columns, the model fed the sweep's Vout and Iout
// as they stand (no correction): regulated, the simulated point sits at that
// Vout, so the commutated current (valley before the high-side turn-on, peak
// before the low-side one; Iv, Ipk = Io -/+ dI/2, Erickson & Maksimovic 2001,
// ch. 2) agrees within 3 % on every ZVS edge whose transition takes under
// 40 % of its dead time (the model's constant current and instant edges;
// beyond that the dead-time intervals reshape the triangle). The 48 -> 12 V
// demo grid's corners and middle (invented values). Open loop, the valley
// was off by up to 19 % at 8 A on the same grid.
TEST_F(HandcalcReferenceTest, RegulatedCommutatedCurrentMatchesTheRunsOwnComparison) {
  PointEvaluator evaluator(spec_, tmpl_);
  int checked = 0;
  for (double l : {0.68e-6, 1e-6, 1.5e-6}) {
    for (double iout : {0.0, 4.0, 8.0}) {
      Point point{0, {{"Vin", 48}, {"Vout", 12}, {"fsw", 500e3}, {"L", l}, {"Iout", iout}}};
      PointResult r = evaluator.Evaluate(point, SharedNgspice());
      ASSERT_EQ(r.status, PointStatus::kOk) << r.reason;
      ASSERT_EQ(r.operating.loop, LoopKind::kRegulated);
      for (const EdgeMeasurement& e : r.edges) {
        if (e.zvs != ZvsClass::kFull ||
            !(e.Get("t_transition_s") < 0.4 * e.Get("t_dead_s"))) {
          continue;
        }
        ++checked;
        EXPECT_LT(std::fabs(e.Get("i_commutated_a__pred__rel_diff")), 0.03)
            << e.edge << " at L " << l << ", Iout " << iout << ": measured "
            << e.Get("i_commutated_a") << " A, predicted " << e.Get("i_commutated_a__pred");
      }
    }
  }
  EXPECT_GE(checked, 12);  // most of the 18 edges meet the model's assumptions
}

// Points whose dead-time transitions take under ~1.5 % of the period (the
// ideal-switch volt-second balance ignores them): the netlists/references.md sec. 8
// check case (1 uH, 5 A), a lighter load, and a smaller inductor. At 2.2 uH and
// 2 A the high-side swing takes ~44 ns (2.2 % of the period) and the
// simulated valley current came out 6 % smaller than predicted (measured while
// writing this test): the model's limit, not a failure of the simulation.
INSTANTIATE_TEST_SUITE_P(ZvsBothEdges, HandcalcReferenceTest,
                         ::testing::Values(std::make_pair(1e-6, 2.0), std::make_pair(1e-6, 5.0),
                                           std::make_pair(0.68e-6, 5.0)));

}  // namespace
}  // namespace zvsmap
