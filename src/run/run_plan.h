// What a run (or a merge) of a prepared sweep works from: each point's
// content hash, and the stored results that still belong to the sweep.
#pragma once

#include <string>
#include <vector>

#include "result/point_result.h"
#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "store/run_store.h"

namespace zvsmap {

/// The content hash of every point (canonical deck + settings + version),
/// index for index. A point that cannot be rendered hashes its render error.
/// With warm starts, a point's hash covers its chain predecessor's hash too
/// (sweep/chain_layout.h), so a point whose predecessor changed is redone
/// and a kept result equals a fresh run's.
std::vector<std::string> PointContentHashes(const PreparedSweep& sweep,
                                            const PointEvaluator& evaluator);

/// Moves stored results to the index their content now has: a point whose
/// stored row (at its index) has another hash takes the stored result of
/// any index with its hash, so a grid that grew or shrank keeps every
/// point that still exists. Call before deciding what to run.
bool RekeyStoredResults(RunStore& store, const std::vector<Point>& points,
                        const std::vector<std::string>& hashes, std::string* error);

/// Every point's stored result whose content hash matches `hashes` (at any
/// stored index); a point without one is NotRunResult (status kNotRun).
bool CollectStoredResults(RunStore& store, const std::vector<std::string>& hashes,
                          std::vector<PointResult>* results, std::string* error);

/// Counts of a result list, for the summary line and the exit status.
struct ResultCounts {
  size_t ok = 0, failed = 0, unsettled = 0, not_run = 0;
};
ResultCounts CountResults(const std::vector<PointResult>& results);

}  // namespace zvsmap
