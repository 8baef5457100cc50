// The phase-shift-modulated full-bridge template in real ngspice, checked
// against the published and derived hand formulas of netlists/references.md
// section 4: Sabate, Vlatkovic, Ridley, Lee & Cho, "Design considerations for
// high-voltage high-power full-bridge zero-voltage-switched PWM converter",
// APEC 1990, and the charge-based lagging-leg condition [derived].
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "analysis/edge_finder.h"
#include "netlist/template.h"
#include "run/point_evaluator.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::EdgeOf;
using testing_support::SharedNgspice;
using testing_support::SourcePath;

// The template's default scenario: 400 V in, n = 6, 100 kHz, 150 pF linear
// Coss per switch. Lm and Lo are raised here so that the magnetising current
// and the output ripple, which the textbook formulas leave out, stay small.
constexpr double kVin = 400, kN = 6, kFs = 100e3, kCoss = 150e-12;

class FullBridgeReferenceTest : public ::testing::Test {
 protected:
  void SetUp() override {
    Diagnostic error;
    ASSERT_TRUE(LoadTemplate(SourcePath("netlists/fullbridge_psm.cir"), &tmpl_, &error))
        << error.Format();
    ASSERT_EQ(tmpl_.cells.size(), 2u);
    spec_.simulation.max_step_s = 5e-9;
  }
  PointResult Run(std::vector<ParamValue> values, Waveforms* waves = nullptr) {
    values.insert(values.end(), {{"Vin", kVin}, {"n", kN}, {"fsw", kFs}, {"Coss", kCoss},
                                 {"Lm", 10e-3}, {"Lo", 100e-6}});
    PointEvaluator evaluator(spec_, tmpl_);
    Point p{0, std::move(values)};
    return evaluator.Evaluate(p, SharedNgspice(), waves);
  }
  const CellSpec& Cell(const std::string& name) const {
    for (const auto& c : tmpl_.cells)
      if (c.name == name) return c;
    throw Error("cell " + name + " missing");
  }
  Template tmpl_;
  SweepSpec spec_;
};

// Every edge of both legs is found and measured, and at full load with the
// default Lr all four are zero-voltage switched (the demo scenario).
TEST_F(FullBridgeReferenceTest, BothLegsHaveBothEdgesMeasured) {
  PointResult r = Run({{"Lr", 10e-6}, {"Iout", 20}});
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  ASSERT_EQ(r.edges.size(), 4u);
  for (const char* cell : {"lead", "lag"}) {
    for (const char* edge : {"high_on", "low_on"}) {
      EXPECT_EQ(EdgeOf(r, edge, cell).zvs, ZvsClass::kFull) << cell << "." << edge;
    }
  }
}

// Lagging leg: the winding is shorted by the rectifier's overlap, so only Lr
// drives the node through the resonance with Ceq = 2*Coss + C_TR:
// v(t) = Ip*Zr*sin(w_r*t), so the node reaches the rail at
// w_r*t = asin(Vin/(Ip*Zr)), Zr = sqrt(Lr/Ceq), w_r = 1/sqrt(Lr*Ceq).
// netlists/references.md section 4 [derived]; Sabate et al., APEC 1990. Within 3 %.
TEST_F(FullBridgeReferenceTest, LaggingLegTransitionFollowsTheResonantArcsine) {
  const double lr = 10e-6, ctr = 1e-12;  // Ctr = 0 in the template means 1 pF
  PointResult r = Run({{"Lr", lr}, {"Iout", 20}, {"Ctr", 0}});
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  const double ceq = 2 * kCoss + ctr, zr = std::sqrt(lr / ceq), wr = 1 / std::sqrt(lr * ceq);
  for (const char* edge : {"high_on", "low_on"}) {
    const EdgeMeasurement& e = EdgeOf(r, edge, "lag");
    const double ip = std::fabs(e.Get("i_commutated_a"));
    ASSERT_GT(ip * zr, kVin) << edge << ": the resonance must reach the rail";
    const double expected = std::asin(kVin / (ip * zr)) / wr;
    EXPECT_NEAR(e.Get("t_zvs_s"), expected, 0.03 * expected) << edge << ", Ip = " << ip;
    // The 10 % -> 90 % part of the same arc.
    const double t10 = std::asin(0.1 * kVin / (ip * zr)) / wr;
    const double t90 = std::asin(0.9 * kVin / (ip * zr)) / wr;
    EXPECT_NEAR(e.Get("t_transition_s"), t90 - t10, 0.03 * (t90 - t10)) << edge;
  }
}

// Leading leg: the reflected output-inductor current keeps the primary current
// nearly constant, so the node swings in t = (2*Qoss(Vin) + C_TR*Vin)/Ip, and
// 10 % -> 90 % takes 0.8 of that. Sabate et al., APEC 1990; netlists/references.md
// section 4. Within 5 %, with and without a transformer capacitance.
// Ip is the primary current read 2 ns before the turn-off command: at the
// command instant the outgoing channel is already off and C_TR (across the
// bridge output) already takes its share, so i_commutated_a there is the
// current out of node a net of C_TR's.
TEST_F(FullBridgeReferenceTest, LeadingLegTransitionIsTheChargeOverTheReflectedCurrent) {
  for (double ctr : {1e-12, 100e-12}) {
    Waveforms waves;
    PointResult r = Run({{"Lr", 10e-6}, {"Iout", 20}, {"Ctr", ctr}}, &waves);
    ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
    std::vector<EdgeTiming> timings = FindEdges(Cell("lead"), waves, 0.02 / kFs);
    ASSERT_EQ(timings.size(), 2u);
    for (const EdgeTiming& timing : timings) {
      const EdgeMeasurement& e = EdgeOf(r, timing.edge, "lead");
      const double ip = std::fabs(waves.At("i(vpa)", timing.t_off_s - 2e-9));
      const double expected = 0.8 * (2 * kCoss * kVin + ctr * kVin) / ip;
      EXPECT_NEAR(e.Get("t_transition_s"), expected, 0.05 * expected)
          << timing.edge << ", Ctr = " << ctr << ", Ip = " << ip;
    }
  }
}

// Duty-cycle loss: after each lagging-leg transition the primary current
// reverses through Lr (slope Vin/Lr) from +Io/n to -Io/n while the rectifier
// shorts the winding: dD = 4*Lr*fs*Io/(n*Vin) of the half period.
// Sabate et al., APEC 1990; netlists/references.md section 4. Within 10 %.
// Measured from the waveforms: from the lag node's 50 % crossing to the
// instant the secondary carries the whole output-inductor current again,
// n*|i_p - i_m| >= 0.99*i_Lo.
TEST_F(FullBridgeReferenceTest, DutyCycleLossMatchesSabate) {
  const double lr = 20e-6, io = 20;
  Waveforms waves;
  PointResult r = Run({{"Lr", lr}, {"Iout", io}}, &waves);
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  const auto& t = waves.time();
  const auto& vb = waves.Get("v(b)");
  const auto& ip = waves.Get("i(vpa)");
  const auto& im = waves.Get("i(lm)");
  const auto& ilo = waves.Get("i(lo)");
  // The lag leg's high-side turn-on in the measured window: node b rises.
  std::vector<EdgeTiming> edges = FindEdges(Cell("lag"), waves, 0.02 / kFs);
  auto it = std::find_if(edges.begin(), edges.end(),
                         [](const EdgeTiming& e) { return e.edge == "high_on"; });
  ASSERT_NE(it, edges.end());
  std::vector<double> rise = Crossings(t, vb, kVin / 2, true, it->t_off_s, it->t_end_s);
  ASSERT_FALSE(rise.empty());
  double t_start = rise.front(), t_end = NAN;
  for (size_t k = 0; k < t.size(); ++k) {
    if (t[k] <= t_start) continue;
    // Before: +Io/n flows a -> b; after the reversal the secondary carries
    // i_Lo the other way: n*(i_p - i_m) = -i_Lo.
    if (-kN * (ip[k] - im[k]) >= 0.99 * ilo[k]) {
      t_end = t[k];
      break;
    }
  }
  ASSERT_FALSE(std::isnan(t_end));
  const double d_loss = (t_end - t_start) * 2 * kFs;
  const double expected = 4 * lr * kFs * io / (kN * kVin);
  EXPECT_NEAR(d_loss, expected, 0.10 * expected) << "reversal took " << (t_end - t_start) << " s";
}

// Minimum load for lagging-leg ZVS: with Ip the lag leg's commutated current,
// ZVS needs 1/2*Lr*Ip^2 >= Vin*Qoss(Vin) + 1/2*C_TR*Vin^2 (netlists/references.md
// section 4 [derived], the charge-based form). Sweeping the load across the
// boundary, the simulated class must flip where the measured current crosses
// the predicted threshold, within 5 %. A tight residual (2 V) so that "full"
// means the node reached the rail.
TEST_F(FullBridgeReferenceTest, LaggingLegZvsBoundaryFollowsTheChargeCondition) {
  const double lr = 10e-6, ctr = 1e-12;
  spec_.zvs.kind = ZvsCriterion::Kind::kAbsolute;
  spec_.zvs.value = 2.0;
  const double i_zvs = std::sqrt(2 * (kVin * kCoss * kVin + 0.5 * ctr * kVin * kVin) / lr);
  double last_not = NAN, first_full = NAN;  // Ip / i_zvs at either side
  for (double io = 10; io <= 16.01; io += 1.0) {
    PointResult r = Run({{"Lr", lr}, {"Iout", io}});
    ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
    const EdgeMeasurement& e = EdgeOf(r, "high_on", "lag");
    const double ratio = std::fabs(e.Get("i_commutated_a")) / i_zvs;
    if (e.zvs == ZvsClass::kFull) {
      if (std::isnan(first_full)) first_full = ratio;
    } else {
      last_not = ratio;
    }
  }
  ASSERT_FALSE(std::isnan(last_not));
  ASSERT_FALSE(std::isnan(first_full));
  EXPECT_LT(last_not, first_full);
  EXPECT_NEAR(0.5 * (last_not + first_full), 1.0, 0.05)
      << "last not full at Ip/I_zvs = " << last_not << ", first full at " << first_full;
}

}  // namespace
}  // namespace zvsmap
