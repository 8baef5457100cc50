#include "run/refinement.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>

#include "report/zvs_boundary.h"  // MeasuredEdges, FindEdge
#include "sweep/sweep_expand.h"

namespace zvsmap {

namespace {

using Coords = std::vector<int>;

// A cell's extent along group d at `level`, in fine positions (0: the cell
// lies in one value of d).
int Span(const RefinementPlan& plan, size_t d, int level) {
  if (!plan.spanning[d]) return 0;
  int levels = plan.levels[d];
  return 1 << (levels - std::min(level, levels));
}

// The fine-lattice sizes of the groups.
std::vector<int> Sizes(const SweepSpec& spec) {
  std::vector<int> sizes;
  for (const AxisGroup& g : spec.groups) sizes.push_back(static_cast<int>(g.size()));
  return sizes;
}

// Every combination of per-dimension choices (mixed radix, last fastest).
template <typename Visit>
void ForEachCombination(const std::vector<std::vector<int>>& choices, Visit visit) {
  for (const auto& c : choices) {
    if (c.empty()) return;
  }
  std::vector<size_t> digit(choices.size(), 0);
  Coords coords(choices.size());
  for (;;) {
    for (size_t d = 0; d < choices.size(); ++d) coords[d] = choices[d][digit[d]];
    visit(coords);
    size_t d = choices.size();
    while (d > 0) {
      --d;
      if (++digit[d] < choices[d].size()) break;
      digit[d] = 0;
      if (d == 0) return;
    }
    if (choices.empty()) return;
  }
}

// The corners of the cell with lower corner `lower` at `level`.
std::vector<Coords> Corners(const RefinementPlan& plan, const Coords& lower, int level) {
  std::vector<std::vector<int>> choices(lower.size());
  for (size_t d = 0; d < lower.size(); ++d) {
    int s = Span(plan, d, level);
    choices[d] = s > 0 ? std::vector<int>{lower[d], lower[d] + s} : std::vector<int>{lower[d]};
  }
  std::vector<Coords> out;
  ForEachCombination(choices, [&](const Coords& c) { out.push_back(c); });
  return out;
}

// The coarse grid's cells (round 0): lower corners along each spanning
// group, every value of the others.
std::vector<Coords> CoarseCells(const RefinementPlan& plan, const std::vector<int>& sizes) {
  std::vector<std::vector<int>> choices(sizes.size());
  for (size_t d = 0; d < sizes.size(); ++d) {
    int s = Span(plan, d, 0);
    if (s == 0) {
      for (int k = 0; k < sizes[d]; ++k) choices[d].push_back(k);
    } else {
      for (int k = 0; k + s < sizes[d]; k += s) choices[d].push_back(k);
    }
  }
  std::vector<Coords> out;
  ForEachCombination(choices, [&](const Coords& c) { out.push_back(c); });
  return out;
}

// The halves of a cell of `level - 1` at `level` (none when no group halves).
std::vector<Coords> Children(const RefinementPlan& plan, const Coords& lower, int level) {
  std::vector<std::vector<int>> choices(lower.size());
  bool halves = false;
  for (size_t d = 0; d < lower.size(); ++d) {
    int before = Span(plan, d, level - 1), after = Span(plan, d, level);
    if (after < before) {
      choices[d] = {lower[d], lower[d] + after};
      halves = true;
    } else {
      choices[d] = {lower[d]};
    }
  }
  std::vector<Coords> out;
  if (halves) ForEachCombination(choices, [&](const Coords& c) { out.push_back(c); });
  return out;
}

// The margin of the ZVS criterion itself: the residual-voltage limit minus the
// turn-on voltage (>= 0: full ZVS). Not the energy margin the reports may
// choose: its zero (ZVS reachable at some dead time) is another curve than the
// class boundary, and refining it as well costs points the reported
// boundaries do not use (README "Adaptive refinement").
double CriterionMargin(const EdgeMeasurement& e) {
  return e.Get("v_residual_limit_v") - e.Get("v_turn_on_v");
}

// What the corners of a cell say about one edge: classes and margin signs seen.
struct Seen {
  bool full = false, not_full = false, positive = false, negative = false;
  bool Disagree() const { return (full && not_full) || (positive && negative); }
};

}  // namespace

RefinementPlan StartRefinement(SweepSpec* spec, std::vector<Point>* points) {
  RefinementPlan plan;
  if (spec->refine.empty()) return plan;
  plan.active = true;
  plan.levels.assign(spec->groups.size(), 0);
  for (size_t g = 0; g < spec->groups.size(); ++g) {
    const AxisSpec& a = spec->groups[g].axes.front();
    plan.spanning.push_back(a.device_roles.empty() && spec->groups[g].size() > 1);
  }
  for (const RefineSpec& r : spec->refine) {
    plan.levels[r.group] = r.levels;
    plan.rounds = std::max(plan.rounds, r.levels);
    std::vector<double>& values = spec->groups[r.group].axes.front().values;
    std::vector<double> fine;
    int parts = 1 << r.levels;
    for (size_t k = 0; k + 1 < values.size(); ++k) {
      for (int j = 0; j < parts; ++j) {
        fine.push_back(j == 0 ? values[k] : values[k] + (values[k + 1] - values[k]) * j / parts);
      }
    }
    fine.push_back(values.back());
    values = std::move(fine);
  }
  plan.fine_grid_points = 1;
  for (const AxisGroup& g : spec->groups) plan.fine_grid_points *= g.size();
  for (Point& p : *points) {
    for (size_t g = 0; g < p.grid.size() && g < plan.levels.size(); ++g) {
      p.grid[g] <<= plan.levels[g];
    }
    p.refine_round = 0;
  }
  return plan;
}

bool PlanRound(const SweepSpec& spec, const RefinementPlan& plan, int round,
               const std::vector<Point>& points, const std::vector<PointResult>& results,
               RoundPlan* out, Diagnostic* error) {
  *out = RoundPlan();
  std::map<Coords, size_t> at;
  for (size_t i = 0; i < points.size(); ++i) at.emplace(points[i].grid, i);
  std::vector<EdgeKey> edges = MeasuredEdges(results);

  // A cell of `level` whose corners disagree; `missing` counts corners not run.
  size_t missing = 0;
  auto disagrees = [&](const Coords& lower, int level) {
    std::vector<Seen> seen(edges.size());
    for (const Coords& c : Corners(plan, lower, level)) {
      auto found = at.find(c);
      if (found == at.end() || found->second >= results.size() ||
          results[found->second].status == PointStatus::kNotRun) {
        ++missing;
        continue;
      }
      const PointResult& r = results[found->second];
      if (r.status != PointStatus::kOk) continue;  // failed corners are left out
      for (size_t k = 0; k < edges.size(); ++k) {
        const EdgeMeasurement* e = FindEdge(r, edges[k]);
        if (!e || e->zvs == ZvsClass::kUnknown) continue;
        (e->zvs == ZvsClass::kFull ? seen[k].full : seen[k].not_full) = true;
        double m = CriterionMargin(*e);
        if (std::isfinite(m)) (m >= 0 ? seen[k].positive : seen[k].negative) = true;
      }
    }
    return std::any_of(seen.begin(), seen.end(), [](const Seen& s) { return s.Disagree(); });
  };

  std::vector<Coords> cells = CoarseCells(plan, Sizes(spec));
  for (int level = 1; level <= round && !cells.empty(); ++level) {
    std::vector<Coords> next;
    for (const Coords& cell : cells) {
      if (!disagrees(cell, level - 1)) continue;
      for (Coords& child : Children(plan, cell, level)) next.push_back(std::move(child));
    }
    if (missing > 0) {
      out->waiting = true;
      out->why_waiting = "round " + std::to_string(round) + " needs the results of round " +
                         std::to_string(level - 1) + ", and " + std::to_string(missing) +
                         " of its cell corners have none yet";
      return true;
    }
    cells = std::move(next);
  }
  if (round < 1) cells.clear();
  std::set<Coords> fresh;
  for (const Coords& cell : cells) {
    for (const Coords& c : Corners(plan, cell, round)) {
      if (at.find(c) == at.end()) fresh.insert(c);
    }
  }
  if (points.size() + fresh.size() > spec.max_points) {
    error->where = spec.limits_where;
    if (error->where.file.empty()) error->where.file = spec.path;
    error->message = "refinement round " + std::to_string(round) + " would bring the sweep to " +
                     std::to_string(points.size() + fresh.size()) +
                     " points, more than the limit of " + std::to_string(spec.max_points) +
                     " (raise <limits max-points>, use --max-points or coarsen a <refine> "
                     "resolution)";
    error->source_line.clear();
    return false;
  }
  for (const Coords& c : fresh) {
    std::vector<size_t> digit(c.begin(), c.end());
    Point p;
    if (!ExpandPointAt(spec, digit, points.size() + out->added.size(), &p, error)) return false;
    p.refine_round = round;
    out->added.push_back(std::move(p));
  }
  return true;
}

RefinementOutcome DescribeRefinement(const RefinementPlan& plan, const std::vector<Point>& points,
                                     const std::vector<PointResult>& results, bool complete,
                                     const std::string& pending) {
  RefinementOutcome o;
  o.used = plan.active;
  if (!plan.active) return o;
  o.rounds_planned = plan.rounds;
  o.fine_grid_points = plan.fine_grid_points;
  o.complete = complete;
  o.pending = pending;
  std::vector<bool> has_missing;
  for (size_t i = 0; i < points.size(); ++i) {
    size_t r = static_cast<size_t>(std::max(0, points[i].refine_round));
    if (o.points_per_round.size() <= r) {
      o.points_per_round.resize(r + 1, 0);
      has_missing.resize(r + 1, false);
    }
    ++o.points_per_round[r];
    if (i >= results.size() || results[i].status == PointStatus::kNotRun) has_missing[r] = true;
  }
  while (o.rounds_run < static_cast<int>(has_missing.size()) && !has_missing[o.rounds_run]) {
    ++o.rounds_run;
  }
  return o;
}

}  // namespace zvsmap
