#include "sim/steady_state.h"

#include <algorithm>
#include <cmath>

namespace zvsmap {

double SlowStateFloor(const std::string& vector) {
  (void)vector;  // 1 mA for currents, 1 mV for voltages: the same number
  return 1e-3;
}

namespace {

// One run of `periods` periods from `x`: the state at every period boundary
// (k = 1..periods) and each state's ripple over the last period.
struct PeriodRun {
  std::vector<std::vector<double>> boundary;  // [k-1][state]
  std::vector<double> ripple;
};

class Shooter {
 public:
  Shooter(Simulator& sim, const PeriodRenderer& render, const std::vector<std::string>& vectors,
          const std::vector<SlowState>& states, double period, const SteadyStateOptions& opt,
          SteadyStateResult* result)
      : sim_(sim), render_(render), vectors_(vectors), states_(states), period_(period),
        opt_(opt), r_(result) {}

  // Simulates `periods` from *x (possibly nudged, see RunFromState). False
  // (result filled) when a run fails or the period budget is spent.
  bool Run(std::vector<double>* x, int periods, PeriodRun* out, int nudge = -1) {
    if (r_->periods + periods > opt_.max_periods) {
      budget_spent_ = true;
      return false;
    }
    std::string error;
    SimulationOutput o =
        RunFromState(sim_, render_, vectors_, states_, period_, periods, nudge, x, &error);
    r_->periods += periods;
    if (!o.ok) {
      r_->ok = false;
      r_->error = error.empty() ? o.error : error;
      r_->log = o.log;
      return false;
    }
    const auto& t = o.waves.time();
    out->boundary.assign(periods, std::vector<double>(states_.size()));
    out->ripple.assign(states_.size(), 0);
    double t_last = (periods - 1) * period_;
    for (size_t i = 0; i < states_.size(); ++i) {
      const auto& v = o.waves.Get(states_[i].vector);
      for (int k = 1; k <= periods; ++k) out->boundary[k - 1][i] = Interpolate(t, v, k * period_);
      double lo = HUGE_VAL, hi = -HUGE_VAL;
      for (size_t j = 0; j < t.size(); ++j) {
        if (t[j] < t_last || t[j] > periods * period_) continue;
        lo = std::min(lo, v[j]);
        hi = std::max(hi, v[j]);
      }
      out->ripple[i] = hi >= lo ? hi - lo : 0;
    }
    return true;
  }

  // Scaled residual of a change dx: max_i |dx_i| / max(ripple_i, floor_i / tol).
  double Residual(const std::vector<double>& dx, const std::vector<double>& ripple) const {
    double r = 0;
    for (size_t i = 0; i < dx.size(); ++i) {
      double scale = std::max(ripple[i], states_[i].floor / opt_.tolerance);
      r = std::max(r, std::fabs(dx[i]) / scale);
    }
    return r;
  }

  bool budget_spent() const { return budget_spent_; }

 private:
  Simulator& sim_;
  const PeriodRenderer& render_;
  const std::vector<std::string>& vectors_;
  const std::vector<SlowState>& states_;
  double period_;
  const SteadyStateOptions& opt_;
  SteadyStateResult* r_;
  bool budget_spent_ = false;
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

}  // namespace

SimulationOutput RunFromState(Simulator& simulator, const PeriodRenderer& render,
                              const std::vector<std::string>& vectors,
                              const std::vector<SlowState>& states, double period_s, int periods,
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

SteadyStateResult FindPeriodicSteadyState(Simulator& simulator, const PeriodRenderer& render,
                                          const std::vector<std::string>& vectors,
                                          const std::vector<SlowState>& states, double period_s,
                                          const SteadyStateOptions& options) {
  SteadyStateResult r;
  r.ok = true;
  Shooter shooter(simulator, render, vectors, states, period_s, options, &r);
  const size_t n = states.size();
  std::vector<double> x(n);
  for (size_t i = 0; i < n; ++i) x[i] = states[i].initial;
  r.state = x;
  if (n == 0) {
    // Nothing slow to settle: the circuit is periodic from the first period.
    r.settled = true;
    r.method = "none";
    return r;
  }

  std::vector<double> best_x = x;
  double best_residual = HUGE_VAL;
  std::vector<double> best_ripple(n, 0);

  if (options.method == SteadyStateOptions::Method::kShooting) {
    r.method = "shooting";
    PeriodRun run;
    if (!shooter.Run(&x, 1, &run)) {
      if (!r.ok) return r;
    } else {
      std::vector<double> fx = run.boundary[0];
      std::vector<double> ripple = run.ripple;
      auto residual_of = [&](const std::vector<double>& at, const std::vector<double>& phi,
                             const std::vector<double>& rip) {
        std::vector<double> f(n);
        for (size_t i = 0; i < n; ++i) f[i] = phi[i] - at[i];
        return shooter.Residual(f, rip);
      };
      double res = residual_of(x, fx, ripple);
      best_x = x;
      best_residual = res;
      best_ripple = ripple;
      bool failed = false;
      while (res > options.tolerance && r.iterations < options.max_newton && !failed) {
        ++r.iterations;
        // Finite-difference Jacobian of F(x) = Phi(x) - x, one run per state.
        std::vector<std::vector<double>> jac(n, std::vector<double>(n, 0));
        for (size_t j = 0; j < n && !failed; ++j) {
          std::vector<double> xp = x;
          xp[j] += std::max(0.01 * ripple[j], 10 * states[j].floor);
          PeriodRun pr;
          if (!shooter.Run(&xp, 1, &pr, static_cast<int>(j))) {
            failed = true;
            break;
          }
          double h = xp[j] - x[j];
          for (size_t i = 0; i < n; ++i) {
            jac[i][j] = (pr.boundary[0][i] - fx[i]) / h - (i == j ? 1.0 : 0.0);
          }
        }
        if (failed) break;
        std::vector<double> minus_f(n), dx;
        for (size_t i = 0; i < n; ++i) minus_f[i] = -(fx[i] - x[i]);
        if (!Solve(jac, minus_f, &dx)) break;
        // Limit the step to a few times the state's own scale, then halve
        // it while the residual does not fall (damped Newton).
        double lambda = 1;
        for (size_t i = 0; i < n; ++i) {
          double cap = std::max({10 * std::fabs(x[i]), 100 * ripple[i], 1000 * states[i].floor});
          if (std::fabs(dx[i]) * lambda > cap) lambda = cap / std::fabs(dx[i]);
        }
        bool accepted = false;
        for (int tries = 0; tries < 4 && !failed; ++tries, lambda *= 0.5) {
          std::vector<double> xn(n);
          for (size_t i = 0; i < n; ++i) xn[i] = x[i] + lambda * dx[i];
          PeriodRun nr;
          if (!shooter.Run(&xn, 1, &nr)) {
            failed = true;
            break;
          }
          double rn = residual_of(xn, nr.boundary[0], nr.ripple);
          if (rn < res || tries == 3) {
            accepted = rn < res;
            x = xn;
            fx = nr.boundary[0];
            ripple = nr.ripple;
            res = rn;
            break;
          }
        }
        if (res < best_residual) {
          best_x = x;
          best_residual = res;
          best_ripple = ripple;
        }
        if (!accepted) break;  // Newton stalls: fall back
      }
      if (!r.ok) return r;
      if (best_residual <= options.tolerance) {
        r.settled = true;
        r.residual = best_residual;
        r.state = best_x;
        r.ripple = best_ripple;
        return r;
      }
    }
  }

  // Period by period from the best state so far: settled when the last
  // `window` period boundaries all lie within tolerance of the latest AND the
  // geometric extrapolation of the remaining approach (TailEstimate) is
  // within tolerance too.
  r.method = "periods";
  x = best_x;
  std::vector<std::vector<double>> history = {x};
  std::vector<double> ripple = best_ripple;
  double last = HUGE_VAL;
  const size_t window = static_cast<size_t>(std::max(2, options.window));
  const size_t keep = 2 * window;  // boundaries kept for the tail estimate
  while (true) {
    int chunk = std::min(std::max(1, options.chunk_periods), options.max_periods - r.periods);
    PeriodRun run;
    if (chunk <= 0 || !shooter.Run(&x, chunk, &run)) break;
    history.back() = x;  // the state actually used (a retry may nudge it)
    for (const auto& b : run.boundary) history.push_back(b);
    ripple = run.ripple;
    x = history.back();
    if (history.size() > keep + 1) history.erase(history.begin(), history.end() - (keep + 1));
    if (history.size() >= window + 1) {
      double spread = 0;
      for (size_t k = history.size() - (window + 1); k + 1 < history.size(); ++k) {
        std::vector<double> d(n);
        for (size_t i = 0; i < n; ++i) d[i] = history[k][i] - x[i];
        spread = std::max(spread, shooter.Residual(d, ripple));
      }
      last = std::max(spread, TailEstimate(history, [&](const std::vector<double>& d) {
                        return shooter.Residual(d, ripple);
                      }));
      if (last <= options.tolerance) {
        r.settled = true;
        break;
      }
    }
  }
  if (!r.ok) return r;
  r.residual = last;
  if (!std::isfinite(last)) r.residual = best_residual;
  r.state = x;
  r.ripple = ripple;
  return r;
}

}  // namespace zvsmap
