// How often the convergence ladder's solver aids were needed, for the
// summary XML and the terminal summary (the ladder itself: run/solver_ladder.h).
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "result/point_result.h"

namespace zvsmap {

/// How many points ran with each aid: (aid name, points), in ladder order,
/// only aids that were used ("none" is not counted).
std::vector<std::pair<std::string, int>> CountSolverAids(const std::vector<PointResult>& results);

/// One line for the terminal, e.g. "3 of 9 points ran with a solver aid
/// (rshunt 2, gmin 1)" or "no point needed a solver aid".
std::string DescribeSolverAidUse(const std::vector<PointResult>& results);

}  // namespace zvsmap
