// Joining the run stores of a sweep's shards into one store.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "store/run_store.h"
#include "sweep/point.h"

namespace zvsmap {

/// What a merge found.
struct MergeReport {
  size_t merged = 0;                  ///< points copied into the target
  std::vector<size_t> missing;        ///< points in no source (or only with a stale hash)
  std::vector<size_t> duplicated;     ///< points found in more than one source
  std::vector<size_t> stale;          ///< stored with another content hash (ignored)
};

/// Copies every point of the sources into `target`. Each source must carry
/// the sweep identity `identity` (meta "sweep_identity"); a source from a
/// different sweep fails the whole merge, naming the file, before anything is
/// written. A point is taken only when its stored content hash equals
/// `hashes[index]`; when several sources hold it, the first source in the
/// given order wins, except that an ok result beats a failed one.
bool MergeStores(const std::vector<std::string>& source_paths, const std::string& identity,
                 const std::vector<Point>& points, const std::vector<std::string>& hashes,
                 RunStore* target, MergeReport* report, std::string* error);

}  // namespace zvsmap
