// Periodic steady state of a switched circuit: shooting (Newton on the slow
// states over one period, finite-difference Jacobian) with a period-by-period
// fallback. Works over the Simulator seam and a render callback, so it knows
// nothing about templates or commutation analysis.
#pragma once

#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include "result/settle_record.h"
#include "sim/simulator.h"

namespace zvsmap {

/// One slow state: a vector the simulator returns (e.g. "i(l1)", "v(out)")
/// whose value at the start of a period is set by the renderer.
struct SlowState {
  std::string vector;  ///< name as saved, lower-case
  double initial = 0;  ///< starting guess (the average-model value)
  /// Absolute convergence floor in the vector's unit (1 mA for a current,
  /// 1 mV for a voltage by default; see SlowStateFloor()).
  double floor = 1e-3;
};

/// The default absolute floor of a state vector: 1e-3 (1 mA or 1 mV).
double SlowStateFloor(const std::string& vector);

/// How far past the last period boundary a run goes, in periods: ngspice
/// failed ("Timestep too small") when tstop fell exactly on a command edge.
constexpr double kPeriodOverrun = 0.01;

/// Renders a netlist that starts every slow state at `x` (same order as the
/// states) and simulates `periods` periods from t = 0 (whole ones, or a
/// measured run's length with its tail; tstop =
/// (periods + kPeriodOverrun) times the period, every sample stored, `uic`). Returns false with a
/// one-line `error` when it cannot.
using PeriodRenderer = std::function<bool(const std::vector<double>& x, double periods,
                                          std::string* netlist, std::string* error)>;

/// Renders from `*x` and simulates `periods` periods. ngspice occasionally
/// gives up on one particular state ("Timestep too small") and runs fine from
/// a state a hair away; such a run is retried up to twice with the states
/// selected by `nudge` (one index, or -1 for all) moved by +0.37 and then -0.61
/// times their floor (far inside the tolerance). `*x` receives the state
/// actually used. `rendered` is the netlist of the last attempt; `render_error`
/// is set (and the result not ok) when rendering failed.
SimulationOutput RunFromState(Simulator& simulator, const PeriodRenderer& render,
                              const std::vector<std::string>& vectors,
                              const std::vector<SlowState>& states, double period_s, double periods,
                              int nudge, std::vector<double>* x, std::string* render_error);

/// A control parameter that the solve adjusts, as one more unknown, so that
/// the period average of `vector` equals `target` (a regulated converter in
/// steady state: shooting with a parameter unknown, netlists/references.md
/// sec. 9). The renderer receives the control value as the last entry of x.
struct ControlUnknown {
  std::string vector;       ///< the regulated vector, lower-case, e.g. "v(out)"
  double target = 0;        ///< its set point (period average)
  double initial = 0;       ///< starting control value (the template's own)
  double min = 0, max = 1;  ///< the control's admissible range
  /// Regulated when |mean - target| <= tolerance * |target| (or <= the
  /// state floor when the target is 0).
  double tolerance = 1e-4;
};

/// A start from an already-settled neighbour (a warm start along a chain of
/// points, run/chain_memory.h): its settled unknowns (the states, then the
/// control when the search has one) and, when known, the Jacobian of F there
/// (row-major, unknowns x unknowns; empty: none, the search builds one by
/// finite differences when it needs one).
struct WarmStart {
  std::vector<double> unknowns;
  std::vector<std::vector<double>> jacobian;
  /// Usable for a search over `count` unknowns.
  bool Fits(size_t count) const { return count > 0 && unknowns.size() == count; }
  /// The Jacobian is usable for `count` unknowns.
  bool HasJacobian(size_t count) const;
};

/// Broyden's rank-one secant update of a Jacobian estimate `*jac` after the
/// step `dz` changed F by `df`: J += (df - J dz) dz^T / (dz^T dz) (C. G.
/// Broyden, "A class of methods for solving nonlinear simultaneous
/// equations", Math. Comp. 19, 1965; the "good" update, his method 1, as
/// recalled from memory, not checked against the paper's numbering). A zero step
/// leaves J as it is.
void BroydenUpdate(const std::vector<double>& dz, const std::vector<double>& df,
                   std::vector<std::vector<double>>* jac);

/// Limits and tolerances of the search.
struct SteadyStateOptions {
  SettleMethod method = SettleMethod::kShooting;  ///< kShooting or kPeriods
  /// A state is settled when |x(T) - x(0)| <= max(tolerance * ripple, floor),
  /// ripple = max - min of that state over the period.
  double tolerance = 1e-3;
  int max_newton = 8;      ///< Newton iterations before falling back
  int max_periods = 1000;  ///< periods simulated in all, every run counted
  int chunk_periods = 20;  ///< run length of the period-by-period method
  /// Period by period: settled when the states at the last `window` period
  /// boundaries all lie within the tolerance of the latest one (a slow ring
  /// of the output filter passes a short cycle-to-cycle test while far off)
  /// AND the remaining distance to the fixed point, extrapolated from the
  /// decay of the cycle-to-cycle change over the last 2 * `window`
  /// boundaries (geometric series), is within the tolerance too.
  int window = 20;
  /// Length of each Newton trial run (the run at a Newton step), in periods
  /// (at least 1; a fraction beyond the whole periods is a measured run's
  /// tail). The step's residual is read from its first period; when the step
  /// settles, the whole run is handed back as SteadyStateResult::final_run,
  /// so a caller that measures a run of `trial_periods` from the settled state
  /// has its measured run already (the run that verifies is the one measured).
  double trial_periods = 1;
  /// A warm start (null: start from each unknown's `initial`, the average
  /// model). Newton then starts from the warm unknowns with a one-period run
  /// (a trial run there paid off too seldom: DEVELOPERS.md "Warm starts"),
  /// steps with the warm Jacobian, Broyden-updated after each step, and
  /// builds a finite-difference Jacobian only when a step with a reused
  /// Jacobian fails to reduce the residual (or it is singular).
  /// A warm search stops at a tenth of the tolerance's ripple part (floors
  /// unchanged; `kWarmTolerance` in steady_state.cc); the point is settled
  /// when its residual is within `tolerance` itself. Cold or warm, a search
  /// with a Jacobian is settled only when the Newton step it predicts is
  /// within its target too (scaled like the residual).
  const WarmStart* warm = nullptr;
};

/// The outcome. `ok` false means a simulation failed (error/log say why);
/// `ok` true with `settled` false means the limits ran out.
struct SteadyStateResult {
  bool ok = false;
  bool settled = false;
  std::string error;
  std::string log;     ///< log of the failing run, if any
  SettleMethod method = SettleMethod::kNotAttempted;  ///< the method that finished
  int iterations = 0;  ///< Newton iterations taken
  double periods = 0;  ///< periods simulated in all (a measured run's tail counted)
  /// Shooting: max over states of |x(T) - x(0)| / max(ripple, floor /
  /// tolerance). Period by period: the larger of the window's spread and the
  /// extrapolated remaining change, in the same units. The point is settled
  /// when this is <= tolerance.
  double residual = 0;
  std::vector<double> state;   ///< the settled (or last) start-of-period state
  std::vector<double> ripple;  ///< each state's ripple over the last period
  /// With a control unknown: its settled value and the regulated vector's
  /// average over the last simulated period (NaN without one).
  double control = NAN;
  double regulated_mean = NAN;
  /// With a control unknown, not settled: the correction stopped at a bound of
  /// the control's range (the set point lies outside what the range reaches).
  bool control_pinned = false;
  /// When a Newton trial run settled: that run, `trial_periods` periods from
  /// `state` (and `control`); its periods are counted in `periods`. Not ok
  /// (empty) when the search settled otherwise (initial state, period by period).
  SimulationOutput final_run;
  /// When shooting settled: the Jacobian of F at the settled unknowns as the
  /// last Newton step left it (Broyden-updated with that step), for a warm
  /// start of the next point; empty otherwise.
  std::vector<std::vector<double>> jacobian;
  /// Finite-difference Jacobians built (each one run per unknown).
  int jacobian_builds = 0;
  /// Started from a usable warm start (options.warm).
  bool warm_started = false;
};

/// Finds the periodic steady state. `vectors` are the names to ask the
/// simulator for (must include every state vector). Shooting (Aprille &
/// Trick, Proc. IEEE 60(1), 1972): F(x) = Phi(x) - x, where Phi runs one
/// period; Newton with a finite-difference Jacobian (one extra one-period run
/// per state), steps limited and halved while the residual does not fall. If
/// Newton fails to converge in `max_newton` iterations (or the Jacobian is
/// singular) it continues period by period from the best state found, in
/// runs of `chunk_periods`, until the states at the last `window` period
/// boundaries lie within the tolerance of the latest one and the geometric
/// extrapolation of the remaining change is within it too (see
/// SteadyStateOptions::window). Never throws for a bad circuit.
SteadyStateResult FindPeriodicSteadyState(Simulator& simulator, const PeriodRenderer& render,
                                          const std::vector<std::string>& vectors,
                                          const std::vector<SlowState>& states, double period_s,
                                          const SteadyStateOptions& options);

/// The unknowns of a search, as RunFromState takes them: the states, then
/// (with a control) the control as a pseudo-state (floor 1e-6 of its range).
std::vector<SlowState> SearchUnknowns(const std::vector<SlowState>& states,
                                      const ControlUnknown* control);

/// The settled unknowns in the same order: the state, then the control.
std::vector<double> SettledUnknowns(const SteadyStateResult& r);

/// The same search with `control` as one more unknown and its regulation
/// equation as one more residual: Newton on F(x, u) = [Phi(x, u) - x ;
/// mean_T(y) - y_set] with one more finite-difference column (perturb u),
/// the step kept inside [min, max]. If Newton does not converge, it settles
/// period by period at a fixed control and corrects the control by secant
/// steps on the regulation error (an integral loop's job in steady state).
/// `vectors` must include control.vector. The result is settled only when
/// both the states and the regulation are within their tolerances.
SteadyStateResult FindRegulatedSteadyState(Simulator& simulator, const PeriodRenderer& render,
                                           const std::vector<std::string>& vectors,
                                           const std::vector<SlowState>& states,
                                           const ControlUnknown& control, double period_s,
                                           const SteadyStateOptions& options);

}  // namespace zvsmap
