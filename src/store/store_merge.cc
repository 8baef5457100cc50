#include "store/store_merge.h"

#include <map>
#include <memory>

namespace zvsmap {

namespace {

struct Source {
  std::string path;
  std::unique_ptr<RunStore> store;
  std::vector<StoredPointKey> keys;
};

}  // namespace

bool MergeStores(const std::vector<std::string>& source_paths, const std::string& identity,
                 const std::vector<Point>& points, const std::vector<std::string>& hashes,
                 RunStore* target, MergeReport* report, std::string* error) {
  *report = MergeReport{};
  // Open and check every source before writing anything.
  std::vector<Source> sources;
  for (const auto& path : source_paths) {
    Source s;
    s.path = path;
    std::string open_error;
    s.store = RunStore::Open(path, &open_error);
    if (!s.store) {
      *error = open_error;
      return false;
    }
    std::string theirs = s.store->GetMeta("sweep_identity");
    if (theirs != identity) {
      *error = path + ": from a different sweep (identity " + (theirs.empty() ? "none" : theirs) +
               ", this sweep is " + identity + "); refusing to merge";
      return false;
    }
    if (!s.store->ListPoints(&s.keys, error)) return false;
    sources.push_back(std::move(s));
  }

  // For each point, the source that holds its result (first, ok preferred).
  std::vector<int> chosen(points.size(), -1);
  std::vector<int> holders(points.size(), 0);
  std::vector<bool> chosen_ok(points.size(), false);
  std::vector<bool> seen_stale(points.size(), false);
  for (size_t k = 0; k < sources.size(); ++k) {
    for (const auto& key : sources[k].keys) {
      if (key.index >= points.size()) continue;
      if (key.content_hash != hashes[key.index]) {
        seen_stale[key.index] = true;
        continue;
      }
      ++holders[key.index];
      bool ok = key.status == PointStatus::kOk;
      if (chosen[key.index] < 0 || (ok && !chosen_ok[key.index])) {
        chosen[key.index] = static_cast<int>(k);
        chosen_ok[key.index] = ok;
      }
    }
  }

  for (size_t k = 0; k < sources.size(); ++k) {
    std::map<size_t, PointResult> results;
    if (!sources[k].store->LoadResults(&results, error)) return false;
    for (auto& [index, result] : results) {
      if (index >= points.size() || chosen[index] != static_cast<int>(k)) continue;
      if (!target->SavePoint(points[index], hashes[index], result, error)) return false;
      ++report->merged;
    }
  }
  for (size_t i = 0; i < points.size(); ++i) {
    if (chosen[i] < 0) {
      report->missing.push_back(i);
      if (seen_stale[i]) report->stale.push_back(i);
    }
    if (holders[i] > 1) report->duplicated.push_back(i);
  }
  return true;
}

}  // namespace zvsmap
