// Benchmark (not a test): settling by zvsmap (shooting) against brute force
// from zero initial conditions and from the average-model state, over the
// points of a sweep file. For each point it prints the periods each way needs
// to reach the same accuracy and the wall time, and the ratios.
//
// Same accuracy: brute force counts as settled from the first period boundary
// after which every boundary state stays within max(tol * ripple, 1 mA/1 mV)
// of zvsmap's settled state (tol = the sweep's settle tolerance), plus the
// measured periods; its wall time is the long run's time prorated to those
// periods. Usage: zvsmap_bench_settle SWEEP [MAX_PERIODS] [FIRST_POINT] [N_POINTS]
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
  std::string error;
};

Brute BruteForce(Simulator& sim, const PreparedSweep& s, const Point& p,
                 const std::vector<std::pair<std::string, double>>& start,
                 const std::vector<double>& settled, int max_periods, int measured) {
  Brute b;
  std::vector<ParamValue> values = p.values;
  for (const auto& [name, v] : start) values.push_back({name, v});
  Variables resolved;
  Diagnostic error;
  double period = 0;
  if (!ResolveParams(s.tmpl, values, &resolved, &error) ||
      !ResolvePeriod(s.tmpl, resolved, &period, &error)) {
    b.error = error.Format();
    return b;
  }
  PointEvaluator ev(s.spec, s.tmpl);
  TranSettings tran = ev.TranFor(resolved, period);
  tran.tstart_s = 0;
  tran.tstop_s = (max_periods + kPeriodOverrun) * period;
  std::vector<std::string> vectors;
  for (const auto& st : s.tmpl.states) vectors.push_back(st.vector);
  auto t0 = std::chrono::steady_clock::now();
  SimulationOutput o =
      sim.Run(RenderNetlist(s.tmpl, resolved, tran, vectors), vectors, tran.tstop_s);
  double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  if (!o.ok) {
    b.error = o.error;
    return b;
  }
  b.ok = true;
  const auto& t = o.waves.time();
  size_t n = vectors.size();
  std::vector<double> tol(n);
  for (size_t i = 0; i < n; ++i) {
    const auto& v = o.waves.Get(vectors[i]);
    double lo = HUGE_VAL, hi = -HUGE_VAL;
    for (size_t k = 0; k < t.size(); ++k)
      if (t[k] >= (max_periods - 1) * period && t[k] <= max_periods * period) {
        lo = std::min(lo, v[k]);
        hi = std::max(hi, v[k]);
      }
    tol[i] = std::max(s.spec.simulation.settle_tolerance * (hi - lo), SlowStateFloor(vectors[i]));
  }
  int last_bad = 0;
  for (int k = 1; k <= max_periods; ++k) {
    for (size_t i = 0; i < n; ++i) {
      if (std::fabs(o.waves.At(vectors[i], k * period) - settled[i]) > tol[i]) last_bad = k;
    }
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
  int measured = std::max(2, s.spec.simulation.measure_periods);
  std::printf("%-5s %-34s | %-20s | %-16s | %-16s | %-9s %-9s\n", "point", "values",
              "zvsmap periods/s", "zero periods/s", "avg periods/s", "zero/zvs", "avg/zvs");
  double sum_z = 0, sum_zero = 0, sum_avg = 0;
  int counted = 0;
  for (size_t k = first; k < s.points.size() && k < first + count; ++k) {
    const Point& p = s.points[k];
    std::string label;
    for (const auto& v : p.values) label += v.name + "=" + FormatNumber(v.value) + " ";
    PointEvaluator ev(s.spec, s.tmpl);
    PointResult r = ev.Evaluate(p, sim);
    if (r.status != PointStatus::kOk) {
      std::printf("%-5zu %-34s | %s: %s\n", p.index, label.c_str(), PointStatusName(r.status),
                  r.reason.c_str());
      continue;
    }
    std::vector<double> settled;
    std::vector<std::pair<std::string, double>> zero, avg;
    Variables defaults;
    Diagnostic error;
    ResolveParams(s.tmpl, p.values, &defaults, &error);
    for (const auto& [name, v] : r.settle.initial_state) {
      settled.push_back(v);
      zero.push_back({name, 0.0});
      avg.push_back({name, defaults[name]});
    }
    Brute bz = BruteForce(sim, s, p, zero, settled, max_periods, measured);
    Brute ba = BruteForce(sim, s, p, avg, settled, max_periods, measured);
    auto cell = [&](const Brute& b) {
      char buf[64];
      if (!b.ok) std::snprintf(buf, sizeof buf, "failed");
      else if (b.periods < 0) std::snprintf(buf, sizeof buf, ">%d", max_periods);
      else std::snprintf(buf, sizeof buf, "%d / %.2f", b.periods, b.wall_s);
      return std::string(buf);
    };
    auto ratio = [&](const Brute& b) {
      char buf[32];
      if (!b.ok || b.periods < 0) std::snprintf(buf, sizeof buf, "-");
      else std::snprintf(buf, sizeof buf, "%.1fx", double(b.periods) / r.settle.periods);
      return std::string(buf);
    };
    char zbuf[64];
    std::snprintf(zbuf, sizeof zbuf, "%d / %.2f %s", r.settle.periods, r.wall_s,
                  r.settle.method == "shooting" ? "" : "(P)");
    std::printf("%-5zu %-34s | %-20s | %-16s | %-16s | %-9s %-9s\n", p.index, label.c_str(), zbuf,
                cell(bz).c_str(), cell(ba).c_str(), ratio(bz).c_str(), ratio(ba).c_str());
    std::fflush(stdout);
    if (bz.ok && bz.periods > 0 && ba.ok && ba.periods > 0) {
      sum_z += r.settle.periods;
      sum_zero += bz.periods;
      sum_avg += ba.periods;
      ++counted;
    }
  }
  if (counted > 0) {
    std::printf("\nover %d points with all three settled: periods zvsmap %.0f, from zero %.0f "
                "(%.1fx), from average model %.0f (%.1fx)\n",
                counted, sum_z, sum_zero, sum_zero / sum_z, sum_avg, sum_avg / sum_z);
  }
  return 0;
}
