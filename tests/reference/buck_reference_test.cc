// The synchronous buck template in real ngspice, checked against published
// and derived hand formulas (netlists/references.md sections 1, 2 and 8).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "netlist/template.h"
#include "run/point_evaluator.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::EdgeOf;
using testing_support::SharedNgspice;
using testing_support::SourcePath;

class BuckReferenceTest : public ::testing::Test {
 protected:
  void SetUp() override {
    Diagnostic error;
    ASSERT_TRUE(LoadTemplate(SourcePath("netlists/buck_halfbridge.cir"), &tmpl_, &error))
        << error.Format();
    spec_.simulation.settle_periods = 60;
  }
  PointResult Run(std::vector<ParamValue> values, Waveforms* waves = nullptr) {
    PointEvaluator evaluator(spec_, tmpl_);
    Point p{0, std::move(values)};
    return evaluator.Evaluate(p, SharedNgspice(), waves);
  }
  Template tmpl_;
  SweepSpec spec_;
};

// Inductor ripple of a buck in continuous conduction:
// dI = (Vin - Vo) * D / (L * fs), D = Vo / Vin.
// Erickson & Maksimovic, Fundamentals of Power Electronics, 2nd ed. (2001), ch. 2;
// netlists/references.md section 8 gives dI = 18 A for 48 V -> 12 V, 500 kHz, 1 uH.
TEST_F(BuckReferenceTest, RippleMatchesTheVoltSecondBalanceFormula) {
  const double vin = 48, vo = 12, fs = 500e3, l = 1e-6;
  Waveforms waves;
  PointResult r = Run({{"Vin", vin}, {"Vout", vo}, {"fsw", fs}, {"L", l}, {"Iout", 5}}, &waves);
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  const auto& t = waves.time();
  const auto& il = waves.Get("i(l1)");
  double t_end = t.back(), period = 1 / fs;
  double lo = 1e9, hi = -1e9;
  for (size_t k = 0; k < t.size(); ++k) {
    if (t[k] < t_end - period) continue;
    lo = std::min(lo, il[k]);
    hi = std::max(hi, il[k]);
  }
  double expected = (vin - vo) * (vo / vin) / (l * fs);
  EXPECT_NEAR(expected, 18.0, 1e-9);
  EXPECT_NEAR(hi - lo, expected, 0.03 * expected);
}

// Large commutated current, linear switch capacitance C: the node slews at
// I / (2 C), so the full swing takes 2 * C * Vin / |I| and its 10-90 % part
// 0.8 of that. Mohan, Undeland & Robbins, Power Electronics, 3rd ed. (2003),
// soft-switching chapter; netlists/references.md section 2.
TEST_F(BuckReferenceTest, LowSideTransitionMatchesConstantCurrentSlew) {
  const double c = 1e-9, vin = 48;
  PointResult r = Run({{"Vin", vin}, {"Vout", 12}, {"L", 1e-6}, {"Iout", 5}, {"Coss", c}});
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  const EdgeMeasurement& e = EdgeOf(r, "low_on");
  double current = e.Get("i_commutated_a");
  ASSERT_GT(current, 10.0);  // a large current: peak ~ 14 A (netlists/references.md sec. 8)
  double expected = 0.8 * 2 * c * vin / std::fabs(current);
  EXPECT_NEAR(e.Get("t_transition_s"), expected, 0.05 * expected);
  EXPECT_EQ(e.zvs, ZvsClass::kFull);
}

// The high-side turn-on is zero-voltage switched while the valley current
// I0 = -Iv satisfies I0 >= sqrt(Ceq * Vin * (Vin - 2 Vo) / L), Ceq = 2 Coss
// (resonant transition, netlists/references.md section 2, derived; same analysis as
// Vorperian, IEEE Trans. Power Electron. 3(2), 1988). Sweeping the load moves
// the valley current through the threshold; the class must flip there (10 %).
// Vo in the formula is the simulated average output voltage (open loop, the
// real output sits a little below the Vout parameter).
TEST_F(BuckReferenceTest, HighSideZvsBoundaryFollowsTheResonantThreshold) {
  const double vin = 48, l = 1e-6, coss = 1e-9;
  EXPECT_NEAR(std::sqrt(2 * coss * vin * (vin - 2 * 12.0) / l), 1.518, 0.001);  // sec. 8
  // A tight residual (0.5 V) so "full" means the node reached the rail, and
  // a dead time long enough to reach it near the threshold (the resonant peak
  // comes ~85 ns after the turn-off command there) but short of ring-back.
  spec_.zvs.kind = ZvsCriterion::Kind::kAbsolute;
  spec_.zvs.value = 0.5;
  double last_full = NAN, first_not = NAN;  // I0 / threshold at either side
  for (double iout = 6.9; iout <= 7.85; iout += 0.1) {
    Waveforms waves;
    PointResult r = Run({{"Vin", vin}, {"Vout", 12}, {"L", l}, {"Coss", coss}, {"Iout", iout},
                         {"td_lh", 90e-9}},
                        &waves);
    ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
    const auto& vout = waves.Get("v(out)");
    double vo = 0;
    for (double v : vout) vo += v;
    vo /= static_cast<double>(vout.size());
    double threshold = std::sqrt(2 * coss * vin * (vin - 2 * vo) / l);
    const EdgeMeasurement& e = EdgeOf(r, "high_on");
    double ratio = -e.Get("i_commutated_a") / threshold;
    if (e.zvs == ZvsClass::kFull) {
      last_full = ratio;
    } else if (std::isnan(first_not)) {
      first_not = ratio;
    }
  }
  ASSERT_FALSE(std::isnan(last_full));
  ASSERT_FALSE(std::isnan(first_not));
  EXPECT_GT(last_full, first_not);  // more reverse current, more ZVS
  double boundary = 0.5 * (last_full + first_not);
  EXPECT_NEAR(boundary, 1.0, 0.10)
      << "last full at I0/threshold=" << last_full << ", first not full at " << first_not;
}

}  // namespace
}  // namespace zvsmap
