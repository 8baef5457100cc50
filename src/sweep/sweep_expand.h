// Expansion of a SweepSpec into its operating points.
#pragma once

#include <cstddef>
#include <vector>

#include "core/diagnostic.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Expands the crossed grid (first group slowest), lockstep groups advancing
/// together, fixed values first in each point, derived values evaluated last.
/// Each point carries its grid position (Point::grid, one index per group).
/// Fails (with the derived value's location) when an expression cannot be
/// evaluated, or when the grid exceeds `spec.max_points`.
bool ExpandSweep(const SweepSpec& spec, std::vector<Point>* points, Diagnostic* error);

}  // namespace zvsmap

namespace zvsmap {

/// One point of the grid: the value at position `digit[g]` of every group g
/// (fixed values first, derived values evaluated last), with `index` as its
/// index. Fails (with the derived value's location) when an expression cannot
/// be evaluated. ExpandSweep calls it for every position; adaptive refinement
/// for the positions it adds.
bool ExpandPointAt(const SweepSpec& spec, const std::vector<size_t>& digit, size_t index,
                   Point* point, Diagnostic* error);

}  // namespace zvsmap
