// Benchmark (not a test): settling by zvsmap (shooting) against brute force
// from zero initial conditions and from the template's initial state (its
// init= expressions: the average-model state or better), over the
// points of a sweep file. For each point it prints the periods each way needs
// to reach the same accuracy and the wall time, the ratios, and medians.
//
// Same accuracy. zvsmap accepts a start-of-period state x when every slow
// state i satisfies |x_i(T) - x_i(0)| <= band_i, band_i = max(tol * ripple_i,
// floor_i) (tol = the sweep's settle tolerance, ripple over zvsmap's measured
// period, floors 1 mA / 1 mV: SlowStateFloor). Brute force counts as settled
// from the first period boundary after which every boundary of its run (up to
// MAX_PERIODS) stays within the same band_i of zvsmap's settled state, plus
// the measured periods (as zvsmap's count includes them). Its wall time is the
// runs' time prorated to those periods (brute force runs in chunks, see
// BruteForce). The "agree" column is the
// distance between brute force's last boundary and zvsmap's state in units of
// the band (<= 1: the two answers agree to the tolerance; a brute-force run
// still moving at its end shows > 1 and ">MAX"). Usage:
//   zvsmap_bench_settle SWEEP [MAX_PERIODS] [FIRST_POINT] [N_POINTS]
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <vector>

#include "core/spice_number.h"
#include "netlist/render.h"
#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "sim/ngspice_simulator.h"
#include "sim/steady_state.h"

using namespace zvsmap;

namespace {

struct Brute {
  bool ok = false;
  int periods = -1;  // -1: not within the run
  double wall_s = 0;
  double agree = NAN;  // |last boundary - zvsmap's state| / band, worst state
  std::string error;
};

// Brute force from `start`: MAX_PERIODS periods in runs of kChunk periods,
// each run starting from the slow states at the previous run's last boundary
// (the fast states restart from the template's initial conditions, as in
// zvsmap's own runs). One long run is no better: ngspice stops now and then
// with "Timestep too small" somewhere in a run of hundreds of periods, and a
// chunk that does can be retried from a state nudged within the floors
// (RunFromState).
constexpr int kChunk = 50;

Brute BruteForce(Simulator& sim, const PreparedSweep& s, const Point& p,
                 const std::vector<std::pair<std::string, double>>& start,
                 const std::vector<double>& settled, const std::vector<double>& band,
                 int max_periods, int measured) {
  Brute b;
  Variables resolved;
  Diagnostic error;
  double period = 0;
  if (!ResolveParams(s.tmpl, p.values, &resolved, &error) ||
      !ResolvePeriod(s.tmpl, resolved, &period, &error)) {
    b.error = error.Format();
    return b;
  }
  PointEvaluator ev(s.spec, s.tmpl);
  std::vector<std::string> vectors;
  std::vector<SlowState> states;
  std::vector<double> x;
  for (size_t i = 0; i < s.tmpl.states.size(); ++i) {
    vectors.push_back(s.tmpl.states[i].vector);
    states.push_back({s.tmpl.states[i].vector, start[i].second,
                      SlowStateFloor(s.tmpl.states[i].vector)});
    x.push_back(start[i].second);
  }
  PeriodRenderer render = [&](const std::vector<double>& at, double periods, std::string* netlist,
                              std::string* why) {
    std::vector<ParamValue> values = p.values;
    for (size_t i = 0; i < at.size(); ++i) values.push_back({start[i].first, at[i]});
    Variables r;
    Diagnostic d;
    if (!ResolveParams(s.tmpl, values, &r, &d)) {
      *why = d.Format();
      return false;
    }
    TranSettings tran = ev.TranFor(r, period);
    tran.tstart_s = 0;
    tran.tstop_s = (periods + kPeriodOverrun) * period;
    *netlist = RenderNetlist(s.tmpl, r, tran, vectors);
    return true;
  };
  const size_t n = vectors.size();
  std::vector<std::vector<double>> boundary;  // [k-1][state]
  auto t0 = std::chrono::steady_clock::now();
  for (int done = 0; done < max_periods; done += kChunk) {
    int chunk = std::min(kChunk, max_periods - done);
    std::string why;
    SimulationOutput o = RunFromState(sim, render, vectors, states, period, chunk, -1, &x, &why);
    if (!o.ok) {
      b.error = why.empty() ? o.error : why;
      b.error += " (in periods " + std::to_string(done) + "-" + std::to_string(done + chunk) + ")";
      return b;
    }
    for (int k = 1; k <= chunk; ++k) {
      std::vector<double> at(n);
      for (size_t i = 0; i < n; ++i) at[i] = o.waves.At(vectors[i], k * period);
      boundary.push_back(at);
    }
    x = boundary.back();
  }
  double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  b.ok = true;
  int last_bad = 0;
  for (int k = 1; k <= max_periods; ++k) {
    double worst = 0;
    for (size_t i = 0; i < n; ++i) {
      worst = std::max(worst, std::fabs(boundary[k - 1][i] - settled[i]) / band[i]);
    }
    if (worst > 1) last_bad = k;
    if (k == max_periods) b.agree = worst;
  }
  if (last_bad < max_periods) {
    b.periods = last_bad + measured;
    b.wall_s = wall * b.periods / max_periods;
  }
  return b;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fprintf(stderr, "usage: %s SWEEP [MAX_PERIODS] [FIRST_POINT] [N_POINTS]\n", argv[0]);
    return 2;
  }
  int max_periods = argc > 2 ? std::atoi(argv[2]) : 1000;
  size_t first = argc > 3 ? std::strtoul(argv[3], nullptr, 10) : 0;
  size_t count = argc > 4 ? std::strtoul(argv[4], nullptr, 10) : 1000000;
  PreparedSweep s;
  std::vector<Diagnostic> errors;
  if (!PrepareSweep(argv[1], 0, &s, &errors)) {
    for (const auto& e : errors) std::fprintf(stderr, "%s\n", e.Format().c_str());
    return 1;
  }
  NgspiceSimulator sim;
  // Brute force is measured as the reference of tools/bench_point.cc is: in
  // the second of two periods after its settling.
  const int measured = 2;
  const double tol = s.spec.simulation.settle_tolerance;
  std::printf("%-5s %-30s | %-22s | %-8s | %-22s | %-22s | %-8s %-8s\n", "point", "values",
              "zvsmap periods / s", "residual", "zero: periods / s agree",
              "init: periods / s agree", "zero/zvs", "init/zvs");
  // Per point: zvsmap periods and wall, brute force periods (max_periods + 1
  // when not settled within the run: a lower bound) and wall.
  std::vector<double> z_periods, z_wall, zero_periods, zero_wall, init_periods, init_wall;
  std::vector<double> zero_ratio, init_ratio;
  int zero_open = 0, init_open = 0, failed = 0;
  for (size_t k = first; k < s.points.size() && k < first + count; ++k) {
    const Point& p = s.points[k];
    std::string label;
    for (const auto& v : p.values) label += v.name + "=" + FormatNumber(v.value) + " ";
    PointEvaluator ev(s.spec, s.tmpl);
    Waveforms waves;
    PointResult r = ev.Evaluate(p, sim, &waves);
    if (r.status != PointStatus::kOk) {
      std::printf("%-5zu %-30s | %s: %s\n", p.index, label.c_str(), PointStatusName(r.status),
                  r.reason.c_str());
      ++failed;
      continue;
    }
    std::vector<double> settled, band;
    std::vector<std::pair<std::string, double>> zero, init;
    Variables defaults;
    Diagnostic error;
    double period = 0;
    ResolveParams(s.tmpl, p.values, &defaults, &error);
    ResolvePeriod(s.tmpl, defaults, &period, &error);
    const auto& t = waves.time();
    for (size_t i = 0; i < r.settle.initial_state.size(); ++i) {
      const auto& [name, v] = r.settle.initial_state[i];
      settled.push_back(v);
      zero.push_back({name, 0.0});
      init.push_back({name, defaults[name]});
      const std::string& vec = s.tmpl.states[i].vector;
      const auto& y = waves.Get(vec);
      double lo = HUGE_VAL, hi = -HUGE_VAL;
      for (size_t j = 0; j < t.size(); ++j) {
        if (t[j] >= (measured - 1) * period && t[j] <= measured * period) {  // last period
          lo = std::min(lo, y[j]);
          hi = std::max(hi, y[j]);
        }
      }
      band.push_back(std::max(tol * (hi - lo), SlowStateFloor(vec)));
    }
    Brute bz = BruteForce(sim, s, p, zero, settled, band, max_periods, measured);
    Brute bi = BruteForce(sim, s, p, init, settled, band, max_periods, measured);
    auto cell = [&](const Brute& b) {
      char buf[64];
      if (!b.ok) std::snprintf(buf, sizeof buf, "failed");
      else if (b.periods < 0) std::snprintf(buf, sizeof buf, ">%d       %.2g", max_periods, b.agree);
      else std::snprintf(buf, sizeof buf, "%d / %.2f  %.2g", b.periods, b.wall_s, b.agree);
      return std::string(buf);
    };
    auto ratio = [&](const Brute& b) {
      char buf[32];
      if (!b.ok) std::snprintf(buf, sizeof buf, "-");
      else if (b.periods < 0)
        std::snprintf(buf, sizeof buf, ">%.0fx", double(max_periods) / r.settle.periods);
      else std::snprintf(buf, sizeof buf, "%.1fx", double(b.periods) / r.settle.periods);
      return std::string(buf);
    };
    auto record = [&](const Brute& b, std::vector<double>* periods, std::vector<double>* wall,
                      std::vector<double>* ratios, int* open) {
      if (!b.ok) return;
      double n = b.periods < 0 ? max_periods + 1 : b.periods;
      if (b.periods < 0) ++*open;
      periods->push_back(n);
      wall->push_back(b.periods < 0 ? NAN : b.wall_s);
      ratios->push_back(n / r.settle.periods);
    };
    char zbuf[64];
    std::snprintf(zbuf, sizeof zbuf, "%.3g / %.2f %s", r.settle.periods, r.wall_s,
                  r.settle.method == SettleMethod::kShooting ? "" : "(P)");
    std::printf("%-5zu %-30s | %-22s | %-8.1e | %-22s | %-22s | %-8s %-8s\n", p.index,
                label.c_str(), zbuf, r.settle.residual, cell(bz).c_str(), cell(bi).c_str(),
                ratio(bz).c_str(), ratio(bi).c_str());
    for (const Brute* b : {&bz, &bi}) {
      if (!b->ok) {
        std::string e = b->error.substr(0, b->error.find('\n'));
        std::printf("      %s brute force failed: %s\n", b == &bz ? "zero" : "init", e.c_str());
      }
    }
    std::fflush(stdout);
    z_periods.push_back(r.settle.periods);
    z_wall.push_back(r.wall_s);
    record(bz, &zero_periods, &zero_wall, &zero_ratio, &zero_open);
    record(bi, &init_periods, &init_wall, &init_ratio, &init_open);
  }
  // Medians; a brute-force run that did not settle within MAX_PERIODS counts
  // as MAX_PERIODS + 1 (so its median is a lower bound when it is one of them).
  auto median = [](std::vector<double> v) -> double {
    v.erase(std::remove_if(v.begin(), v.end(), [](double x) { return std::isnan(x); }), v.end());
    if (v.empty()) return NAN;
    std::sort(v.begin(), v.end());
    size_t m = v.size() / 2;
    return v.size() % 2 ? v[m] : 0.5 * (v[m - 1] + v[m]);
  };
  std::printf("\nmedians over %zu settled points (%d not settled by zvsmap or failed):\n",
              z_periods.size(), failed);
  std::printf("  zvsmap                 %6.0f periods  %.3f s\n", median(z_periods),
              median(z_wall));
  std::printf("  brute force from zero  %6.0f periods  %.3f s (settled runs)  ratio %.1fx  "
              "(%d of %zu did not settle within %d periods)\n",
              median(zero_periods), median(zero_wall), median(zero_ratio), zero_open,
              zero_periods.size(), max_periods);
  std::printf("  brute force from init  %6.0f periods  %.3f s (settled runs)  ratio %.1fx  "
              "(%d of %zu did not settle within %d periods)\n",
              median(init_periods), median(init_wall), median(init_ratio), init_open,
              init_periods.size(), max_periods);
  return 0;
}
