// Stage breakdown of a point (bench only). StagedSimulator runs each netlist
// through zvsmap's own NgspiceSimulator and reads its stage clocks
// (EngineTimings: load, run, copy the vectors, unload). ngspice's setup before the first time step
// is part of its "run" command; it is estimated per run by running the same netlist once more with
// tstop = one step bound (that extra run is timed apart and left out of the figures). Render is one
// PointEvaluator::Render timed per run, analysis is the edge finding and measuring plus the hand
// calculation on the settled waveforms, store is RunStore::SavePoint into a scratch store; "other"
// is what is left of the evaluation's wall time (settling algebra, parameter resolution).
#include "bench_stages.h"

#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <memory>
#include <sstream>
#include <string>
#include <vector>

#include "analysis/commutation.h"
#include "analysis/edge_finder.h"
#include "handcalc/hand_calculation.h"
#include "run/point_evaluator.h"
#include "sim/ngspice_simulator.h"
#include "store/run_store.h"

using namespace zvsmap;

namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

struct Stages {
  double load = 0, setup = 0, stepping = 0, copy = 0, unload = 0, extra = 0;
  int runs = 0;
  long samples = 0;
};

// zvsmap's own NgspiceSimulator, its stage clocks (EngineTimings) read after
// each run, plus one extra run per run to estimate the setup.
class StagedSimulator : public Simulator {
 public:
  Stages stages;

  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>& vectors,
                       double tstop_s) override {
    EngineTimings before = engine_.timings();
    SimulationOutput out = engine_.Run(netlist, vectors, tstop_s);
    EngineTimings after = engine_.timings();
    ++stages.runs;
    stages.samples += after.samples - before.samples;
    stages.load += after.load_s - before.load_s;
    stages.copy += after.copy_s - before.copy_s;
    stages.unload += after.unload_s - before.unload_s;
    double run_s = after.run_s - before.run_s;
    // Setup estimate: the same circuit with tstop at its first step bound.
    auto t0 = Clock::now();
    double step = 0;
    std::string shortened = Shortened(netlist, &step);
    engine_.Run(shortened, {}, step);
    double setup = std::min(engine_.timings().run_s - after.run_s, run_s);
    stages.extra += Since(t0);
    stages.setup += setup;
    stages.stepping += run_s - setup;
    return out;
  }

 private:
  NgspiceSimulator engine_;

  static std::string Shortened(const std::string& netlist, double* step_s) {
    std::istringstream in(netlist);
    std::string line, text;
    while (std::getline(in, line)) {
      if (line.compare(0, 6, ".tran ") == 0) {
        std::string step = line.substr(6, line.find(' ', 6) - 6);
        *step_s = std::atof(step.c_str());
        line = ".tran " + step + " " + step + " 0 " + step + " uic";
      }
      text += line + "\n";
    }
    return text;
  }
};

}  // namespace

int RunStageBreakdown(const PreparedSweep& s) {
  StagedSimulator sim;
  PointEvaluator ev(s.spec, s.tmpl);
  std::string error;
  std::string path = "/tmp/zvsmap-bench-stages-" + std::to_string(::getpid()) + ".db";
  std::unique_ptr<RunStore> store = RunStore::Open(path, &error);
  double wall = 0, render = 0, analysis = 0, save = 0;
  int ok = 0;
  for (const Point& p : s.points) {
    Stages before = sim.stages;
    Waveforms waves;
    PointResult r = ev.Evaluate(p, sim, &waves);
    int runs = sim.stages.runs - before.runs;
    wall += r.wall_s - (sim.stages.extra - before.extra);
    auto t0 = Clock::now();
    std::string netlist;
    Diagnostic d;
    ev.Render(p, &netlist, &d);
    render += Since(t0) * runs;
    if (r.status != PointStatus::kOk) {
      std::printf("point %zu: %s\n", p.index, r.reason.c_str());
      continue;
    }
    ++ok;
    t0 = Clock::now();
    Variables resolved;
    double period = 0;
    ResolveParams(s.tmpl, p.values, &resolved, &d);
    ResolvePeriod(s.tmpl, resolved, &period, &d);
    std::vector<EdgeMeasurement> edges;
    for (const auto& cell : s.tmpl.cells) {
      for (const auto& e : FindEdges(cell, waves, 0.02 * period)) {
        edges.push_back(MeasureEdge(cell, waves, e, s.spec.zvs, EdgeParamsFor(cell, resolved)));
      }
    }
    AddPredictionMetrics(s.spec, s.tmpl, resolved, &edges, &d);
    analysis += Since(t0);
    t0 = Clock::now();
    if (store) store->SavePoint(p, "bench", r, &error);
    save += Since(t0);
    std::printf("point %zu: %d runs, %.3f s\n", p.index, runs,
                r.wall_s - (sim.stages.extra - before.extra));
  }
  store.reset();
  std::remove(path.c_str());
  const Stages& st = sim.stages;
  // The evaluation's wall time holds render, ngspice and analysis; store is
  // outside it (zvsmap's supervisor saves after the worker returns).
  double total = wall + save;
  // The stages are timed one by one inside the evaluation's span, so their sum
  // can exceed it by clock granularity: a remainder below zero is noise.
  double other = std::max(
      0.0, wall - render - st.load - st.setup - st.stepping - st.copy - st.unload - analysis);
  auto frac = [&](const char* name, double v) {
    std::printf("RESULT stage_%s %.4f\n", name, v / total);
  };
  std::printf("RESULT stage_points %d\nRESULT stage_runs %d\nRESULT stage_total_s %.4f\n", ok,
              st.runs, total);
  std::printf("RESULT stage_samples_per_run %.1f\n", st.runs ? double(st.samples) / st.runs : 0.0);
  frac("render", render);
  frac("load", st.load);
  frac("setup", st.setup);
  frac("stepping", st.stepping);
  frac("copy", st.copy);
  frac("unload", st.unload);
  frac("analysis", analysis);
  frac("store", save);
  frac("other", other);
  return 0;
}
