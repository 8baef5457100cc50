#include "sim/steady_state.h"

#include <algorithm>
#include <cmath>

namespace zvsmap {

double SlowStateFloor(const std::string& vector) {
  (void)vector;  // 1 mA for currents, 1 mV for voltages: the same number
  return 1e-3;
}

namespace {

// The whole periods in a run of `periods` (a measured run's tail is not one).
int WholePeriods(double periods) { return static_cast<int>(std::floor(periods + 1e-9)); }

// One run of `periods` periods from `z` (the states, then the control when
// there is one): the states at every period boundary (k = 1..periods), each
// state's ripple over the last period and the regulated vector's average over
// the last period.
struct PeriodRun {
  std::vector<std::vector<double>> boundary;  // [k-1][state]
  std::vector<double> ripple;
  double regulated_mean = NAN;
  SimulationOutput output;  // the run itself, when kept (a Newton trial run)
};

// What a run reads its ripple and regulated mean over, and whether it keeps
// its output: a Newton trial run (first period, kept: when it settles it is
// the measured run) or a period-by-period chunk (last period, not kept).
enum class RunUse { kNewtonTrial, kChunk };

class Shooter {
 public:
  // `unknowns` are the states, then (with `control`) a pseudo-state for the
  // control value, so RunFromState can nudge and render them alike.
  Shooter(Simulator& sim, const PeriodRenderer& render, const std::vector<std::string>& vectors,
          const std::vector<SlowState>& unknowns, size_t states, const ControlUnknown* control,
          double period, const SteadyStateOptions& opt, SteadyStateResult* result)
      : sim_(sim),
        render_(render),
        vectors_(vectors),
        unknowns_(unknowns),
        n_(states),
        control_(control),
        period_(period),
        opt_(opt),
        r_(result) {}

  // Simulates `periods` from *z (possibly nudged, see RunFromState). False
  // (result filled) when a run fails or the period budget is spent.
  bool Run(std::vector<double>* z, double periods, PeriodRun* out, int nudge = -1,
           RunUse use = RunUse::kChunk) {
    if (r_->periods + periods > opt_.max_periods) return false;
    std::string error;
    SimulationOutput o =
        RunFromState(sim_, render_, vectors_, unknowns_, period_, periods, nudge, z, &error);
    r_->periods += periods;
    if (!o.ok) {
      r_->ok = false;
      r_->error = error.empty() ? o.error : error;
      r_->log = o.log;
      return false;
    }
    const int whole = WholePeriods(periods);
    Read(o.waves, whole, use == RunUse::kNewtonTrial ? 0 : whole - 1, out);
    if (use == RunUse::kNewtonTrial) out->output = std::move(o);
    return true;
  }

  // Scaled residual of a change of the states dx: max_i |dx_i| /
  // max(ripple_i, floor_i / tol).
  double Residual(const std::vector<double>& dx, const std::vector<double>& ripple) const {
    double r = 0;
    for (size_t i = 0; i < n_; ++i) {
      double scale = std::max(ripple[i], unknowns_[i].floor / opt_.tolerance);
      r = std::max(r, std::fabs(dx[i]) / scale);
    }
    return r;
  }

  // The regulation error scaled like Residual: <= tolerance when regulated.
  double RegulationResidual(double mean) const {
    if (!control_) return 0;
    double allowed = std::max(control_->tolerance * std::fabs(control_->target),
                              SlowStateFloor(control_->vector) * 1e-3);
    return std::fabs(mean - control_->target) / allowed * opt_.tolerance;
  }

  // F(z) = [Phi(x, u) - x ; mean - target] for the run `run` from z.
  void System(const std::vector<double>& z, const PeriodRun& run, std::vector<double>* f) const {
    f->resize(z.size());
    for (size_t i = 0; i < n_; ++i) (*f)[i] = run.boundary[0][i] - z[i];
    if (control_) (*f)[n_] = run.regulated_mean - control_->target;
  }

  // Scaled residual of the whole system.
  double SystemResidual(const std::vector<double>& f, const PeriodRun& run) const {
    return SystemResidual(f, run, run.ripple);
  }
  // The same with the states scaled by `ripple` (another run's): a line
  // search compares a trial with its start on one scale, as the ripple can
  // shrink with the distance to the fixed point as fast as the residual does.
  double SystemResidual(const std::vector<double>& f, const PeriodRun& run,
                        const std::vector<double>& ripple) const {
    double r = Residual(f, ripple);
    return control_ ? std::max(r, RegulationResidual(run.regulated_mean)) : r;
  }

  size_t states() const { return n_; }

 private:
  // The boundaries, and the ripple and regulated mean over period `stats`.
  void Read(const Waveforms& w, int periods, int stats, PeriodRun* out) const {
    const auto& t = w.time();
    out->boundary.assign(periods, std::vector<double>(n_));
    out->ripple.assign(n_, 0);
    const double t_last = stats * period_, t_end = (stats + 1) * period_;
    for (size_t i = 0; i < n_; ++i) {
      const auto& v = w.Get(unknowns_[i].vector);
      for (int k = 1; k <= periods; ++k) out->boundary[k - 1][i] = Interpolate(t, v, k * period_);
      double lo = HUGE_VAL, hi = -HUGE_VAL;
      for (size_t j = 0; j < t.size(); ++j) {
        if (t[j] < t_last || t[j] > t_end) continue;
        lo = std::min(lo, v[j]);
        hi = std::max(hi, v[j]);
      }
      out->ripple[i] = hi >= lo ? hi - lo : 0;
    }
    if (control_) {
      out->regulated_mean = Average(t, w.Get(control_->vector), t_last, t_end);
    }
  }

  Simulator& sim_;
  const PeriodRenderer& render_;
  const std::vector<std::string>& vectors_;
  const std::vector<SlowState>& unknowns_;
  size_t n_;
  const ControlUnknown* control_;
  double period_;
  const SteadyStateOptions& opt_;
  SteadyStateResult* r_;
};

// Solves A x = b in place (Gaussian elimination, partial pivoting). False
// when A is singular to working precision.
bool Solve(std::vector<std::vector<double>> a, std::vector<double> b, std::vector<double>* x) {
  size_t n = b.size();
  for (size_t c = 0; c < n; ++c) {
    size_t p = c;
    for (size_t r = c + 1; r < n; ++r)
      if (std::fabs(a[r][c]) > std::fabs(a[p][c])) p = r;
    if (!(std::fabs(a[p][c]) > 1e-12)) return false;
    std::swap(a[p], a[c]);
    std::swap(b[p], b[c]);
    for (size_t r = c + 1; r < n; ++r) {
      double f = a[r][c] / a[c][c];
      for (size_t k = c; k < n; ++k) a[r][k] -= f * a[c][k];
      b[r] -= f * b[c];
    }
  }
  x->assign(n, 0);
  for (size_t c = n; c-- > 0;) {
    double s = b[c];
    for (size_t k = c + 1; k < n; ++k) s -= a[c][k] * (*x)[k];
    (*x)[c] = s / a[c][c];
  }
  return true;
}

// Remaining distance to the fixed point, scaled like Shooter::Residual,
// estimated from the period-boundary history (oldest first) by geometric
// extrapolation: per state, the envelope of the cycle-to-cycle change over the
// older half (e1) and the newer half (e2) of the history gives the decay per
// period rho = (e2/e1)^(1/h), h = the halves' distance in periods; the changes
// still to come sum to at most e2 * rho / (1 - rho). The envelope (largest
// |change| of a half) also bounds a decaying ring whose period is shorter than
// a half. A change that does not decay (e2 >= e1: numerical noise or a drift
// the history cannot resolve) counts as continuing for as many periods again
// as the history holds. Textbook geometric series; the envelope idea is
// common practice, no source.
double TailEstimate(const std::vector<std::vector<double>>& history,
                    const std::function<double(const std::vector<double>&)>& scaled) {
  const size_t changes = history.size() - 1;
  const size_t h = changes / 2;
  if (h == 0) return HUGE_VAL;
  const size_t n = history.back().size();
  double worst = 0;
  for (size_t i = 0; i < n; ++i) {
    double e1 = 0, e2 = 0;
    for (size_t k = 0; k < changes; ++k) {
      std::vector<double> d(n, 0.0);
      d[i] = history[k + 1][i] - history[k][i];
      double m = scaled(d);
      if (k < h) e1 = std::max(e1, m);
      if (k >= changes - h) e2 = std::max(e2, m);
    }
    double tail;
    if (e2 == 0) {
      tail = 0;
    } else if (e2 < e1) {
      double rho = std::pow(e2 / e1, 1.0 / static_cast<double>(changes - h));
      tail = e2 * rho / (1 - rho);
    } else {
      tail = e2 * static_cast<double>(changes);
    }
    worst = std::max(worst, tail);
  }
  return worst;
}

// The best iterate Newton reached: the unknowns, F there, and its run.
struct Iterate {
  std::vector<double> z;
  std::vector<double> f;
  PeriodRun run;
  double residual = HUGE_VAL;
};

// The finite-difference step of unknown j: a hundredth of the state's ripple
// (at least ten floors); a thousandth of the control's range, taken downward
// when upward would leave it.
double DifferenceStep(size_t j, const std::vector<double>& z, const std::vector<double>& ripple,
                      const std::vector<SlowState>& unknowns, const ControlUnknown* control) {
  if (j < ripple.size()) return std::max(0.01 * ripple[j], 10 * unknowns[j].floor);
  double h = 1e-3 * (control->max - control->min);
  return z[j] + h > control->max ? -h : h;
}

// Finite-difference Jacobian of F at `at` (one run per unknown). False when
// a run fails.
bool Jacobian(Shooter& shooter, const Iterate& at, const std::vector<SlowState>& unknowns,
              const ControlUnknown* control, std::vector<std::vector<double>>* jac) {
  const size_t m = at.z.size();
  jac->assign(m, std::vector<double>(m, 0));
  std::vector<double> fp;
  for (size_t j = 0; j < m; ++j) {
    std::vector<double> zp = at.z;
    zp[j] += DifferenceStep(j, at.z, at.run.ripple, unknowns, control);
    PeriodRun pr;
    if (!shooter.Run(&zp, 1, &pr, static_cast<int>(j))) return false;
    const double h = zp[j] - at.z[j];
    shooter.System(zp, pr, &fp);
    for (size_t i = 0; i < m; ++i) (*jac)[i][j] = (fp[i] - at.f[i]) / h;
  }
  return true;
}

// The largest fraction of the Newton step dz to take: each state's change
// limited to a few times its own scale; the control's to a quarter of its
// range and kept inside it.
double StepLimit(const Iterate& at, const std::vector<double>& dz,
                 const std::vector<SlowState>& unknowns, const ControlUnknown* control) {
  double lambda = 1;
  for (size_t i = 0; i < at.run.ripple.size(); ++i) {
    double cap =
        std::max({10 * std::fabs(at.z[i]), 100 * at.run.ripple[i], 1000 * unknowns[i].floor});
    if (std::fabs(dz[i]) * lambda > cap) lambda = cap / std::fabs(dz[i]);
  }
  if (control) {
    const size_t u = at.z.size() - 1;
    double room = dz[u] > 0 ? control->max - at.z[u] : at.z[u] - control->min;
    double cap = std::min(0.25 * (control->max - control->min), std::max(room, 0.0));
    if (std::fabs(dz[u]) * lambda > cap) lambda = cap / std::fabs(dz[u]);
  }
  return lambda;
}

using Matrix = std::vector<std::vector<double>>;

// A warm search makes a step's run a trial run (trial_periods long, kept as
// the measured run when it settles) only when the residual before the step is
// within this factor of the tolerance; from farther off the step seldom
// settles, and a one-period run then costs less. On the demo the Broyden
// steps from a reused Jacobian cut the residual 5-20 times (measured for
// this change, DEVELOPERS.md "Warm starts").
constexpr double kTrialWithin = 10;

// A warm search stops at this fraction of the tolerance's ripple part (the
// floors stay): its Jacobian is a neighbour's, secant-updated, so its last
// step leaves the state closer to the tolerance than a cold search's
// finite-difference Newton step, which converges quadratically. Near the ZVS
// boundary the transition time follows the commutated current, which can be
// a few percent of the ripple the tolerance is a fraction of.
constexpr double kWarmTolerance = 0.1;

// One step from `at` to at.z + lambda * dz: a Newton trial run, or (`trial`
// false) a plain one-period run. False when the run failed or the budget is
// spent.
bool TrialStep(Shooter& shooter, const Iterate& at, const std::vector<double>& dz, double lambda,
               const SteadyStateOptions& options, bool trial, Iterate* next) {
  next->z = at.z;
  for (size_t i = 0; i < dz.size(); ++i) next->z[i] += lambda * dz[i];
  const bool ok = trial ? shooter.Run(&next->z, std::max(1.0, options.trial_periods), &next->run,
                                      -1, RunUse::kNewtonTrial)
                        : shooter.Run(&next->z, 1, &next->run);
  if (!ok) return false;
  shooter.System(next->z, next->run, &next->f);
  next->residual = shooter.SystemResidual(next->f, next->run);
  return true;
}

// The secant update of `jac` for the step from `from` to `to`.
void SecantUpdate(const Iterate& from, const Iterate& to, Matrix* jac) {
  std::vector<double> dz(to.z.size()), df(to.f.size());
  for (size_t i = 0; i < dz.size(); ++i) dz[i] = to.z[i] - from.z[i];
  for (size_t i = 0; i < df.size(); ++i) df[i] = to.f[i] - from.f[i];
  BroydenUpdate(dz, df, jac);
}

// Damped Newton from `start`: the best iterate in `*best`. Stops when the
// residual is within tolerance, the iterations run out, the Jacobian is
// singular or the line search stalls; false only when a run failed (result
// filled) or the budget was spent. Cold (no options.warm), every iteration
// builds its Jacobian by finite differences. Warm, a step's run is a trial
// run only near the tolerance (kTrialWithin), and the warm Jacobian is
// reused and Broyden-updated after each step; a reused Jacobian gets one try per
// iteration, and when that step does not reduce the residual (or the matrix
// is singular) it is rebuilt by finite differences at the same iterate.
// A step is accepted when it reduces the residual with the states scaled by
// the start's ripple (the trial's own ripple can shrink with the distance to
// the fixed point as fast as the residual does, and a far-off start then sees
// no progress). `*jac` receives the Jacobian as the last accepted step left it.
bool Newton(Shooter& shooter, std::vector<double> start, const std::vector<SlowState>& unknowns,
            const ControlUnknown* control, const SteadyStateOptions& options,
            SteadyStateResult* r, Iterate* best, Matrix* jac) {
  const WarmStart* warm = options.warm;
  Iterate at;
  at.z = std::move(start);
  if (!shooter.Run(&at.z, 1, &at.run)) return false;
  shooter.System(at.z, at.run, &at.f);
  at.residual = shooter.SystemResidual(at.f, at.run);
  *best = at;
  const size_t m = at.z.size();
  jac->clear();
  if (warm && warm->HasJacobian(m)) *jac = warm->jacobian;
  bool reused = !jac->empty();
  while (r->iterations < options.max_newton) {
    const bool small = at.residual <= options.tolerance;
    // A small residual is settled only when the Newton step the Jacobian
    // predicts is small too (below); with no Jacobian yet (the start state
    // already settled) it is settled as it is. Cold, a Jacobian is built by
    // finite differences at every iteration except this final check, which
    // uses the secant-updated one of the step just taken.
    if (small && jac->empty()) break;
    if (jac->empty() || (!warm && !small)) {
      if (!Jacobian(shooter, at, unknowns, control, jac)) return false;
      ++r->jacobian_builds;
      reused = false;
    }
    std::vector<double> minus_f(at.f.size()), dz;
    for (size_t i = 0; i < at.f.size(); ++i) minus_f[i] = -at.f[i];
    const bool solved = Solve(*jac, minus_f, &dz);
    // A slow mode (an output filter's) changes little in one period while
    // the state is still far from the fixed point: the per-period residual
    // then passes, the predicted distance to the fixed point (the Newton
    // step, scaled like the residual) does not. A step-size test as in
    // Dennis & Schnabel, "Numerical Methods for Unconstrained Optimization
    // and Nonlinear Equations", 1983 (from memory).
    if (small && solved && shooter.Residual(dz, at.run.ripple) <= options.tolerance) break;
    ++r->iterations;
    if (!solved) {
      if (!reused) return true;
      jac->clear();  // a reused Jacobian gone singular: rebuild it here
      continue;
    }
    double lambda = StepLimit(at, dz, unknowns, control);
    bool accepted = false;
    const int tries_allowed = reused ? 1 : 4;
    for (int tries = 0; tries < tries_allowed; ++tries, lambda *= 0.5) {
      Iterate next;
      const bool trial = !warm || at.residual <= kTrialWithin * options.tolerance;
      if (!TrialStep(shooter, at, dz, lambda, options, trial, &next)) return false;
      if (shooter.SystemResidual(next.f, next.run, at.run.ripple) < at.residual) {
        SecantUpdate(at, next, jac);
        accepted = true;
        at = std::move(next);
        break;
      }
      if (reused) break;  // rebuild the Jacobian at `at` and step again
      if (tries == 3) at = std::move(next);
    }
    if (at.residual < best->residual) *best = at;
    if (accepted) {
      reused = true;
      continue;
    }
    if (!reused) return true;  // Newton stalls: the caller falls back
    jac->clear();
  }
  return true;
}

// Period by period at a fixed control, from *z (its control entry, if any,
// kept): settled when the last `window` period boundaries all lie within
// tolerance of the latest AND the geometric extrapolation of the remaining
// approach (TailEstimate) is within tolerance too.
struct PeriodSettle {
  bool settled = false;
  double residual = HUGE_VAL;
  std::vector<double> ripple;
  double regulated_mean = NAN;
  bool control_pinned = false;  ///< the control correction stopped at a bound
};

PeriodSettle SettleByPeriods(Shooter& shooter, std::vector<double>* z, std::vector<double> ripple,
                             const SteadyStateOptions& options, const SteadyStateResult& r) {
  const size_t n = shooter.states();
  PeriodSettle out;
  out.ripple = std::move(ripple);
  auto states_of = [&](const std::vector<double>& v) {
    return std::vector<double>(v.begin(), v.begin() + n);
  };
  std::vector<std::vector<double>> history = {states_of(*z)};
  const size_t window = static_cast<size_t>(std::max(2, options.window));
  const size_t keep = 2 * window;  // boundaries kept for the tail estimate
  while (true) {
    int chunk = std::min(std::max(1, options.chunk_periods),
                         WholePeriods(options.max_periods - r.periods));
    PeriodRun run;
    if (chunk <= 0 || !shooter.Run(z, chunk, &run)) break;
    history.back() = states_of(*z);  // the state actually used (a retry may nudge it)
    for (const auto& b : run.boundary) history.push_back(b);
    out.ripple = run.ripple;
    out.regulated_mean = run.regulated_mean;
    std::copy(history.back().begin(), history.back().end(), z->begin());
    if (history.size() > keep + 1) history.erase(history.begin(), history.end() - (keep + 1));
    if (history.size() < window + 1) continue;
    double spread = 0;
    for (size_t k = history.size() - (window + 1); k + 1 < history.size(); ++k) {
      std::vector<double> d(n);
      for (size_t i = 0; i < n; ++i) d[i] = history[k][i] - history.back()[i];
      spread = std::max(spread, shooter.Residual(d, out.ripple));
    }
    out.residual = std::max(spread, TailEstimate(history, [&](const std::vector<double>& d) {
                              return shooter.Residual(d, out.ripple);
                            }));
    if (out.residual <= options.tolerance) {
      out.settled = true;
      break;
    }
  }
  return out;
}

// The period-by-period fallback with a control: settles at a fixed control,
// then moves the control by a secant step on the regulation error (the first
// step a small probe, since the sign of the gain is not known), up to
// kControlRounds times.
constexpr int kControlRounds = 8;

PeriodSettle RegulateByPeriods(Shooter& shooter, std::vector<double>* z, std::vector<double> ripple,
                               const ControlUnknown& control, const SteadyStateOptions& options,
                               const SteadyStateResult& r) {
  const size_t u = z->size() - 1;
  double u_prev = NAN, e_prev = NAN;
  PeriodSettle out;
  for (int round = 0; round < kControlRounds; ++round) {
    out = SettleByPeriods(shooter, z, ripple, options, r);
    if (!r.ok || !out.settled) return out;
    ripple = out.ripple;
    double e = out.regulated_mean - control.target;
    double reg = shooter.RegulationResidual(out.regulated_mean);
    out.residual = std::max(out.residual, reg);
    if (reg <= options.tolerance) return out;
    double slope =
        std::isfinite(u_prev) && (*z)[u] != u_prev ? (e - e_prev) / ((*z)[u] - u_prev) : NAN;
    u_prev = (*z)[u];
    e_prev = e;
    double next =
        std::isfinite(slope) && slope != 0
            ? u_prev - e / slope
            : u_prev +
                  (u_prev + 0.005 * (control.max - control.min) > control.max ? -0.005 : 0.005) *
                      (control.max - control.min);
    (*z)[u] = std::min(control.max, std::max(control.min, next));
    if ((*z)[u] == u_prev) {
      // Pinned: the secant step asks for a control beyond the bound it is
      // already at, so more rounds would simulate the same circuit again.
      out.control_pinned = true;
      break;
    }
  }
  out.settled = false;
  return out;
}

// Both searches: Newton (shooting) first, then period by period from the
// best iterate.
SteadyStateResult SolveSteadyState(Simulator& simulator, const PeriodRenderer& render,
                                   const std::vector<std::string>& vectors,
                                   const std::vector<SlowState>& states,
                                   const ControlUnknown* control, double period_s,
                                   const SteadyStateOptions& options) {
  SteadyStateResult r;
  r.ok = true;
  std::vector<SlowState> unknowns = SearchUnknowns(states, control);
  std::vector<double> z(unknowns.size());
  for (size_t i = 0; i < z.size(); ++i) z[i] = unknowns[i].initial;
  SteadyStateOptions opt = options;
  if (opt.warm && opt.warm->Fits(z.size())) {
    z = opt.warm->unknowns;
    if (control) z.back() = std::min(control->max, std::max(control->min, z.back()));
    r.warm_started = true;
    opt.tolerance *= kWarmTolerance;
  } else {
    opt.warm = nullptr;
  }
  // `shooter` scales residuals to the search's own target (opt, tighter when
  // warm), `plain` to the tolerance asked for, which decides what is settled.
  Shooter shooter(simulator, render, vectors, unknowns, states.size(), control, period_s, opt,
                  &r);
  Shooter plain(simulator, render, vectors, unknowns, states.size(), control, period_s, options,
                &r);
  r.state.assign(z.begin(), z.begin() + states.size());
  if (z.empty()) {
    // Nothing slow to settle: the circuit is periodic from the first period.
    r.settled = true;
    r.method = SettleMethod::kNone;
    return r;
  }
  auto finish = [&](const std::vector<double>& at, const std::vector<double>& ripple,
                    double residual, double mean, bool settled) {
    r.settled = settled;
    r.residual = residual;
    r.state.assign(at.begin(), at.begin() + states.size());
    r.ripple = ripple;
    if (control) {
      r.control = at.back();
      r.regulated_mean = mean;
    }
    return r;
  };
  Iterate best;
  best.z = z;
  best.run.ripple.assign(states.size(), 0);
  if (options.method == SettleMethod::kShooting) {
    r.method = SettleMethod::kShooting;
    Matrix jac;
    if (!Newton(shooter, z, unknowns, control, opt, &r, &best, &jac) && !r.ok) return r;
    best.residual = best.f.empty() ? HUGE_VAL : plain.SystemResidual(best.f, best.run);
    if (best.residual <= options.tolerance) {
      r.final_run = std::move(best.run.output);
      r.jacobian = std::move(jac);
      return finish(best.z, best.run.ripple, best.residual, best.run.regulated_mean, true);
    }
  }
  r.method = SettleMethod::kPeriods;
  z = best.z;
  PeriodSettle p = control ? RegulateByPeriods(plain, &z, best.run.ripple, *control, options, r)
                           : SettleByPeriods(plain, &z, best.run.ripple, options, r);
  if (!r.ok) return r;
  r.control_pinned = p.control_pinned;
  double residual = std::isfinite(p.residual) ? p.residual : best.residual;
  return finish(z, p.ripple, residual, p.regulated_mean, p.settled);
}

}  // namespace

SimulationOutput RunFromState(Simulator& simulator, const PeriodRenderer& render,
                              const std::vector<std::string>& vectors,
                              const std::vector<SlowState>& states, double period_s, double periods,
                              int nudge, std::vector<double>* x, std::string* render_error) {
  const std::vector<double> base = *x;
  SimulationOutput o;
  for (double factor : {0.0, 0.37, -0.61}) {
    for (size_t i = 0; i < base.size(); ++i) {
      bool moved = nudge < 0 || static_cast<size_t>(nudge) == i;
      (*x)[i] = base[i] + (moved ? factor * states[i].floor : 0.0);
    }
    std::string netlist;
    if (!render(*x, periods, &netlist, render_error)) {
      o.ok = false;
      return o;
    }
    o = simulator.Run(netlist, vectors, (periods + kPeriodOverrun) * period_s);
    if (o.ok || o.poisoned || o.error.find("imestep too small") == std::string::npos) break;
  }
  return o;
}

bool WarmStart::HasJacobian(size_t count) const {
  if (!Fits(count) || jacobian.size() != count) return false;
  for (const auto& row : jacobian) {
    if (row.size() != count) return false;
    for (double v : row)
      if (!std::isfinite(v)) return false;
  }
  return true;
}

void BroydenUpdate(const std::vector<double>& dz, const std::vector<double>& df,
                   std::vector<std::vector<double>>* jac) {
  double dz2 = 0;
  for (double v : dz) dz2 += v * v;
  if (!(dz2 > 0)) return;
  for (size_t i = 0; i < jac->size(); ++i) {
    double jdz = 0;
    for (size_t k = 0; k < dz.size(); ++k) jdz += (*jac)[i][k] * dz[k];
    const double c = (df[i] - jdz) / dz2;
    for (size_t k = 0; k < dz.size(); ++k) (*jac)[i][k] += c * dz[k];
  }
}

std::vector<SlowState> SearchUnknowns(const std::vector<SlowState>& states,
                                      const ControlUnknown* control) {
  std::vector<SlowState> unknowns = states;
  if (control) {
    unknowns.push_back({control->vector, control->initial, 1e-6 * (control->max - control->min)});
  }
  return unknowns;
}

std::vector<double> SettledUnknowns(const SteadyStateResult& r) {
  std::vector<double> z = r.state;
  if (!std::isnan(r.control)) z.push_back(r.control);
  return z;
}

SteadyStateResult FindPeriodicSteadyState(Simulator& simulator, const PeriodRenderer& render,
                                          const std::vector<std::string>& vectors,
                                          const std::vector<SlowState>& states, double period_s,
                                          const SteadyStateOptions& options) {
  return SolveSteadyState(simulator, render, vectors, states, nullptr, period_s, options);
}

SteadyStateResult FindRegulatedSteadyState(Simulator& simulator, const PeriodRenderer& render,
                                           const std::vector<std::string>& vectors,
                                           const std::vector<SlowState>& states,
                                           const ControlUnknown& control, double period_s,
                                           const SteadyStateOptions& options) {
  return SolveSteadyState(simulator, render, vectors, states, &control, period_s, options);
}

}  // namespace zvsmap
