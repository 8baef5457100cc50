// Benchmark (not a test): each solver aid's effect on the reference cases.
// Every point of each sweep file runs once unaided (solver-aid="off") and once
// with each aid fixed; for each reference metric (the metrics the reference
// tests check against published formulas: kReferenceMetrics) of every
// measured edge it prints the largest change against the unaided run,
// relative to that metric's scale over the sweep's unaided points: its
// largest magnitude, and for energies at least the largest energy available
// or needed for ZVS at an edge (e_available_j, e_needed_j). So a value near
// zero (a ZVS edge's turn-on voltage) is judged against the metric's scale,
// not against itself; the switching energies of fully zero-voltage edges
// (numerical residue) are left out. First comes a noise probe (a node shunt
// of 1e15 Ohm, physically nothing): a value the probe alone moves by more than
// 0.5 % cannot resolve 0.5 % at these settings and is left out of the aids'
// rows (the probe's row says how many). An aid whose worst change exceeds
// 0.5 % must not be automatic (sim/solver_aids.cc, README "Solver aids"). Usage:
//   zvsmap_bench_aids SWEEP...
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <map>
#include <set>
#include <string>
#include <vector>

#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "sim/ngspice_simulator.h"
#include "sim/solver_aids.h"

using namespace zvsmap;

namespace {

using Values = std::map<std::string, double>;  // "point/cell.edge/metric" -> value

const char* const kReferenceMetrics[] = {"i_commutated_a", "v_turn_on_v",  "t_transition_s",
                                         "t_zvs_s",        "t_ringback_s", "e_on_j",
                                         "e_off_j",        "rail_v"};
constexpr double kLimitPercent = 0.5;  // issue 14: larger changes are not automatic
const char* const kEnergyScales[] = {"e_available_j", "e_needed_j"};

bool Kept(const std::string& column) {
  for (const char* m : kReferenceMetrics) {
    if (column == m) return true;
  }
  for (const char* m : kEnergyScales) {
    if (column == m) return true;
  }
  return false;
}

bool IsEnergyScale(const std::string& column) {
  return column == kEnergyScales[0] || column == kEnergyScales[1];
}

// Runs every point of `sweep` with `setting`; false when a point fails.
// `probe`, when not null, is added to every run (the noise probe below).
bool RunAll(Simulator& sim, PreparedSweep& sweep, const std::string& setting, Values* out,
            double* wall_s, std::string* why, const SolverAid* probe = nullptr) {
  sweep.spec.simulation.solver_aid = setting;
  PointEvaluator evaluator(sweep.spec, sweep.tmpl);
  AidedSimulator probed(sim, probe, sweep.spec.simulation.reltol);
  auto t0 = std::chrono::steady_clock::now();
  for (const Point& p : sweep.points) {
    PointResult r = evaluator.Evaluate(p, probed);
    if (r.status != PointStatus::kOk) {
      *why = "point " + std::to_string(p.index) + ": " + r.reason;
      return false;
    }
    for (const auto& e : r.edges) {
      for (const auto& m : e.metrics) {
        // A zero-voltage edge's switching energy is the residue of a
        // transition that has already ended: numerical noise, not a metric.
        bool residue = e.zvs == ZvsClass::kFull && (m.column == "e_on_j" || m.column == "e_off_j");
        if (Kept(m.column) && !residue && std::isfinite(m.value)) {
          (*out)[std::to_string(p.index) + "/" + e.cell + "." + e.edge + "/" + m.column] = m.value;
        }
      }
    }
  }
  *wall_s = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  return true;
}

std::string MetricOf(const std::string& key) { return key.substr(key.rfind('/') + 1); }

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fprintf(stderr, "usage: %s SWEEP...\n", argv[0]);
    return 2;
  }
  NgspiceSimulator sim;
  std::printf("%-28s %-14s %9s  %-44s %8s\n", "case", "aid", "worst %", "where", "wall s");
  for (int a = 1; a < argc; ++a) {
    PreparedSweep sweep;
    std::vector<Diagnostic> errors;
    if (!PrepareSweep(argv[a], 0, &sweep, &errors)) {
      std::fprintf(stderr, "%s\n", errors[0].Format().c_str());
      return 2;
    }
    std::string name = argv[a];
    name = name.substr(name.rfind('/') + 1);
    Values base;
    double base_wall = 0;
    std::string why;
    if (!RunAll(sim, sweep, "off", &base, &base_wall, &why)) {
      std::printf("%-28s %-14s unaided run failed: %s\n", name.c_str(), "off", why.c_str());
      continue;
    }
    std::map<std::string, double> scale;  // metric -> largest |value| unaided
    double energy = 0;                    // largest available or needed energy
    for (const auto& [key, v] : base) {
      double& s = scale[MetricOf(key)];
      s = std::max(s, std::fabs(v));
      if (IsEnergyScale(MetricOf(key))) energy = std::max(energy, std::fabs(v));
    }
    for (auto& [metric, s] : scale) {
      if (metric.size() > 2 && metric.compare(metric.size() - 2, 2, "_j") == 0) {
        s = std::max(s, energy);
      }
    }
    std::printf("%-28s %-14s %9s  %-44s %8.2f\n", name.c_str(), "off", "-", "", base_wall);
    // The noise probe: a 1e15 Ohm node shunt (0.4 pA at 400 V) changes the
    // circuit by nothing measurable but changes ngspice's time-step pattern;
    // what it moves is the metric's numerical noise at these settings.
    static const SolverAid kProbe = {"noise-probe", "", "rshunt=1e15", 1, false};
    std::vector<const SolverAid*> runs = {&kProbe};
    std::set<std::string> noisy;  // values the probe alone moves by more than the limit
    for (const SolverAid& aid : SolverAids()) runs.push_back(&aid);
    for (const SolverAid* run : runs) {
      const SolverAid& aid = *run;
      bool probe = run == &kProbe;
      Values with;
      double wall = 0;
      if (!RunAll(sim, sweep, probe ? "off" : aid.name, &with, &wall, &why,
                  probe ? &kProbe : nullptr)) {
        std::printf("%-28s %-14s failed: %s\n", name.c_str(), aid.name, why.c_str());
        continue;
      }
      double worst = 0;
      std::string where = "";
      for (const auto& [key, v] : base) {
        auto it = with.find(key);
        double sc = scale[MetricOf(key)];
        if (it == with.end() || sc <= 0 || IsEnergyScale(MetricOf(key))) continue;
        double d = 100 * std::fabs(it->second - v) / sc;
        if (probe) {
          if (d > kLimitPercent) noisy.insert(key);
        } else if (noisy.count(key) != 0) {
          continue;
        }
        if (d > worst) {
          worst = d;
          where = key;
        }
      }
      std::printf("%-28s %-14s %9.4f  %-44s %8.2f", name.c_str(), aid.name, worst, where.c_str(),
                  wall);
      if (probe && !noisy.empty()) {
        std::printf("  (%zu values above %.1f %%: left out below)", noisy.size(), kLimitPercent);
      }
      std::printf("\n");
      std::fflush(stdout);
    }
  }
  return 0;
}
