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

/// The content hash of every point (rendered netlist + settings + version),
/// index for index. A point that cannot be rendered hashes its render error.
std::vector<std::string> PointContentHashes(const PreparedSweep& sweep,
                                            const PointEvaluator& evaluator);

/// Every point's stored result whose content hash matches `hashes`, index
/// for index; a point without one is NotRunResult (status kNotRun, reason "not run").
bool CollectStoredResults(RunStore& store, const std::vector<std::string>& hashes,
                          std::vector<PointResult>* results, std::string* error);

/// Counts of a result list, for the summary line and the exit status.
struct ResultCounts {
  size_t ok = 0, failed = 0, unsettled = 0, not_run = 0;
};
ResultCounts CountResults(const std::vector<PointResult>& results);

}  // namespace zvsmap
