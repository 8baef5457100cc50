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
    if (lower.find("ic={" + param + "}") != std::string::npos) return lower.substr(0, lower.find(' '));
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

}  // namespace

int RunReloadComparison(const PreparedSweep& s, int repeats) {
  NgspiceSimulator sim;
  PointEvaluator ev(s.spec, s.tmpl);
  const std::vector<std::string> vectors = VectorsToSave(s.tmpl);
  double total_a = 0, total_b = 0, worst = 0;
  int runs = 0, identical = 0;
  for (const Point& p : s.points) {
    Variables base;
    Diagnostic d;
    double period = 0;
    if (!ResolveParams(s.tmpl, p.values, &base, &d) || !ResolvePeriod(s.tmpl, base, &period, &d)) {
      continue;
    }
    TranSettings tran = ev.TranFor(base, period);
    tran.tstart_s = 0;
    tran.tstop_s = (1 + kPeriodOverrun) * period;
    std::vector<std::vector<double>> starts(3);
    for (const auto& st : s.tmpl.states) {
      double x = base.at(st.init_param), scale = std::max(std::fabs(x), 1.0);
      starts[0].push_back(x);
      starts[1].push_back(x + 0.01 * scale);
      starts[2].push_back(x - 0.01 * scale);
    }
    auto render = [&](const std::vector<double>& x) {
      Variables r = base;
      for (size_t i = 0; i < x.size(); ++i) r[s.tmpl.states[i].init_param] = x[i];
      return RenderNetlist(s.tmpl, r, tran, vectors);
    };
    // (A) as zvsmap does.
    std::vector<std::vector<std::vector<double>>> a;
    auto t0 = Clock::now();
    for (int k = 0; k < repeats; ++k) {
      for (const auto& x : starts) {
        SimulationOutput out = sim.Run(render(x), vectors, tran.tstop_s);
        if (k == 0) {
          a.emplace_back();
          for (const auto& st : s.tmpl.states) a.back().push_back(out.waves.Get(st.vector));
        }
      }
    }
    double wall_a = Since(t0);
    // (B) load once, alter the initial conditions, tran again.
    std::string first = render(starts[0]);
    std::vector<std::string> elements;
    for (const auto& st : s.tmpl.states) elements.push_back(ElementWithIc(first, st.init_param));
    std::string tran_command = "tran " + Exact(tran.max_step_s) + " " +
                               Exact(tran.tstop_s) + " 0 " + Exact(tran.max_step_s) +
                               " uic";
    t0 = Clock::now();
    Load(first);
    std::vector<std::vector<std::vector<double>>> b;
    for (int k = 0; k < repeats; ++k) {
      for (const auto& x : starts) {
        for (size_t i = 0; i < x.size(); ++i) {
          Command("alter " + elements[i] + " ic=" + Exact(x[i]));
        }
        Command(tran_command);
        if (k == 0) {
          b.emplace_back();
          for (const auto& st : s.tmpl.states) b.back().push_back(Copy(st.vector));
        }
        Command("destroy all");
      }
    }
    Command("remcirc");
    double wall_b = Since(t0);
    double diff = 0;
    bool same = true;
    for (size_t r = 0; r < a.size(); ++r) {
      for (size_t i = 0; i < a[r].size(); ++i) {
        same = same && a[r][i] == b[r][i];
        if (a[r][i].empty() || b[r][i].empty()) continue;
        diff = std::max(diff, std::fabs(a[r][i].back() - b[r][i].back()));
      }
    }
    int n = repeats * static_cast<int>(starts.size());
    std::printf("point %zu: reload %.2f ms/run, alter+tran %.2f ms/run, %s, end-state diff %.3g\n",
                p.index, 1e3 * wall_a / n, 1e3 * wall_b / n, same ? "identical" : "different", diff);
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
