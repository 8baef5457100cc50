// Adaptive refinement of the ZVS boundary (README "Adaptive refinement"):
// start from the coarse grid the axes give and subdivide only the cells whose
// corners disagree, round by round, until each refined axis reaches its
// <refine> resolution (cell subdivision as in adaptive mesh refinement,
// Berger & Oliger, J. Comput. Phys. 53, 1984).
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "result/point_result.h"
#include "sweep/point.h"
#include "sweep/refine_spec.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// The fine lattice a refined sweep lives on. Every point's Point::grid is a
/// position on it: a refined axis's coarse value k sits at k * 2^levels.
struct RefinementPlan {
  bool active = false;
  std::vector<int> levels;      ///< per axis group: halvings of its coarse spacing (0: none)
  std::vector<bool> spanning;   ///< per group: cells extend along it (numeric, > 1 value)
  int rounds = 0;               ///< the largest `levels`: rounds after round 0
  size_t fine_grid_points = 0;  ///< points of the whole fine lattice
};

/// Turns an expanded sweep into round 0 of its refinement when `spec` has
/// <refine> elements (else leaves everything alone and returns an inactive
/// plan): each refined axis's values become the fine lattice (each coarse
/// interval cut into 2^levels equal parts, so the coarse values stay
/// exact), and each point's grid position moves onto it, marked round 0.
RefinementPlan StartRefinement(SweepSpec* spec, std::vector<Point>* points);

/// What the next round needs.
struct RoundPlan {
  std::vector<Point> added;  ///< the round's new points, indices following `points`
  bool waiting = false;      ///< a point of an earlier round has no result yet
  std::string why_waiting;   ///< which round and how many points lack results
};

/// The points of round `round` (>= 1) from the points of the earlier rounds
/// and their results (index for index). Deterministic: the cells of round 0
/// are the coarse grid's; the cells of round r are the halves (along every
/// refined axis not yet at its resolution) of the round r - 1 cells whose
/// corners disagree; the round's points are its cells' corners not sampled
/// yet, in grid order. Corners disagree when, for some measured edge, the ZVS
/// class (full or not) or the sign of the criterion's margin
/// (v_residual_limit_v - v_turn_on_v) differs between two corners that ran;
/// corners that failed are left out of the comparison. A corner not run yet makes the round wait
/// (`waiting`). Fails (at the sweep's <limits>) when the round would bring the sweep beyond
/// `spec.max_points`, or a derived value cannot be evaluated.
bool PlanRound(const SweepSpec& spec, const RefinementPlan& plan, int round,
               const std::vector<Point>& points, const std::vector<PointResult>& results,
               RoundPlan* out, Diagnostic* error);

/// The summary of a refinement for the reports: rounds planned and run,
/// points per round, the fine lattice's size; `complete` and `pending` as the
/// caller found them.
RefinementOutcome DescribeRefinement(const RefinementPlan& plan, const std::vector<Point>& points,
                                     const std::vector<PointResult>& results, bool complete,
                                     const std::string& pending);

}  // namespace zvsmap
