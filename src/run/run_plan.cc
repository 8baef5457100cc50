#include "run/run_plan.h"

#include <map>

#include "store/content_hash.h"
#include "sweep/chain_layout.h"

namespace zvsmap {

std::vector<std::string> PointContentHashes(const PreparedSweep& sweep,
                                            const PointEvaluator& evaluator) {
  std::vector<std::string> hashes(sweep.points.size());
  std::vector<ChainLink> links;
  for (size_t i = 0; i < sweep.points.size(); ++i) {
    Deck deck;
    Diagnostic render_error;
    std::string canonical = evaluator.RenderPointDeck(sweep.points[i], &deck, &render_error)
                                ? deck.Canonical()
                                : "render error: " + render_error.message;
    // A tolerance variant's values are in its deck; the block that drew them
    // (seed, spreads, widths, corner choice) and its tag are added too, so a
    // changed block never takes a stale variant. Nominal points keep their
    // hash: adding a block to a sweep reuses the nominal results.
    const std::optional<VariantTag>& tag = sweep.points[i].variant;
    if (tag) {
      canonical += "\n" + sweep.spec.tolerances.Canonical() + "\nvariant " +
                   (tag->kind == VariantTag::Kind::kCorner ? "corner " : "sample ") +
                   std::to_string(tag->number);
    }
    // A warm-started point settles from its chain predecessor's result, so
    // that result is part of its content: a point is kept only when its
    // predecessor's content is unchanged too (recursively along the chain).
    // Links point to lower indices, whose hashes are final by now; the links
    // over the whole sweep equal each refinement round's own (chains never
    // cross rounds).
    if (sweep.spec.simulation.warm_start) {
      if (links.empty()) {
        links = ChainLinks(sweep.points, 0, InnermostIsDevice(sweep.spec));
      }
      const size_t previous = links[i].previous;
      if (previous != ChainLink::kNone) canonical += "\nwarm-started from " + hashes[previous];
    }
    hashes[i] = PointContentHash(canonical, sweep.spec, sweep.tmpl);
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
  // Prefer the row at the point's own index, then any row with its hash.
  std::map<std::string, size_t> by_hash;
  for (const auto& key : keys) by_hash.emplace(key.content_hash, key.index);
  for (const auto& key : keys) {
    if (key.index < hashes.size() && key.content_hash == hashes[key.index])
      by_hash[key.content_hash] = key.index;
  }
  for (size_t i = 0; i < hashes.size(); ++i) {
    auto found = by_hash.find(hashes[i]);
    if (found == by_hash.end()) continue;
    auto it = loaded.find(found->second);
    if (it == loaded.end()) continue;
    (*results)[i] = it->second;
    (*results)[i].index = i;
  }
  return true;
}

bool RekeyStoredResults(RunStore& store, const std::vector<Point>& points,
                        const std::vector<std::string>& hashes, std::string* error) {
  std::vector<StoredPointKey> keys;
  if (!store.ListPoints(&keys, error)) return false;
  std::map<size_t, std::string> hash_at;
  std::map<std::string, size_t> index_of;
  for (const auto& key : keys) {
    hash_at[key.index] = key.content_hash;
    index_of.emplace(key.content_hash, key.index);
  }
  std::vector<std::pair<size_t, size_t>> moves;  // (to, from)
  for (size_t i = 0; i < hashes.size() && i < points.size(); ++i) {
    auto at = hash_at.find(i);
    if (at != hash_at.end() && at->second == hashes[i]) continue;
    auto from = index_of.find(hashes[i]);
    if (from != index_of.end()) moves.emplace_back(i, from->second);
  }
  if (moves.empty()) return true;
  std::map<size_t, PointResult> loaded;  // read everything before the first write
  if (!store.LoadResults(&loaded, error)) return false;
  for (const auto& [to, from] : moves) {
    auto it = loaded.find(from);
    if (it == loaded.end()) continue;
    PointResult moved = it->second;
    moved.index = to;
    if (!store.SavePoint(points[to], hashes[to], moved, error)) return false;
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
