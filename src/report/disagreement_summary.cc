#include "report/disagreement_summary.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>

namespace zvsmap {

namespace {

struct Pair {
  std::string label;  // "leg.high_on t_transition_s__pred"
  double worst = 0;   // signed relative difference with the largest magnitude
  size_t worst_point = 0;
  std::string worst_where;
  size_t compared = 0, beyond = 0;
  bool any = false;
};

}  // namespace

std::vector<std::string> DisagreementSummary(const std::vector<Point>& points,
                                             const std::vector<PointResult>& results,
                                             size_t max_pairs) {
  std::map<std::string, Pair> pairs;
  std::vector<std::string> order;
  for (size_t i = 0; i < results.size() && i < points.size(); ++i) {
    for (const EdgeMeasurement& e : results[i].edges) {
      for (const Comparison& c : e.comparisons) {
        if (!c.Paired()) continue;
        std::string label = e.cell + "." + e.edge + " " + c.Name();
        auto inserted = pairs.emplace(label, Pair());
        if (inserted.second) order.push_back(label);
        Pair& p = inserted.first->second;
        p.label = label;
        if (c.beyond_tolerance) {
          ++p.compared;
          if (*c.beyond_tolerance) ++p.beyond;
        }
        if (std::isnan(c.relative_difference)) continue;
        if (!p.any || std::fabs(c.relative_difference) > std::fabs(p.worst)) {
          p.any = true;
          p.worst = c.relative_difference;
          p.worst_point = points[i].index;
          p.worst_where = points[i].Describe();
        }
      }
    }
  }
  std::vector<const Pair*> ranked;
  for (const std::string& label : order) ranked.push_back(&pairs[label]);
  if (ranked.empty()) return {};
  std::stable_sort(ranked.begin(), ranked.end(), [](const Pair* a, const Pair* b) {
    return (a->any ? std::fabs(a->worst) : -1.0) > (b->any ? std::fabs(b->worst) : -1.0);
  });
  std::vector<std::string> lines;
  lines.push_back("hand calculation vs simulation, largest relative differences:");
  for (size_t k = 0; k < ranked.size() && k < max_pairs; ++k) {
    const Pair& p = *ranked[k];
    char buf[64];
    std::string line = "  " + p.label + ": ";
    if (p.any) {
      std::snprintf(buf, sizeof buf, "%+.1f %%", 100 * p.worst);
      line += std::string("up to ") + buf + " at point " + std::to_string(p.worst_point) + " (" +
              p.worst_where + ")";
    } else {
      line += "no point with both values";
    }
    line += "; beyond tolerance at " + std::to_string(p.beyond) + " of " +
            std::to_string(p.compared) + " points";
    lines.push_back(line);
  }
  if (ranked.size() > max_pairs) {
    lines.push_back("  (" + std::to_string(ranked.size() - max_pairs) +
                    " more pairs in edges.csv, columns *__rel_diff)");
  }
  return lines;
}

}  // namespace zvsmap
