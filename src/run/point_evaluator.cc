#include "run/point_evaluator.h"

#include <algorithm>
#include <chrono>

#include "analysis/commutation.h"
#include "analysis/edge_finder.h"

namespace zvsmap {

const char* PointStatusName(PointStatus s) {
  switch (s) {
    case PointStatus::kOk: return "ok";
    case PointStatus::kFailed: return "failed";
    case PointStatus::kUnsettled: return "unsettled";
  }
  return "failed";
}

TranSettings PointEvaluator::TranFor(const Variables& resolved, double period_s) const {
  const SimulationSettings& sim = spec_.simulation;
  TranSettings tran;
  int measured = std::max(2, sim.measure_periods);
  tran.tstop_s = (sim.settle_periods + measured) * period_s;
  tran.tstart_s = sim.settle_periods * period_s;
  tran.reltol = sim.reltol;
  if (sim.max_step_s > 0) {
    tran.max_step_s = sim.max_step_s;
  } else {
    // Resolve the dead-time transition: a twentieth of the shortest declared
    // dead time, and never coarser than 1/500 of the period (common practice).
    double step = period_s / 500;
    for (const auto& cell : tmpl_.cells) {
      for (const auto* name : {&cell.high_dead, &cell.low_dead}) {
        auto it = resolved.find(*name);
        if (!name->empty() && it != resolved.end() && it->second > 0) {
          step = std::min(step, it->second / 20);
        }
      }
    }
    tran.max_step_s = step;
  }
  return tran;
}

bool PointEvaluator::Render(const Point& point, std::string* netlist, Diagnostic* error) const {
  Variables resolved;
  double period = 0;
  if (!ResolveParams(tmpl_, point.values, &resolved, error)) return false;
  if (!ResolvePeriod(tmpl_, resolved, &period, error)) return false;
  *netlist = RenderNetlist(tmpl_, resolved, TranFor(resolved, period), VectorsToSave(tmpl_));
  return true;
}

PointResult PointEvaluator::Evaluate(const Point& point, Simulator& simulator,
                                     Waveforms* settled) const {
  auto started = std::chrono::steady_clock::now();
  PointResult result;
  result.index = point.index;
  auto finish = [&]() {
    result.wall_s =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
    return result;
  };

  Variables resolved;
  double period = 0;
  Diagnostic error;
  if (!ResolveParams(tmpl_, point.values, &resolved, &error) ||
      !ResolvePeriod(tmpl_, resolved, &period, &error)) {
    result.reason = error.Format();
    return finish();
  }
  TranSettings tran = TranFor(resolved, period);
  std::string netlist = RenderNetlist(tmpl_, resolved, tran, VectorsToSave(tmpl_));
  SimulationOutput out = simulator.Run(netlist, VectorsToSave(tmpl_), tran.tstop_s);
  if (!out.ok) {
    result.reason = out.error;
    result.log = out.log;
    return finish();
  }
  result.settle.method = "periods";
  result.settle.periods = static_cast<int>(tran.tstop_s / period + 0.5);

  for (const auto& cell : tmpl_.cells) {
    std::vector<EdgeTiming> edges = FindEdges(cell, out.waves, 0.02 * period);
    for (const char* name : {"high_on", "low_on"}) {
      auto it = std::find_if(edges.begin(), edges.end(),
                             [&](const EdgeTiming& e) { return e.edge == name; });
      if (it == edges.end()) {
        result.edges.clear();
        result.reason = "edge '" + cell.name + "." + name +
                        "' not found in the measured periods (check the command signals)";
        result.log = out.log;
        return finish();
      }
      result.edges.push_back(MeasureEdge(cell, out.waves, *it, spec_.zvs));
    }
  }
  result.status = PointStatus::kOk;
  if (settled) *settled = std::move(out.waves);
  return finish();
}

}  // namespace zvsmap
