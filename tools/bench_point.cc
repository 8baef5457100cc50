// Benchmark (not a test): what a point costs and how accurate it is, per
// method, over the points of one sweep file (tools/bench drives it; see
// DEVELOPERS.md "Benchmarks").
//
//   (a) zvsmap now: PointEvaluator::Evaluate, as `zvsmap run` calls it.
//   (b) warm starts: PointEvaluator::EvaluateWarm along the fixed chains of
//       sweep/chain_layout.h, each point from its predecessor's settled state
//       and Jacobian (ChainMemory, as a `zvsmap run` worker does), points in
//       index order (every predecessor comes first).
//   (c) brute force: the template's initial state simulated for N periods,
//       then the measured periods; N is the smallest count that settles every
//       point of the sweep within TOL (see below). tools/bench also times this
//       method as a batch loop of plain `ngspice -b` runs.
//   (d) the one-period floor: one period per point from the initial state at
//       the same step bound (the least any method can simulate).
//   reference: REF periods from the initial state (runs of 50 periods, each
//       from the previous run's last boundary), then the measured periods.
//
// Convergence check for (c): the reference run's period-boundary states are
// compared with its last boundary; a point is settled from the first boundary
// after which every slow state stays within max(TOL x its ripple over the
// reference's measured period, its floor: 1 mA / 1 mV). N is the largest such
// count over the sweep, rounded up to a multiple of 10.
//
// Accuracy, against the reference, per point the worst of both edges: the
// commutated current (valley at high_on, peak at low_on) relative to the
// reference's |peak - valley| swing, the turn-on voltage relative to the rail,
// and the transition time relative to the larger of the reference's own and
// 1 ns (kTransitionScale; NaN: not reached). RESULT *_err_own_max is the
// worst error with every transition time relative to its own reference.
//
// With --stages it instead splits zvsmap's per-point time into stages (see
// bench_stages.cc). Output: one line per point, then "RESULT key value" lines.
// With --steps B1,B2,... it instead compares step bounds (seconds; 0 is
// TranFor's own policy) against zvsmap's evaluation at --ref-step (default
// 0.5e-9), see RunStepComparison. With --reload R it times reloading the
// circuit per run against alter-and-rerun (bench_reload.cc), R repeats.
// Usage: zvsmap_bench_point SWEEP [--ref REF] [--tol TOL] [--stages]
//                           [--steps B1,B2,... [--ref-step R]] [--reload R]
//                           [--first K] [--count N] [--ref-cache FILE]
// --ref-cache FILE keeps the references (computed once, read back on later
// runs of the same sweep and --ref) to compare settling policies quickly.
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <optional>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "analysis/commutation.h"
#include "analysis/edge_finder.h"
#include "bench_reload.h"
#include "bench_stages.h"
#include "core/spice_number.h"
#include "netlist/render.h"
#include "run/chain_memory.h"
#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "sim/ngspice_simulator.h"
#include "sim/steady_state.h"

using namespace zvsmap;

namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

constexpr int kChunk = 50;
// The reference (and the plain-ngspice loop) is measured in the second of two
// periods from its settled state, a whole period after the uic start, as
// zvsmap measured before its measured run had a lead (DEVELOPERS.md
// "Measured run"), so that cached references stay comparable.
constexpr int kReferenceMeasured = 2;

// The three compared quantities of one edge.
struct EdgeValues {
  double current = NAN, v_turn_on = NAN, t_transition = NAN, rail = NAN;
};
using PointValues = std::vector<EdgeValues>;  // high_on, low_on per cell

PointValues FromEdges(const std::vector<EdgeMeasurement>& edges) {
  PointValues v;
  for (const auto& e : edges) {
    v.push_back(
        {e.Get("i_commutated_a"), e.Get("v_turn_on_v"), e.Get("t_transition_s"), e.Get("rail_v")});
  }
  return v;
}

// Where a point's worst relative error sits: the edge (index into
// PointValues), the quantity, and the two values compared.
struct WorstError {
  double rel = NAN;  // NaN when the method gave no values
  size_t edge = 0;
  const char* quantity = "";
  double got = NAN, ref = NAN;
  std::string Describe() const {
    return std::isnan(rel) ? "no values"
                           : std::string(quantity) + " of edge " + std::to_string(edge) + ": " +
                                 fmt::format("{:.6g} against {:.6g}", got, ref);
  }
};

// Transition times are compared relative to max(their reference, this):
// a hard-switched edge's "transition" lasts tens of picoseconds, set by the
// engine's own steps at the switching instant, and a few picoseconds there
// are a large fraction of nothing a designer acts on; 1 ns is below the
// resolution gate drivers set dead times in (common practice).
constexpr double kTransitionScale = 1e-9;

// Worst relative error of `got` against `ref` (see the file comment), the
// transition time relative to max(|ref|, t_scale).
WorstError FindWorstError(const PointValues& got, const PointValues& ref,
                          double t_scale = kTransitionScale) {
  WorstError worst;
  if (got.size() != ref.size() || ref.empty()) return worst;
  double swing = 0;
  for (size_t i = 0; i + 1 < ref.size(); i += 2) {
    swing = std::max(swing, std::fabs(ref[i + 1].current - ref[i].current));
  }
  worst.rel = 0;
  auto consider = [&](size_t i, const char* what, double a, double b, double scale) {
    double rel = std::isnan(a) && std::isnan(b)   ? 0.0
                 : std::isnan(a) || std::isnan(b) ? 1.0  // reached in one, not the other
                                                  : std::fabs(a - b) / scale;
    if (rel > worst.rel) worst = {rel, i, what, a, b};
  };
  for (size_t i = 0; i < ref.size(); ++i) {
    consider(i, "current", got[i].current, ref[i].current, std::max(swing, 1e-3));
    consider(i, "v_turn_on", got[i].v_turn_on, ref[i].v_turn_on, std::fabs(ref[i].rail));
    consider(i, "t_transition", got[i].t_transition, ref[i].t_transition,
             std::max(std::fabs(ref[i].t_transition), t_scale));
  }
  return worst;
}
double RelError(const PointValues& got, const PointValues& ref) {
  return FindWorstError(got, ref).rel;
}
// The same with every transition time relative to its own reference value
// (the bench's metric before kTransitionScale; 1 ps only guards against zero).
double OwnRelError(const PointValues& got, const PointValues& ref) {
  return FindWorstError(got, ref, 1e-12).rel;
}

// One point's runs that start from a given slow state (the init params).
struct PointRunner {
  const PreparedSweep& s;
  const Point& p;
  PointEvaluator ev;
  Variables resolved;
  double period = 0;
  std::vector<std::string> vectors;
  std::vector<SlowState> states;
  std::vector<double> x0;
  PeriodRenderer render;

  PointRunner(const PreparedSweep& sweep, const Point& point)
      : s(sweep), p(point), ev(sweep.spec, sweep.tmpl) {
    Diagnostic error;
    ResolveParams(s.tmpl, p.values, &resolved, &error);
    ResolvePeriod(s.tmpl, resolved, &period, &error);
    vectors = VectorsToSave(s.tmpl);
    for (const auto& st : s.tmpl.states) {
      states.push_back({st.vector, resolved[st.init_param], SlowStateFloor(st.vector)});
      x0.push_back(resolved[st.init_param]);
    }
    render = [this](const std::vector<double>& at, double periods, std::string* netlist,
                    std::string* why) {
      std::vector<ParamValue> values = p.values;
      for (size_t i = 0; i < at.size(); ++i) values.push_back({s.tmpl.states[i].init_param, at[i]});
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
  }

  // Simulates `periods` from `x`; measures the edges of its last
  // measure_periods when `measure` (empty values when they are not found).
  bool Run(std::vector<double> x, int periods, Simulator& sim, SimulationOutput* out) {
    std::string why;
    *out = RunFromState(sim, render, vectors, states, period, periods, -1, &x, &why);
    return out->ok;
  }
  PointValues Measure(const SimulationOutput& out, int periods) const {
    const int measured = kReferenceMeasured;
    Waveforms w = out.waves.Window((periods - measured) * period, periods * period);
    std::vector<EdgeMeasurement> edges;
    for (const auto& cell : s.tmpl.cells) {
      std::vector<EdgeTiming> found = FindEdges(cell, w, 0.02 * period);
      for (const char* name : {"high_on", "low_on"}) {
        auto it = std::find_if(found.begin(), found.end(),
                               [&](const EdgeTiming& e) { return e.edge == name; });
        if (it == found.end()) return {};
        edges.push_back(MeasureEdge(cell, w, *it, s.spec.zvs, EdgeParamsFor(cell, resolved)));
      }
    }
    return FromEdges(edges);
  }
};

struct PointRecord {
  bool ok = false;
  double a_wall = 0, b_wall = 0, d_wall = 0, ref_per_period = 0;
  double a_periods = 0, b_periods = 0;
  int settle_at = -1;
  bool b_ok = false;
  PointValues a, b, d, ref;
  std::vector<std::vector<double>> boundary;  // reference boundary states
};

double Median(std::vector<double> v) {
  v.erase(std::remove_if(v.begin(), v.end(), [](double x) { return std::isnan(x); }), v.end());
  if (v.empty()) return NAN;
  std::sort(v.begin(), v.end());
  size_t m = v.size() / 2;
  return v.size() % 2 ? v[m] : 0.5 * (v[m - 1] + v[m]);
}
double Max(const std::vector<double>& v) {
  double m = NAN;
  for (double x : v) m = std::isnan(m) ? x : std::max(m, x);
  return m;
}
double Mean(const std::vector<double>& v) {
  double t = 0;
  size_t n = 0;
  for (double x : v) {
    if (!std::isnan(x)) t += x, ++n;
  }
  return n ? t / double(n) : NAN;
}

// (b): the point at position `k` warm-started from `memory`, which then
// remembers it.
void EvaluateWarmStarted(const PreparedSweep& s, const Point& p, size_t k, Simulator& sim,
                         ChainMemory* memory, PointRecord* rec) {
  SweepSpec warm_spec = s.spec;  // (b) is warm whatever the sweep file says
  warm_spec.simulation.warm_start = true;
  PointEvaluator ev(warm_spec, s.tmpl);
  std::optional<WarmStart> warm = memory->For(k);
  PointResult r = ev.EvaluateWarm(p, sim, warm ? &*warm : nullptr);
  r.index = k;
  memory->Remember(r);
  if (r.status != PointStatus::kOk) return;
  rec->b_ok = true;
  rec->b_wall = r.wall_s;
  rec->b_periods = r.settle.periods;
  rec->b = FromEdges(r.edges);
}

PointRecord EvaluatePoint(const PreparedSweep& s, const Point& p, Simulator& sim, int ref,
                          double tol) {
  PointRecord rec;
  PointRunner run(s, p);
  const int measured = kReferenceMeasured;
  PointEvaluator ev(s.spec, s.tmpl);
  PointResult r = ev.Evaluate(p, sim);
  if (r.status != PointStatus::kOk) return rec;
  rec.a_wall = r.wall_s;
  rec.a_periods = r.settle.periods;
  rec.a = FromEdges(r.edges);
  SimulationOutput out;
  auto t0 = Clock::now();
  bool floor_ok = run.Run(run.x0, 1, sim, &out);
  rec.d_wall = Since(t0);
  if (floor_ok) {
    // One period holds one edge of each kind: measure it as a one-period window.
    Waveforms w = out.waves;
    std::vector<EdgeMeasurement> edges;
    for (const auto& cell : s.tmpl.cells) {
      std::vector<EdgeTiming> found = FindEdges(cell, w, 0.02 * run.period);
      for (const char* name : {"high_on", "low_on"}) {
        auto it = std::find_if(found.begin(), found.end(),
                               [&](const EdgeTiming& e) { return e.edge == name; });
        if (it != found.end()) {
          edges.push_back(MeasureEdge(cell, w, *it, s.spec.zvs, EdgeParamsFor(cell, run.resolved)));
        }
      }
    }
    if (edges.size() == 2 * s.tmpl.cells.size()) rec.d = FromEdges(edges);
  }
  // Reference trajectory, boundary by boundary.
  std::vector<double> x = run.x0;
  t0 = Clock::now();
  for (int done = 0; done < ref; done += kChunk) {
    int chunk = std::min(kChunk, ref - done);
    if (!run.Run(x, chunk, sim, &out)) return rec;
    for (int k = 1; k <= chunk; ++k) {
      std::vector<double> at;
      for (const auto& st : run.states) at.push_back(out.waves.At(st.vector, k * run.period));
      rec.boundary.push_back(at);
    }
    x = rec.boundary.back();
  }
  rec.ref_per_period = Since(t0) / ref;
  if (!run.Run(x, measured, sim, &out)) return rec;
  rec.ref = run.Measure(out, measured);
  // Ripple over the reference's last measured period, and the settling count.
  std::vector<double> band;
  const auto& t = out.waves.time();
  for (size_t i = 0; i < run.states.size(); ++i) {
    const auto& y = out.waves.Get(run.states[i].vector);
    double lo = HUGE_VAL, hi = -HUGE_VAL;
    for (size_t j = 0; j < t.size(); ++j) {
      if (t[j] >= (measured - 1) * run.period && t[j] <= measured * run.period) {
        lo = std::min(lo, y[j]);
        hi = std::max(hi, y[j]);
      }
    }
    band.push_back(std::max(tol * (hi - lo), run.states[i].floor));
  }
  int last_bad = 0;
  for (int k = 1; k <= ref; ++k) {
    for (size_t i = 0; i < band.size(); ++i) {
      if (std::fabs(rec.boundary[k - 1][i] - rec.boundary.back()[i]) > band[i]) last_bad = k;
    }
  }
  rec.settle_at = last_bad;
  rec.ok = !rec.ref.empty();
  return rec;
}

// The reference part of a record (--ref-cache): ok, settle_at, the time per
// period, the reference values and the boundary states, one line per point.
void WriteReference(std::FILE* f, const PointRecord& r) {
  std::fprintf(f, "%d %d %.17g %zu", r.ok ? 1 : 0, r.settle_at, r.ref_per_period, r.ref.size());
  for (const EdgeValues& e : r.ref) {
    std::fprintf(f, " %.17g %.17g %.17g %.17g", e.current, e.v_turn_on, e.t_transition, e.rail);
  }
  std::fprintf(f, " %zu %zu", r.boundary.size(), r.boundary.empty() ? 0 : r.boundary[0].size());
  for (const auto& b : r.boundary)
    for (double v : b) std::fprintf(f, " %.17g", v);
  std::fprintf(f, "\n");
}

bool ReadReference(std::FILE* f, PointRecord* r) {
  int ok = 0;
  size_t n = 0, rows = 0, cols = 0;
  if (std::fscanf(f, "%d %d %lf %zu", &ok, &r->settle_at, &r->ref_per_period, &n) != 4) {
    return false;
  }
  r->ref.resize(n);
  for (EdgeValues& e : r->ref) {
    if (std::fscanf(f, "%lf %lf %lf %lf", &e.current, &e.v_turn_on, &e.t_transition, &e.rail) !=
        4) {
      return false;
    }
  }
  if (std::fscanf(f, "%zu %zu", &rows, &cols) != 2) return false;
  r->boundary.assign(rows, std::vector<double>(cols));
  for (auto& b : r->boundary)
    for (double& v : b)
      if (std::fscanf(f, "%lf", &v) != 1) return false;
  r->ok = ok == 1;
  return true;
}

// The reference of `rec` from the cache file's next line, when it has one.
PointRecord EvaluatePoint(const PreparedSweep& s, const Point& p, Simulator& sim, int ref,
                          double tol, std::FILE* cached) {
  if (!cached) return EvaluatePoint(s, p, sim, ref, tol);
  PointRecord rec;
  if (!ReadReference(cached, &rec)) return EvaluatePoint(s, p, sim, ref, tol);
  PointEvaluator ev(s.spec, s.tmpl);
  PointResult r = ev.Evaluate(p, sim);
  rec.ok = rec.ok && r.status == PointStatus::kOk;
  rec.a_wall = r.wall_s;
  rec.a_periods = r.settle.periods;
  rec.a = FromEdges(r.edges);
  PointRunner run(s, p);
  SimulationOutput out;
  auto t0 = Clock::now();
  run.Run(run.x0, 1, sim, &out);
  rec.d_wall = Since(t0);  // (d)'s accuracy is not kept in the cache
  return rec;
}

void Result(const char* key, double value) { std::printf("RESULT %s %.6g\n", key, value); }

// Step-policy comparison (--steps): every point evaluated as zvsmap does
// (PointEvaluator::Evaluate) once per step bound in `steps` (0: TranFor's own
// policy) and once at `ref_step` as the reference; per bound the wall time,
// the engine's time points per simulated period and the accuracy against the
// reference (RelError). Prints "RESULT step<k>_..." lines, k = index in `steps`.
int RunStepComparison(const PreparedSweep& s, const std::vector<double>& steps, double ref_step) {
  NgspiceSimulator sim;
  auto with_step = [&](double step) {
    SweepSpec spec = s.spec;
    spec.simulation.max_step_s = step;
    return spec;
  };
  SweepSpec ref_spec = with_step(ref_step);
  std::vector<SweepSpec> specs;
  for (double step : steps) specs.push_back(with_step(step));
  std::vector<std::vector<double>> err(steps.size()), wall(steps.size());
  std::vector<long> samples(steps.size(), 0);
  std::vector<double> periods(steps.size(), 0);
  for (const Point& p : s.points) {
    PointResult ref = PointEvaluator(ref_spec, s.tmpl).Evaluate(p, sim);
    if (ref.status != PointStatus::kOk) {
      std::printf("point %zu: reference failed: %s\n", p.index, ref.reason.c_str());
      continue;
    }
    std::printf("point %zu %s:", p.index, p.Describe().c_str());
    for (size_t k = 0; k < steps.size(); ++k) {
      long before = sim.timings().samples;
      PointResult r = PointEvaluator(specs[k], s.tmpl).Evaluate(p, sim);
      samples[k] += sim.timings().samples - before;
      periods[k] += r.settle.periods;
      wall[k].push_back(r.wall_s);
      err[k].push_back(
          r.status == PointStatus::kOk ? RelError(FromEdges(r.edges), FromEdges(ref.edges)) : NAN);
      std::printf(" [%g: %.3f s, err %.4f%%]", steps[k], r.wall_s, 100 * err[k].back());
    }
    std::printf("\n");
    std::fflush(stdout);
  }
  Result("ref_step", ref_step);
  for (size_t k = 0; k < steps.size(); ++k) {
    std::string key = "step" + std::to_string(k) + "_";
    double total = 0;
    for (double w : wall[k]) total += w;
    Result((key + "bound").c_str(), steps[k]);
    Result((key + "wall").c_str(), total);
    Result((key + "samples_per_period").c_str(),
           periods[k] > 0 ? double(samples[k]) / periods[k] : NAN);
    Result((key + "err_median").c_str(), Median(err[k]));
    Result((key + "err_max").c_str(), Max(err[k]));
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fprintf(
        stderr,
        "usage: %s SWEEP [--ref REF] [--tol TOL] [--stages] [--steps B1,B2,... [--ref-step R]]\n"
        "       [--reload R] [--first K] [--count N] [--ref-cache FILE]\n",
        argv[0]);
    return 2;
  }
  int ref = 1000;
  double tol = 0.005;
  bool stages = false;
  int reload_repeats = 0;
  std::vector<double> steps;
  double ref_step = 0.5e-9;
  size_t first = 0, count = SIZE_MAX;
  std::string ref_cache;
  for (int i = 2; i < argc; ++i) {
    if (!std::strcmp(argv[i], "--ref") && i + 1 < argc)
      ref = std::atoi(argv[++i]);
    else if (!std::strcmp(argv[i], "--tol") && i + 1 < argc)
      tol = std::atof(argv[++i]);
    else if (!std::strcmp(argv[i], "--stages"))
      stages = true;
    else if (!std::strcmp(argv[i], "--steps") && i + 1 < argc)
      for (char* at = argv[++i]; *at;) {
        steps.push_back(std::strtod(at, &at));
        if (*at == ',') ++at;
      }
    else if (!std::strcmp(argv[i], "--reload") && i + 1 < argc)
      reload_repeats = std::atoi(argv[++i]);
    else if (!std::strcmp(argv[i], "--ref-step") && i + 1 < argc)
      ref_step = std::atof(argv[++i]);
    else if (!std::strcmp(argv[i], "--first") && i + 1 < argc)
      first = std::strtoul(argv[++i], nullptr, 10);
    else if (!std::strcmp(argv[i], "--count") && i + 1 < argc)
      count = std::strtoul(argv[++i], nullptr, 10);
    else if (!std::strcmp(argv[i], "--ref-cache") && i + 1 < argc)
      ref_cache = argv[++i];
  }
  PreparedSweep s;
  std::vector<Diagnostic> errors;
  if (!PrepareSweep(argv[1], 0, &s, &errors)) {
    for (const auto& e : errors) std::fprintf(stderr, "%s\n", e.Format().c_str());
    return 1;
  }
  // --first/--count: a slice of the points (e.g. the slowest, with a longer reference).
  if (first > 0 || count < s.points.size()) {
    std::vector<Point> slice;
    for (size_t k = first; k < s.points.size() && k - first < count; ++k) {
      slice.push_back(s.points[k]);
    }
    s.points = slice;
  }
  if (stages) return RunStageBreakdown(s);
  if (reload_repeats > 0) return RunReloadComparison(s, reload_repeats);
  if (!steps.empty()) return RunStepComparison(s, steps, ref_step);
  NgspiceSimulator sim;
  const int measured = kReferenceMeasured;
  std::vector<PointRecord> recs;
  ChainMemory memory(ChainLinks(s.points, 0, InnermostIsDevice(s.spec)));
  // --ref-cache FILE: the references from FILE when it exists (same sweep,
  // same --ref: not checked), else computed and written to it.
  std::FILE* cached = ref_cache.empty() ? nullptr : std::fopen(ref_cache.c_str(), "r");
  for (size_t k = 0; k < s.points.size(); ++k) {
    const Point& p = s.points[k];
    recs.push_back(EvaluatePoint(s, p, sim, ref, tol, cached));
    EvaluateWarmStarted(s, p, k, sim, &memory, &recs.back());
    const PointRecord& r = recs.back();
    std::printf("point %zu %s: a %.3g periods %.3f s, b %.3g periods %.3f s, d %.3f s, settled at %d "
                "of %d, %s\n  a worst %.4f%% (%s)\n  b worst %.4f%% (%s)\n",
                p.index, p.Describe().c_str(), r.a_periods, r.a_wall, r.b_periods, r.b_wall,
                r.d_wall, r.settle_at, ref, r.ok && r.b_ok ? "ok" : "FAILED",
                100 * FindWorstError(r.a, r.ref).rel, FindWorstError(r.a, r.ref).Describe().c_str(),
                100 * FindWorstError(r.b, r.ref).rel, FindWorstError(r.b, r.ref).Describe().c_str());
    std::fflush(stdout);
  }
  if (cached) {
    std::fclose(cached);
  } else if (!ref_cache.empty()) {
    if (std::FILE* f = std::fopen(ref_cache.c_str(), "w")) {
      for (const auto& r : recs) WriteReference(f, r);
      std::fclose(f);
    }
  }
  // (c): the period count that settles every point, then its accuracy.
  int slowest = 0;
  for (const auto& r : recs) slowest = std::max(slowest, r.ok ? r.settle_at : 0);
  int n_c = std::max(1, std::min(ref, (slowest + 9) / 10 * 10));
  std::vector<double> a_wall, a_per, a_err, b_wall, b_per, b_err, c_wall, c_err, d_wall, d_err;
  std::vector<double> a_own, b_own;  // transition times relative to their own
  int failed = 0;
  for (size_t k = 0; k < recs.size(); ++k) {
    const PointRecord& r = recs[k];
    if (!r.ok) {
      ++failed;
      continue;
    }
    PointRunner run(s, s.points[k]);
    SimulationOutput out;
    auto t0 = Clock::now();
    PointValues c;
    if (run.Run(r.boundary[n_c - 1], measured, sim, &out)) c = run.Measure(out, measured);
    double c_measure = Since(t0);
    a_wall.push_back(r.a_wall);
    a_per.push_back(r.a_periods);
    a_err.push_back(RelError(r.a, r.ref));
    a_own.push_back(OwnRelError(r.a, r.ref));
    b_wall.push_back(r.b_wall);
    b_per.push_back(r.b_ok ? r.b_periods : NAN);
    b_err.push_back(r.b_ok ? RelError(r.b, r.ref) : NAN);
    b_own.push_back(r.b_ok ? OwnRelError(r.b, r.ref) : NAN);
    c_wall.push_back(r.ref_per_period * n_c + c_measure);
    c_err.push_back(RelError(c, r.ref));
    d_wall.push_back(r.d_wall);
    d_err.push_back(RelError(r.d, r.ref));
  }
  auto sum = [](const std::vector<double>& v) {
    double t = 0;
    for (double x : v) t += x;
    return t;
  };
  Result("points", double(recs.size()));
  Result("failed", failed);
  Result("ref_periods", ref);
  Result("tol", tol);
  Result("c_periods", n_c + measured);
  Result("c_settle", n_c);
  Result("slowest_settle", slowest);
  Result("a_wall", sum(a_wall));
  Result("a_periods_median", Median(a_per));
  Result("a_err_median", Median(a_err));
  Result("a_err_max", Max(a_err));
  Result("b_wall", sum(b_wall));
  Result("b_periods_median", Median(b_per));
  Result("b_periods_mean", Mean(b_per));
  Result("a_periods_mean", Mean(a_per));
  Result("a_err_own_max", Max(a_own));
  Result("b_err_own_max", Max(b_own));
  Result("b_err_median", Median(b_err));
  Result("b_err_max", Max(b_err));
  Result("c_wall", sum(c_wall));
  Result("c_err_median", Median(c_err));
  Result("c_err_max", Max(c_err));
  Result("d_wall", sum(d_wall));
  Result("d_err_median", Median(d_err));
  Result("d_err_max", Max(d_err));
  return 0;
}
