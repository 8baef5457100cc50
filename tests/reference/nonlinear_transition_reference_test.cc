// Junction-type (nonlinear) output capacitance C(V) = c0/(1 + V/vj)^mj on the
// reference tests' own buck netlist (tests/reference/data/buck_check_case.cir,
// invented values: c0 = 4 nF, vj = 0.7 V, mj = 0.5; Co(tr)(48 V) = 0.856 nF,
// Co(er)(48 V) = 0.632 nF):
// - zvsmap's measured high-side t_ZVS (t_zvs_s) against an independent
//   integration of the dead-time transition with Boost.Odeint;
// - the simulated ZVS boundary against the charge-based condition
//   1/2 L I0^2 >= Qoss(Vin) (Vin - 2 Vo) and the energy-based one (2 Eoss(Vin)/Vin
//   in place of Qoss(Vin)).
// netlists/references.md sections 2 and 6 [derived]; Costinett, Maksimovic &
// Zane, IEEE Trans. Power Electron. 30(2), 2015 [pub].
#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <boost/numeric/odeint.hpp>
#include <cmath>
#include <cstdio>
#include <string>

#include "analysis/edge_finder.h"
#include "netlist/template.h"
#include "run/point_evaluator.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::SharedNgspice;
using testing_support::SourcePath;

constexpr double kPeriod = 2e-6;
constexpr double kVin = 48;
constexpr double kC0 = 4e-9, kVj = 0.7, kMj = 0.5;
constexpr double kL = 1e-6;

// C(V) of one switch as the netlist writes it (V clipped at 0).
double Coss(double v) { return kC0 / std::pow(1 + std::max(v, 0.0) / kVj, kMj); }

// Closed forms of netlists/references.md sec. 6 [derived], x = V/Vj.
double Qoss(double v) {
  double x = v / kVj;
  return kC0 * kVj / (1 - kMj) * (std::pow(1 + x, 1 - kMj) - 1);
}
double Eoss(double v) {
  double x = v / kVj;
  return kC0 * kVj * kVj *
         ((std::pow(1 + x, 2 - kMj) - 1) / (2 - kMj) - (std::pow(1 + x, 1 - kMj) - 1) / (1 - kMj));
}

struct TransitionRun {
  PointResult result;
  Waveforms waves;
  EdgeTiming high_on;
  const EdgeMeasurement* edge = nullptr;
};

void Evaluate(double iout, double td_lh, double max_step_s, TransitionRun* run) {
  static Template tmpl;
  if (tmpl.path.empty()) {
    Diagnostic error;
    if (!LoadTemplate(SourcePath("tests/reference/data/buck_check_case.cir"), &tmpl, &error)) {
      throw Error(error.Format());
    }
  }
  SweepSpec spec;
  spec.simulation.max_step_s = max_step_s;
  spec.zvs.kind = ZvsCriterion::Kind::kAbsolute;
  spec.zvs.value = 0.5;
  PointEvaluator evaluator(spec, tmpl);
  run->result = evaluator.Evaluate(
      Point{0, {{"Vin", kVin}, {"Vout", 12}, {"fsw", 1 / kPeriod}, {"L", kL}, {"Iout", iout},
                {"c0", kC0}, {"vj", kVj}, {"mj", kMj}, {"td_lh", td_lh},
                {"Cout", 22e-6}}},
      SharedNgspice(), &run->waves);
  if (run->result.status != PointStatus::kOk) return;
  for (const auto& e : FindEdges(tmpl.cells[0], run->waves, 0.02 * kPeriod))
    if (e.edge == "high_on") run->high_on = e;
  for (const auto& e : run->result.edges)
    if (e.edge == "high_on") run->edge = &e;
}

// The dead-time transition of the high-side turn-on, both channels off,
// lossless: node voltage v, current i into the node (= -i(l1)),
//   Cn(v) dv/dt = i,  L di/dt = -(v - Vo),  Cn(v) = C(v) + C(Vin - v)
// (netlists/references.md sec. 2), integrated with Boost.Odeint's Dormand-Prince 5(4)
// dense-output stepper from (v0, i0) until v reaches Vin. Returns the time, or
// NaN when the node turns back first.
double OdeintTimeToRail(double v0, double i0, double vo) {
  namespace odeint = boost::numeric::odeint;
  using State = std::array<double, 2>;
  auto rhs = [vo](const State& s, State& ds, double) {
    ds[0] = s[1] / (Coss(s[0]) + Coss(kVin - s[0]));
    ds[1] = -(s[0] - vo) / kL;
  };
  auto stepper = odeint::make_dense_output(1e-9, 1e-9, odeint::runge_kutta_dopri5<State>());
  stepper.initialize(State{v0, i0}, 0.0, 1e-11);
  while (stepper.current_time() < 1e-6) {
    auto [t0, t1] = stepper.do_step(rhs);
    if (stepper.current_state()[0] >= kVin) {
      State s;
      for (int k = 0; k < 60; ++k) {  // bisect on the dense output
        double tm = 0.5 * (t0 + t1);
        stepper.calc_state(tm, s);
        (s[0] >= kVin ? t1 : t0) = tm;
      }
      return 0.5 * (t0 + t1);
    }
    if (stepper.current_state()[1] <= 0) return NAN;
  }
  return NAN;
}

// zvsmap's t_zvs_s against the Odeint integration from the measured state at
// the turn-off command, within 3 % (issue 3 acceptance figure), at a large
// (~4 A) and a small (~2 A) commutated current.
TEST(NonlinearTransitionReferenceTest, TimeToRailMatchesOdeintIntegration) {
  for (double iout : {5.0, 7.0}) {
    TransitionRun run;
    Evaluate(iout, 80e-9, 0.25e-9, &run);  // ~100 points over the 20-50 ns swing
    ASSERT_EQ(run.result.status, PointStatus::kOk) << run.result.reason << "\n" << run.result.log;
    ASSERT_NE(run.edge, nullptr);
    double t_off = run.high_on.t_off_s;
    double v0 = run.waves.At("v(sw)", t_off);
    double i0 = -run.waves.At("i(l1)", t_off);
    double vo = run.waves.At("v(out)", t_off);
    double t_ode = OdeintTimeToRail(v0, i0, vo);
    double t_sim = run.edge->Get("t_zvs_s");
    ASSERT_TRUE(std::isfinite(t_ode)) << "Iout " << iout << ": I0 " << i0;
    EXPECT_NEAR(t_sim, t_ode, 0.03 * t_ode)
        << "Iout " << iout << ": I0 " << i0 << " A, Vo " << vo << " V, v0 " << v0;
    std::printf("[ odeint   ] Iout %.1f A: I0 %.3f A, Vo %.3f V, t_zvs sim %.3f ns, odeint %.3f ns "
                "(%+.2f %%)\n",
                iout, i0, vo, t_sim * 1e9, t_ode * 1e9, 100 * (t_sim / t_ode - 1));
  }
}

// The probe run's time to the rail (probe_t_rail_s: the incoming turn-on
// withheld, from the settled state) against the same Odeint integration from
// the measured state at the turn-off command, within 1 % (issue 15 item 5),
// at the same two currents; the set dead time (40 ns) is shorter than the
// swing at the smaller current, so only the probe sees the rail there.
TEST(NonlinearTransitionReferenceTest, ProbeTimeToRailMatchesOdeintIntegration) {
  for (double iout : {5.0, 7.0}) {
    TransitionRun run;
    Evaluate(iout, 40e-9, 0.25e-9, &run);
    ASSERT_EQ(run.result.status, PointStatus::kOk) << run.result.reason << "\n" << run.result.log;
    ASSERT_NE(run.edge, nullptr);
    double t_off = run.high_on.t_off_s;
    double v0 = run.waves.At("v(sw)", t_off);
    double i0 = -run.waves.At("i(l1)", t_off);
    double vo = run.waves.At("v(out)", t_off);
    double t_ode = OdeintTimeToRail(v0, i0, vo);
    double t_probe = run.edge->Get("probe_t_rail_s");
    ASSERT_TRUE(std::isfinite(t_ode)) << "Iout " << iout << ": I0 " << i0;
    EXPECT_NEAR(t_probe, t_ode, 0.01 * t_ode)
        << "Iout " << iout << ": I0 " << i0 << " A, Vo " << vo << " V, v0 " << v0;
    std::printf("[ probe    ] Iout %.1f A: I0 %.3f A, Vo %.3f V, probe_t_rail %.3f ns, odeint "
                "%.3f ns (%+.2f %%), t_dead %.1f ns, class %s\n",
                iout, i0, vo, t_probe * 1e9, t_ode * 1e9, 100 * (t_probe / t_ode - 1),
                run.edge->Get("t_dead_s") * 1e9, ZvsClassName(run.edge->zvs));
  }
}

// The simulated boundary (node reaches the rail within a 200 ns dead time, i.e.
// t_zvs_s is defined) as a function of the commutated current I0, bracketed by
// stepping the load and then bisecting it. Each run's I0 is divided by the
// thresholds at its own output voltage:
//   charge-based  I_q = sqrt(2 Qoss(Vin) (Vin - 2 Vo) / L)
//   energy-based  I_e = sqrt(2 (2 Eoss(Vin)/Vin) (Vin - 2 Vo) / L)
// netlists/references.md sec. 2 [derived]; Costinett et al. (2015) [pub]: the charge-based
// ratio at the boundary is 1 within a few %, the energy-based one is off by
// sqrt(Co(tr)/Co(er)) = 1.16. (The dead time is long enough that a run with
// the energy to reach the rail does so before the channel turns on; were it
// too short, the simulated boundary would move above the charge-based one.)
TEST(NonlinearTransitionReferenceTest, ZvsBoundaryFollowsTheChargeBasedCondition) {
  struct Sample {
    bool reached = false;
    double q = NAN, e = NAN;  // I0 / I_q, I0 / I_e
  };
  std::string log;
  auto sample = [&](double iout) {
    TransitionRun run;
    Evaluate(iout, 150e-9, 0.5e-9, &run);
    Sample s;
    EXPECT_EQ(run.result.status, PointStatus::kOk) << run.result.reason;
    if (run.edge == nullptr) return s;
    double i0 = -run.edge->Get("i_commutated_a");
    double vo = run.waves.At("v(out)", run.high_on.t_off_s);
    double need = 2 * (kVin - 2 * vo) / kL;
    s.reached = std::isfinite(run.edge->Get("t_zvs_s"));
    s.q = i0 / std::sqrt(need * Qoss(kVin));
    s.e = i0 / std::sqrt(need * 2 * Eoss(kVin) / kVin);
    char line[160];
    std::snprintf(line, sizeof line, "Iout %.4f: I0 %.4f A, Vo %.3f V, reached %d, I0/I_q %.4f, "
                  "I0/I_e %.4f\n", iout, i0, vo, s.reached, s.q, s.e);
    log += line;
    return s;
  };
  // Valley current ~ Iout - 9 A (netlists/references.md sec. 1), so I0 ~ 1.6-2.2 A for
  // Iout 6.8-7.4 A; the long dead time pulls Vo down, so I0 comes out lower.
  double lo = 6.8, hi = 7.4;
  Sample reach = sample(lo), shorts = sample(hi);
  ASSERT_TRUE(reach.reached) << log;
  ASSERT_FALSE(shorts.reached) << log;
  for (int k = 0; k < 6 && reach.q - shorts.q > 0.03; ++k) {
    double mid = 0.5 * (lo + hi);
    Sample s = sample(mid);
    if (s.reached) {
      lo = mid;
      reach = s;
    } else {
      hi = mid;
      shorts = s;
    }
  }
  double boundary_q = 0.5 * (reach.q + shorts.q);
  double boundary_e = 0.5 * (reach.e + shorts.e);
  std::printf("[ boundary ] I0 at the boundary / charge-based threshold %.4f, / energy-based %.4f "
              "(bracket %.4f..%.4f)\n%s",
              boundary_q, boundary_e, shorts.q, reach.q, log.c_str());
  EXPECT_LT(reach.q - shorts.q, 0.03) << log;  // the bracket is narrow enough to judge
  EXPECT_NEAR(boundary_q, 1.0, 0.03) << log;
  EXPECT_GT(boundary_e, 1.10) << log;
}

}  // namespace
}  // namespace zvsmap
