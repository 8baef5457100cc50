// Adaptive refinement of the ZVS boundary, as a sweep file asks for it
// (<refine param=... resolution=.../>) and as a run carried it out.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {

/// One refined axis: the axis's parameter and the spacing to refine down to.
struct RefineSpec {
  std::string param;       ///< a plain numeric <axis> of the sweep, as written
  double resolution = 0;   ///< > 0, in the axis's unit
  size_t group = 0;        ///< index of the axis's group in SweepSpec::groups (set by the check)
  int levels = 0;          ///< halvings of the coarse spacing to reach `resolution` (>= 1)
  double coarse_step = 0;  ///< the widest spacing of the coarse axis
  SourceLocation where;
};

/// How far a run's refinement got, for the reports (summary.xml, the CSV's
/// refine_round column comes from each Point).
struct RefinementOutcome {
  bool used = false;       ///< the sweep has <refine> elements
  int rounds_planned = 0;  ///< the most halvings any refined axis needs
  int rounds_run = 0;      ///< rounds whose points all have results (round 0 = the coarse grid)
  bool complete = false;   ///< no further round is needed
  std::string pending;     ///< why not complete (a round waits for other shards, ...)
  size_t fine_grid_points = 0;                ///< points of the full grid at the refined resolution
  std::vector<size_t> points_per_round = {};  ///< points added by each round
};

}  // namespace zvsmap
