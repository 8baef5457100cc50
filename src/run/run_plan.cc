#include "run/run_plan.h"

#include <map>

#include "store/content_hash.h"

namespace zvsmap {

std::vector<std::string> PointContentHashes(const PreparedSweep& sweep,
                                            const PointEvaluator& evaluator) {
  std::vector<std::string> hashes(sweep.points.size());
  for (size_t i = 0; i < sweep.points.size(); ++i) {
    std::string netlist;
    Diagnostic render_error;
    if (!evaluator.Render(sweep.points[i], &netlist, &render_error)) {
      netlist = "render error: " + render_error.Format();
    }
    hashes[i] = PointContentHash(netlist, sweep.spec, sweep.tmpl);
  }
  return hashes;
}

bool CollectStoredResults(RunStore& store, const std::vector<std::string>& hashes,
                          std::vector<PointResult>* results, std::string* error) {
  std::map<size_t, PointResult> loaded;
  std::vector<StoredPointKey> keys;
  if (!store.LoadResults(&loaded, error) || !store.ListPoints(&keys, error)) return false;
  results->clear();
  for (size_t i = 0; i < hashes.size(); ++i) results->push_back(NotRunResult(i));
  for (const auto& key : keys) {
    if (key.index >= hashes.size() || key.content_hash != hashes[key.index]) continue;
    auto it = loaded.find(key.index);
    if (it != loaded.end()) (*results)[key.index] = std::move(it->second);
  }
  return true;
}

ResultCounts CountResults(const std::vector<PointResult>& results) {
  ResultCounts c;
  for (const auto& r : results) {
    if (r.status == PointStatus::kOk) {
      ++c.ok;
    } else if (r.status == PointStatus::kUnsettled) {
      ++c.unsettled;
    } else if (r.status == PointStatus::kNotRun) {
      ++c.not_run;
    } else {
      ++c.failed;
    }
  }
  return c;
}

}  // namespace zvsmap
