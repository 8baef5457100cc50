// Reloading a point's circuit per shooting run versus loading it once and
// changing only the slow states' initial conditions (bench only; issue 16
// item 2). For each point: the same one-period runs from a few start states
// (the template's own, and the states nudged by +-1 % of the valley current /
// output voltage scale), (A) rendered and run through NgspiceSimulator as
// zvsmap does (load, run, copy, unload per run), (B) loaded once and re-run
// with ngspice's `alter <element> ic=<value>` and a `tran` command on the
// loaded circuit (plots destroyed after each run). Prints the time per run of
// each and the largest difference of the state vectors between A and B.
#include "bench_reload.h"

#include <ngspice/sharedspice.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>
#include <vector>

#include "netlist/render.h"
#include "run/point_evaluator.h"
#include "sim/ngspice_simulator.h"
#include "sim/steady_state.h"

using namespace zvsmap;

namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}
std::string Exact(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.17g", v);
  return buf;
}
void Command(const std::string& c) { ngSpice_Command(const_cast<char*>(c.c_str())); }

// The element whose `ic=` is `{param}` in the rendered netlist (e.g. "l1" for il0).
std::string ElementWithIc(const std::string& netlist, const std::string& param) {
  std::istringstream in(netlist);
  for (std::string line; std::getline(in, line);) {
    std::string lower = line;
    std::transform(lower.begin(), lower.end(), lower.begin(), ::tolower);
    if (lower.find("ic={" + param + "}") != std::string::npos)
      return lower.substr(0, lower.find(' '));
  }
  return "";
}

std::vector<double> Copy(const std::string& name) {
  pvector_info info = ngGet_Vec_Info(const_cast<char*>(name.c_str()));
  if (info == nullptr || info->v_realdata == nullptr) return {};
  return std::vector<double>(info->v_realdata, info->v_realdata + info->v_length);
}

void Load(const std::string& netlist) {
  std::vector<std::string> lines;
  std::istringstream in(netlist);
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  std::vector<char*> pointers;
  for (auto& l : lines) pointers.push_back(&l[0]);
  pointers.push_back(nullptr);
  ngSpice_Circ(pointers.data());
}

// One point's one-period runs: its values, the run settings and the start states.
struct PointRuns {
  const Template& tmpl;
  std::vector<std::string> vectors;
  Variables base;
  TranSettings tran;
  std::vector<std::vector<double>> starts;

  std::string Render(const std::vector<double>& x) const {
    Variables r = base;
    for (size_t i = 0; i < x.size(); ++i) r[tmpl.states[i].init_param] = x[i];
    return RenderNetlist(tmpl, r, tran, vectors);
  }
};

// The slow states' waveforms of each start's run, for the first repeat.
using StateWaves = std::vector<std::vector<std::vector<double>>>;

// (A) as zvsmap does: every run rendered, loaded, run, copied and unloaded.
StateWaves RunReloaded(NgspiceSimulator& sim, const PointRuns& pr, int repeats, double* wall) {
  StateWaves a;
  auto t0 = Clock::now();
  for (int k = 0; k < repeats; ++k) {
    for (const auto& x : pr.starts) {
      SimulationOutput out = sim.Run(pr.Render(x), pr.vectors, pr.tran.tstop_s);
      if (k > 0) continue;
      a.emplace_back();
      for (const auto& st : pr.tmpl.states) a.back().push_back(out.waves.Get(st.vector));
    }
  }
  *wall = Since(t0);
  return a;
}

// (B) loaded once; each run sets the initial conditions with `alter` and runs
// `tran` on the loaded circuit (it copies only the slow states).
StateWaves RunAltered(const PointRuns& pr, int repeats, double* wall) {
  std::string first = pr.Render(pr.starts[0]);
  std::vector<std::string> elements;
  for (const auto& st : pr.tmpl.states) elements.push_back(ElementWithIc(first, st.init_param));
  std::string tran_command = "tran " + Exact(pr.tran.max_step_s) + " " + Exact(pr.tran.tstop_s) +
                             " 0 " + Exact(pr.tran.max_step_s) + " uic";
  StateWaves b;
  auto t0 = Clock::now();
  Load(first);
  for (int k = 0; k < repeats; ++k) {
    for (const auto& x : pr.starts) {
      for (size_t i = 0; i < x.size(); ++i) Command("alter " + elements[i] + " ic=" + Exact(x[i]));
      Command(tran_command);
      if (k == 0) {
        b.emplace_back();
        for (const auto& st : pr.tmpl.states) b.back().push_back(Copy(st.vector));
      }
      Command("destroy all");
    }
  }
  Command("remcirc");
  *wall = Since(t0);
  return b;
}

// The largest end-of-run state difference; `*same` whether all are bit-equal.
double Compare(const StateWaves& a, const StateWaves& b, bool* same) {
  double diff = 0;
  *same = a.size() == b.size();
  for (size_t r = 0; r < a.size() && r < b.size(); ++r) {
    for (size_t i = 0; i < a[r].size(); ++i) {
      *same = *same && a[r][i] == b[r][i];
      if (a[r][i].empty() || b[r][i].empty()) continue;
      diff = std::max(diff, std::fabs(a[r][i].back() - b[r][i].back()));
    }
  }
  return diff;
}

}  // namespace

int RunReloadComparison(const PreparedSweep& s, int repeats) {
  NgspiceSimulator sim;
  PointEvaluator ev(s.spec, s.tmpl);
  double total_a = 0, total_b = 0, worst = 0;
  int runs = 0, identical = 0;
  for (const Point& p : s.points) {
    PointRuns pr{s.tmpl, VectorsToSave(s.tmpl), {}, {}, std::vector<std::vector<double>>(3)};
    Diagnostic d;
    double period = 0;
    if (!ResolveParams(s.tmpl, p.values, &pr.base, &d) ||
        !ResolvePeriod(s.tmpl, pr.base, &period, &d)) {
      continue;
    }
    pr.tran = ev.TranFor(pr.base, period);
    pr.tran.tstart_s = 0;
    pr.tran.tstop_s = (1 + kPeriodOverrun) * period;
    for (const auto& st : s.tmpl.states) {
      double x = pr.base.at(st.init_param), scale = std::max(std::fabs(x), 1.0);
      pr.starts[0].push_back(x);
      pr.starts[1].push_back(x + 0.01 * scale);
      pr.starts[2].push_back(x - 0.01 * scale);
    }
    double wall_a = 0, wall_b = 0;
    StateWaves a = RunReloaded(sim, pr, repeats, &wall_a);
    StateWaves b = RunAltered(pr, repeats, &wall_b);
    bool same = false;
    double diff = Compare(a, b, &same);
    int n = repeats * static_cast<int>(pr.starts.size());
    std::printf("point %zu: reload %.2f ms/run, alter+tran %.2f ms/run, %s, end-state diff %.3g\n",
                p.index, 1e3 * wall_a / n, 1e3 * wall_b / n, same ? "identical" : "different",
                diff);
    std::fflush(stdout);
    total_a += wall_a;
    total_b += wall_b;
    runs += n;
    identical += same;
    worst = std::max(worst, diff);
  }
  std::printf("RESULT reload_ms_per_run %.3f\nRESULT alter_ms_per_run %.3f\n", 1e3 * total_a / runs,
              1e3 * total_b / runs);
  std::printf("RESULT identical_points %d\nRESULT worst_end_state_diff %.4g\n", identical, worst);
  return 0;
}
