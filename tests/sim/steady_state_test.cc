#include "sim/steady_state.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <sstream>

namespace zvsmap {
namespace {

// A fake simulator whose "circuit" is an affine period map x' = A x + b of
// two states, with the start state and the number of periods written into
// the netlist text by the renderer. Within a period the states move linearly
// plus a fixed ripple bump, so the ripple is known.
class AffineMapSimulator : public Simulator {
 public:
  double a[2][2] = {{0.5, 0.2}, {-0.1, 0.9}};
  double b[2] = {1.0, 2.0};
  double ripple[2] = {0.5, 0.01};
  double c[2] = {0, 0};  // the control's effect per period: x' = A x + b + c u
  int runs = 0;
  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>& vectors,
                       double tstop_s) override {
    ++runs;
    std::istringstream in(netlist);
    double x[2];
    int periods = 0;
    double u = 0;
    in >> x[0] >> x[1] >> periods >> u;
    SimulationOutput out;
    out.ok = true;
    std::vector<double> t;
    std::vector<double> v[2];
    const int per = 10;
    for (int k = 0; k < periods; ++k) {
      double next[2] = {a[0][0] * x[0] + a[0][1] * x[1] + b[0] + c[0] * u,
                        a[1][0] * x[0] + a[1][1] * x[1] + b[1] + c[1] * u};
      for (int j = 1; j <= per; ++j) {
        double f = static_cast<double>(j) / per;
        t.push_back((k + f) * tstop_s / (periods + kPeriodOverrun));
        for (int i = 0; i < 2; ++i) {
          v[i].push_back(x[i] + f * (next[i] - x[i]) + ripple[i] * std::sin(M_PI * f));
        }
      }
      x[0] = next[0];
      x[1] = next[1];
    }
    t.push_back(tstop_s);  // the run's short overrun past the last boundary
    v[0].push_back(v[0].back());
    v[1].push_back(v[1].back());
    out.waves.SetTime(t);
    out.waves.Set(vectors[0], v[0]);
    out.waves.Set(vectors[1], v[1]);
    return out;
  }
  // The fixed point of the map: (I - A)^-1 b.
  void FixedPoint(double* x) const {
    double m00 = 1 - a[0][0], m01 = -a[0][1], m10 = -a[1][0], m11 = 1 - a[1][1];
    double det = m00 * m11 - m01 * m10;
    x[0] = (m11 * b[0] - m01 * b[1]) / det;
    x[1] = (-m10 * b[0] + m00 * b[1]) / det;
  }
};

PeriodRenderer Renderer() {
  return [](const std::vector<double>& x, int periods, std::string* netlist, std::string*) {
    char buf[128];
    std::snprintf(buf, sizeof buf, "%.17g %.17g %d", x[0], x[1], periods);
    *netlist = buf;
    return true;
  };
}

// The renderer of a run with a control unknown: the control is x's last entry.
PeriodRenderer ControlRenderer() {
  return [](const std::vector<double>& x, int periods, std::string* netlist, std::string*) {
    char buf[160];
    std::snprintf(buf, sizeof buf, "%.17g %.17g %d %.17g", x[0], x[1], periods, x[2]);
    *netlist = buf;
    return true;
  };
}

const std::vector<std::string> kVectors = {"i(l1)", "v(out)"};
const std::vector<SlowState> kStates = {{"i(l1)", 0.0, 1e-3}, {"v(out)", 0.0, 1e-3}};

// Newton on an affine map converges in one step (its finite-difference
// Jacobian is exact): Aprille & Trick, Proc. IEEE 60(1), 1972.
TEST(SteadyStateTest, ShootingSolvesAnAffineMapInOneNewtonStep) {
  AffineMapSimulator sim;
  SteadyStateOptions options;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.method, SettleMethod::kShooting);
  EXPECT_EQ(r.iterations, 1);
  // 1 base run + 2 Jacobian runs + 1 run at the Newton step.
  EXPECT_EQ(r.periods, 4);
  EXPECT_EQ(sim.runs, 4);
  double fixed[2];
  sim.FixedPoint(fixed);  // linear algebra, no source needed
  EXPECT_NEAR(r.state[0], fixed[0], 1e-9);
  EXPECT_NEAR(r.state[1], fixed[1], 1e-9);
  EXPECT_LE(r.residual, options.tolerance);
  EXPECT_NEAR(r.ripple[0], 0.5, 0.05);  // the sine bump over the period
}

// With trial runs as long as the measured run, the Newton run that settled is
// handed back whole: it starts at the settled state and spans those periods.
TEST(SteadyStateTest, TheSettlingTrialRunIsHandedBackAsTheMeasuredRun) {
  AffineMapSimulator sim;
  SteadyStateOptions options;
  options.trial_periods = 2;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.iterations, 1);
  EXPECT_EQ(r.periods, 5);  // 1 base run + 2 Jacobian runs + the 2-period trial run
  ASSERT_TRUE(r.final_run.ok);
  const Waveforms& w = r.final_run.waves;
  EXPECT_NEAR(w.time().back(), (2 + kPeriodOverrun) * 1e-6, 1e-12);
  double fixed[2];
  sim.FixedPoint(fixed);
  // The fixed point repeats at both period boundaries of the run.
  EXPECT_NEAR(w.At("i(l1)", 1e-6), fixed[0], 1e-9);
  EXPECT_NEAR(w.At("i(l1)", 2e-6), fixed[0], 1e-9);
  EXPECT_NEAR(r.ripple[0], 0.5, 0.05);  // read over the run's first period
}

TEST(SteadyStateTest, PeriodByPeriodReachesTheSameFixedPoint) {
  AffineMapSimulator sim;
  SteadyStateOptions options;
  options.method = SettleMethod::kPeriods;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.method, SettleMethod::kPeriods);
  double fixed[2];
  sim.FixedPoint(fixed);
  // Settled means within the tolerance relative to ripple (floor 1 mV):
  // here max(1e-3 * 0.5, 1e-3) and max(1e-3 * 0.01, 1e-3).
  EXPECT_NEAR(r.state[0], fixed[0], 2e-2);
  EXPECT_NEAR(r.state[1], fixed[1], 2e-2);
  EXPECT_GT(r.periods, 20);
}

// A slow, non-oscillating mode (contraction 0.995 per period): the last 20
// boundaries lie within 1e-3 of each other while the state is still ~10x the
// tolerance from the fixed point (20 * 0.005 * distance = 1e-3). The
// geometric-tail test must carry on until the distance itself is within the
// tolerance. Geometric series; linear algebra for the fixed point, no source.
TEST(SteadyStateTest, PeriodByPeriodDoesNotStopEarlyOnASlowMode) {
  AffineMapSimulator sim;
  sim.a[0][0] = 0.995;
  sim.a[0][1] = 0;
  sim.a[1][0] = 0;
  sim.a[1][1] = 0.995;
  sim.b[0] = 0.1;
  sim.b[1] = 0.05;
  SteadyStateOptions options;
  options.method = SettleMethod::kPeriods;
  options.max_periods = 5000;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  double fixed[2];
  sim.FixedPoint(fixed);  // (20, 10)
  // Scale of both states: max(ripple, floor / tolerance) = 1, so 1e-3.
  EXPECT_NEAR(r.state[0], fixed[0], options.tolerance);
  EXPECT_NEAR(r.state[1], fixed[1], options.tolerance);
  EXPECT_LE(r.residual, options.tolerance);
}

// A lightly damped ring, like an LC output filter with a light load: the map
// rotates by 2*pi/15 per period and contracts by 0.98. The cycle-to-cycle
// change swings through zero every half ring; the tail test follows its
// envelope. Linear algebra, no source.
TEST(SteadyStateTest, PeriodByPeriodFollowsALightlyDampedRingToTheFixedPoint) {
  AffineMapSimulator sim;
  const double r0 = 0.98, th = 2 * M_PI / 15;
  sim.a[0][0] = r0 * std::cos(th);
  sim.a[0][1] = -r0 * std::sin(th);
  sim.a[1][0] = r0 * std::sin(th);
  sim.a[1][1] = r0 * std::cos(th);
  SteadyStateOptions options;
  options.method = SettleMethod::kPeriods;
  options.max_periods = 5000;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  double fixed[2];
  sim.FixedPoint(fixed);
  EXPECT_NEAR(r.state[0], fixed[0], options.tolerance);
  EXPECT_NEAR(r.state[1], fixed[1], options.tolerance);
}

TEST(SteadyStateTest, SlowMapIsReportedUnsettledWithinThePeriodBudget) {
  AffineMapSimulator sim;
  sim.a[0][0] = 0.9999;
  sim.a[0][1] = 0;
  sim.a[1][0] = 0;
  sim.a[1][1] = 0.9999;
  SteadyStateOptions options;
  options.method = SettleMethod::kPeriods;
  options.max_periods = 50;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok);
  EXPECT_FALSE(r.settled);
  EXPECT_LE(r.periods, 50);
  EXPECT_GT(r.residual, options.tolerance);
}

// The affine map with a control: the fixed point with state 1 held at the
// target solves (I - A) x = b + c u together with x1 = target, two linear
// equations in (x0, u). Linear algebra, no source.
struct RegulatedFixedPoint {
  double x0, u;
};
RegulatedFixedPoint SolveRegulated(const AffineMapSimulator& sim, double target) {
  // Row 0: (1 - a00) x0 - c0 u = b0 + a01 target; row 1: -a10 x0 - c1 u = b1 - (1 - a11) target.
  double m00 = 1 - sim.a[0][0], m01 = -sim.c[0], r0 = sim.b[0] + sim.a[0][1] * target;
  double m10 = -sim.a[1][0], m11 = -sim.c[1], r1 = sim.b[1] - (1 - sim.a[1][1]) * target;
  double det = m00 * m11 - m01 * m10;
  return {(r0 * m11 - m01 * r1) / det, (m00 * r1 - m10 * r0) / det};
}

AffineMapSimulator ControlledMap() {
  AffineMapSimulator sim;
  sim.c[0] = 2.0;
  sim.c[1] = 0.5;
  sim.ripple[1] = 0;  // state 1 then moves linearly, so its period mean is exact
  return sim;
}

ControlUnknown ControlOnOut() {
  ControlUnknown control;
  control.vector = "v(out)";
  control.target = 30;
  control.initial = 0.5;
  control.min = 0;
  control.max = 100;  // the fixed point needs u = 24 (x0 = 110)
  return control;
}

TEST(SteadyStateTest, ShootingWithAControlHoldsTheRegulatedMean) {
  AffineMapSimulator sim = ControlledMap();
  ControlUnknown control = ControlOnOut();
  SteadyStateOptions options;
  SteadyStateResult r =
      FindRegulatedSteadyState(sim, ControlRenderer(), kVectors, kStates, control, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.method, SettleMethod::kShooting);
  EXPECT_EQ(r.iterations, 1);  // affine in (x, u): one Newton step
  RegulatedFixedPoint want = SolveRegulated(sim, control.target);
  EXPECT_NEAR(r.control, want.u, 1e-6);
  EXPECT_NEAR(r.state[0], want.x0, 1e-6);
  EXPECT_NEAR(r.state[1], control.target, 1e-6);
  EXPECT_NEAR(r.regulated_mean, control.target, control.tolerance * control.target);
  ASSERT_EQ(r.state.size(), 2u);  // the control is reported apart from the states
}

TEST(SteadyStateTest, PeriodByPeriodWithAControlReachesTheSameOperatingPoint) {
  AffineMapSimulator sim = ControlledMap();
  ControlUnknown control = ControlOnOut();
  SteadyStateOptions options;
  options.method = SettleMethod::kPeriods;
  options.max_periods = 5000;
  SteadyStateResult r =
      FindRegulatedSteadyState(sim, ControlRenderer(), kVectors, kStates, control, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.method, SettleMethod::kPeriods);
  RegulatedFixedPoint want = SolveRegulated(sim, control.target);
  // Settled to the states' tolerance (1e-3 of the scale 1) and the
  // regulation's (1e-4 of 30).
  EXPECT_NEAR(r.regulated_mean, control.target, control.tolerance * control.target);
  EXPECT_NEAR(r.control, want.u, 0.02 * std::fabs(want.u));
}

TEST(SteadyStateTest, AControlOutOfRangeIsReportedUnsettled) {
  AffineMapSimulator sim = ControlledMap();
  ControlUnknown control = ControlOnOut();
  control.max = 0.6;  // the target needs a larger control than this
  SteadyStateOptions options;
  SteadyStateResult r =
      FindRegulatedSteadyState(sim, ControlRenderer(), kVectors, kStates, control, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  EXPECT_FALSE(r.settled);
  EXPECT_GT(r.residual, options.tolerance);
  // It stops once the control sits at its bound and the correction asks for
  // more, instead of simulating the same circuit until the budget is spent.
  EXPECT_TRUE(r.control_pinned);
  EXPECT_EQ(r.control, control.max);
  EXPECT_LT(r.periods, options.max_periods / 2);
}

// Broyden's update, worked by hand on a 2x2 example (C. G. Broyden, "A class
// of methods for solving nonlinear simultaneous equations", Math. Comp. 19,
// 1965: J+ = J + (df - J dz) dz^T / (dz^T dz)). J = I, dz = (1, 1),
// df = (2, 0): J dz = (1, 1), df - J dz = (1, -1), dz^T dz = 2, so
// J+ = I + [[0.5, 0.5], [-0.5, -0.5]] = [[1.5, 0.5], [-0.5, 0.5]].
TEST(SteadyStateTest, BroydenUpdateMatchesAHandWorkedExample) {
  std::vector<std::vector<double>> jac = {{1, 0}, {0, 1}};
  BroydenUpdate({1, 1}, {2, 0}, &jac);
  EXPECT_DOUBLE_EQ(jac[0][0], 1.5);
  EXPECT_DOUBLE_EQ(jac[0][1], 0.5);
  EXPECT_DOUBLE_EQ(jac[1][0], -0.5);
  EXPECT_DOUBLE_EQ(jac[1][1], 0.5);
  // The secant condition J+ dz = df holds, and a direction orthogonal to dz,
  // (1, -1), is mapped as before (J+ v = J v = v): the two defining
  // properties of the update (same paper).
  EXPECT_DOUBLE_EQ(jac[0][0] + jac[0][1], 2);
  EXPECT_DOUBLE_EQ(jac[1][0] + jac[1][1], 0);
  EXPECT_DOUBLE_EQ(jac[0][0] - jac[0][1], 1);
  EXPECT_DOUBLE_EQ(jac[1][0] - jac[1][1], -1);
  // A zero step changes nothing.
  BroydenUpdate({0, 0}, {1, 1}, &jac);
  EXPECT_DOUBLE_EQ(jac[0][0], 1.5);
}

// A warm start at the fixed point: its one-period first run is the check,
// nothing else runs, and the caller makes the measured run (no trial run to
// hand back).
TEST(SteadyStateTest, AWarmStartThatIsSettledCostsOneCheckPeriod) {
  AffineMapSimulator sim;
  double fixed[2];
  sim.FixedPoint(fixed);
  WarmStart warm;
  warm.unknowns = {fixed[0], fixed[1]};
  SteadyStateOptions options;
  options.trial_periods = 2;
  options.warm = &warm;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_TRUE(r.warm_started);
  EXPECT_EQ(r.iterations, 0);
  EXPECT_EQ(r.periods, 1);
  EXPECT_EQ(sim.runs, 1);
  EXPECT_FALSE(r.final_run.ok);
  EXPECT_NEAR(r.state[0], fixed[0], 1e-12);
}

// Warm from a neighbour's state with the exact Jacobian of F(x) = A x + b - x
// (A - I, linear algebra): one Newton step, no finite-difference run, and the
// same fixed point a cold start finds.
TEST(SteadyStateTest, AWarmJacobianSavesTheFiniteDifferenceRuns) {
  AffineMapSimulator sim;
  SteadyStateOptions cold_options;
  cold_options.trial_periods = 2;
  SteadyStateResult cold =
      FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, cold_options);
  ASSERT_TRUE(cold.settled);
  EXPECT_EQ(cold.jacobian_builds, 1);
  // The Jacobian handed out is the (exact) finite-difference one: A - I.
  ASSERT_EQ(cold.jacobian.size(), 2u);
  EXPECT_NEAR(cold.jacobian[0][0], sim.a[0][0] - 1, 1e-6);
  EXPECT_NEAR(cold.jacobian[0][1], sim.a[0][1], 1e-6);
  EXPECT_NEAR(cold.jacobian[1][0], sim.a[1][0], 1e-6);
  EXPECT_NEAR(cold.jacobian[1][1], sim.a[1][1] - 1, 1e-6);

  WarmStart warm;
  warm.unknowns = {cold.state[0] + 0.5, cold.state[1] - 0.3};  // a neighbour's state
  warm.jacobian = cold.jacobian;
  SteadyStateOptions options = cold_options;
  options.warm = &warm;
  sim.runs = 0;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.jacobian_builds, 0);
  EXPECT_EQ(r.iterations, 1);
  // A one-period run from the neighbour's state, then the step: its residual
  // before the step is far above the tolerance, so a one-period run too, and
  // the measured run from the settled state.
  EXPECT_LE(r.periods, 4);
  EXPECT_NEAR(r.state[0], cold.state[0], 1e-9);
  EXPECT_NEAR(r.state[1], cold.state[1], 1e-9);
}

// A wrong warm Jacobian (the identity) does not reduce the residual: the
// search rebuilds it by finite differences at the same iterate and settles
// to the same fixed point.
TEST(SteadyStateTest, AWrongWarmJacobianIsRebuiltByFiniteDifferences) {
  AffineMapSimulator sim;
  double fixed[2];
  sim.FixedPoint(fixed);
  WarmStart warm;
  warm.unknowns = {fixed[0] + 2, fixed[1] + 1};
  warm.jacobian = {{1, 0}, {0, 1}};  // F's true Jacobian is A - I, about -I
  SteadyStateOptions options;
  options.trial_periods = 2;
  options.warm = &warm;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.jacobian_builds, 1);
  EXPECT_NEAR(r.state[0], fixed[0], 1e-9);
  EXPECT_NEAR(r.state[1], fixed[1], 1e-9);
}

// A warm start within the tolerance but not within a tenth of it still takes
// a Newton step (a warm search aims at a tenth of the tolerance's ripple
// part): with the exact Jacobian A - I the step lands on the fixed point
// (Newton on an affine map, Aprille & Trick, Proc. IEEE 60(1), 1972).
TEST(SteadyStateTest, AWarmStartJustWithinTheToleranceStillSteps) {
  AffineMapSimulator sim;
  sim.ripple[0] = sim.ripple[1] = 50;  // the ripple part, not the floor, decides
  double fixed[2];
  sim.FixedPoint(fixed);
  WarmStart warm;
  // F = (A - I) dx = (-0.01, -0.002): residual 0.01 / 50 = 2e-4, within the
  // tolerance 1e-3 but not within 1e-4.
  warm.unknowns = {fixed[0] + 0.02, fixed[1]};
  warm.jacobian = {{sim.a[0][0] - 1, sim.a[0][1]}, {sim.a[1][0], sim.a[1][1] - 1}};
  SteadyStateOptions options;
  options.warm = &warm;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.ok) << r.error;
  ASSERT_TRUE(r.settled);
  EXPECT_EQ(r.iterations, 1);
  EXPECT_EQ(r.jacobian_builds, 0);
  EXPECT_NEAR(r.state[0], fixed[0], 1e-9);
  EXPECT_NEAR(r.state[1], fixed[1], 1e-9);
}

// A warm start whose size does not fit the unknowns is ignored (cold start).
TEST(SteadyStateTest, AWarmStartOfTheWrongSizeStartsCold) {
  AffineMapSimulator sim;
  WarmStart warm;
  warm.unknowns = {1.0};
  SteadyStateOptions options;
  options.warm = &warm;
  SteadyStateResult r = FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, options);
  ASSERT_TRUE(r.settled);
  EXPECT_FALSE(r.warm_started);
  EXPECT_EQ(r.periods, 4);  // as ShootingSolvesAnAffineMapInOneNewtonStep
}

// With a control unknown the warm unknowns carry the control last; a warm
// control outside the admissible range is brought inside it.
TEST(SteadyStateTest, AWarmStartCarriesTheControl) {
  AffineMapSimulator sim = ControlledMap();
  ControlUnknown control = ControlOnOut();
  SteadyStateOptions options;
  SteadyStateResult cold =
      FindRegulatedSteadyState(sim, ControlRenderer(), kVectors, kStates, control, 1e-6, options);
  ASSERT_TRUE(cold.settled);
  WarmStart warm;
  warm.unknowns = SettledUnknowns(cold);
  ASSERT_EQ(warm.unknowns.size(), 3u);
  warm.unknowns[0] += 1;
  warm.jacobian = cold.jacobian;
  options.warm = &warm;
  SteadyStateResult r =
      FindRegulatedSteadyState(sim, ControlRenderer(), kVectors, kStates, control, 1e-6, options);
  ASSERT_TRUE(r.settled);
  EXPECT_TRUE(r.warm_started);
  EXPECT_EQ(r.jacobian_builds, 0);
  EXPECT_NEAR(r.control, cold.control, 1e-6);
  EXPECT_NEAR(r.state[0], cold.state[0], 1e-6);
  warm.unknowns[2] = 1e6;  // far beyond max
  SteadyStateResult clamped =
      FindRegulatedSteadyState(sim, ControlRenderer(), kVectors, kStates, control, 1e-6, options);
  ASSERT_TRUE(clamped.ok);
  EXPECT_NEAR(clamped.control, cold.control, 1e-6);
}

TEST(SteadyStateTest, FailedRunIsReportedNotThrown) {
  struct Failing : Simulator {
    SimulationOutput Run(const std::string&, const std::vector<std::string>&, double) override {
      SimulationOutput o;
      o.error = "engine error: singular matrix";
      return o;
    }
  } sim;
  SteadyStateResult r =
      FindPeriodicSteadyState(sim, Renderer(), kVectors, kStates, 1e-6, SteadyStateOptions());
  EXPECT_FALSE(r.ok);
  EXPECT_NE(r.error.find("singular"), std::string::npos);
}

}  // namespace
}  // namespace zvsmap
