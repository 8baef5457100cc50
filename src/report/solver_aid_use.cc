#include "report/solver_aid_use.h"

#include "sim/solver_aids.h"

namespace zvsmap {

std::vector<std::pair<std::string, int>> CountSolverAids(const std::vector<PointResult>& results) {
  std::vector<std::pair<std::string, int>> counts;
  for (const SolverAid& aid : SolverAids()) {
    int n = 0;
    for (const PointResult& r : results) n += r.solver_aid == aid.name ? 1 : 0;
    if (n > 0) counts.emplace_back(aid.name, n);
  }
  return counts;
}

std::string DescribeSolverAidUse(const std::vector<PointResult>& results) {
  std::vector<std::pair<std::string, int>> counts = CountSolverAids(results);
  if (counts.empty()) return "no point needed a solver aid";
  int total = 0;
  std::string list;
  for (const auto& [name, n] : counts) {
    total += n;
    list += (list.empty() ? "" : ", ") + name + " " + std::to_string(n);
  }
  return std::to_string(total) + " of " + std::to_string(results.size()) +
         " points ran with a solver aid (" + list + ")";
}

}  // namespace zvsmap
