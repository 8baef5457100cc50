// Stage breakdown of a point (bench only; the production pipeline is not
// instrumented). StagedSimulator runs a netlist in libngspice the way
// NgspiceSimulator does (load, run, copy the vectors, unload) with a clock
// around each step. ngspice's setup before the first time step is part of its
// "run" command; it is estimated per run by running the same netlist once
// more with tstop = one step bound (that extra run is timed apart and left out
// of the figures). Render is one PointEvaluator::Render timed per run,
// analysis is the edge finding and measuring plus the hand calculation on the
// settled waveforms, store is RunStore::SavePoint into a scratch store;
// "other" is what is left of the evaluation's wall time (settling algebra,
// parameter resolution).
#include "bench_stages.h"

#include <ngspice/sharedspice.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <memory>
#include <sstream>
#include <string>
#include <vector>

#include "analysis/commutation.h"
#include "analysis/edge_finder.h"
#include "handcalc/hand_calculation.h"
#include "run/point_evaluator.h"
#include "sim/simulator.h"
#include "store/run_store.h"

using namespace zvsmap;

namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

int Quiet(char*, int, void*) { return 0; }
int QuietExit(int, NG_BOOL, NG_BOOL, int, void*) { return 0; }
void Command(const char* c) { ngSpice_Command(const_cast<char*>(c)); }

struct Stages {
  double load = 0, setup = 0, stepping = 0, copy = 0, unload = 0, extra = 0;
  int runs = 0;
};

class StagedSimulator : public Simulator {
 public:
  StagedSimulator() { ngSpice_Init(Quiet, Quiet, QuietExit, nullptr, nullptr, nullptr, nullptr); }
  Stages stages;

  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>& vectors,
                       double tstop_s) override {
    SimulationOutput out;
    ++stages.runs;
    double run_s = 0;
    Once(netlist, vectors, &out, &stages.load, &run_s, &stages.copy, &stages.unload);
    // Setup estimate: the same circuit with tstop at its first step bound.
    auto t0 = Clock::now();
    double setup = 0, ignored = 0;
    SimulationOutput tiny;
    Once(Shortened(netlist), {}, &tiny, &ignored, &setup, &ignored, &ignored);
    stages.extra += Since(t0);
    setup = std::min(setup, run_s);
    stages.setup += setup;
    stages.stepping += run_s - setup;
    const auto& t = out.waves.time();
    out.ok = !t.empty() && t.back() >= tstop_s * (1 - 1e-9);
    if (!out.ok) out.error = "engine error (bench simulator)";
    return out;
  }

 private:
  static std::string Shortened(const std::string& netlist) {
    std::istringstream in(netlist);
    std::string line, text;
    while (std::getline(in, line)) {
      if (line.compare(0, 6, ".tran ") == 0) {
        std::string step = line.substr(6, line.find(' ', 6) - 6);
        line = ".tran " + step + " " + step + " 0 " + step + " uic";
      }
      text += line + "\n";
    }
    return text;
  }

  static void Once(const std::string& netlist, const std::vector<std::string>& vectors,
                   SimulationOutput* out, double* load, double* run, double* copy, double* unload) {
    auto t0 = Clock::now();
    std::vector<std::string> lines;
    std::istringstream in(netlist);
    for (std::string line; std::getline(in, line);) lines.push_back(line);
    std::vector<char*> ptrs;
    for (auto& l : lines) ptrs.push_back(&l[0]);
    ptrs.push_back(nullptr);
    ngSpice_Circ(ptrs.data());
    *load += Since(t0);
    t0 = Clock::now();
    Command("run");
    *run += Since(t0);
    t0 = Clock::now();
    auto get = [](const std::string& name) {
      std::vector<double> v;
      pvector_info info = ngGet_Vec_Info(const_cast<char*>(name.c_str()));
      if (info && info->v_realdata) v.assign(info->v_realdata, info->v_realdata + info->v_length);
      return v;
    };
    out->waves.SetTime(get("time"));
    for (const auto& name : vectors) {
      std::vector<double> v = get(name);
      if (v.size() == out->waves.time().size()) out->waves.Set(name, std::move(v));
    }
    *copy += Since(t0);
    t0 = Clock::now();
    Command("remcirc");
    Command("destroy all");
    *unload += Since(t0);
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
