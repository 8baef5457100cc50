// The end of `run` and `merge`: reports from the stored results, the summary
// on stderr, and the exit status.
#pragma once

#include <string>
#include <vector>

#include "result/point_result.h"
#include "run/sweep_setup.h"

namespace zvsmap::cli {

/// What the reports cover and how the run went.
struct RunSummaryInput {
  const PreparedSweep& sweep;
  std::vector<size_t> indices;  ///< the points reported (all, or one shard's), ascending
  const std::vector<PointResult>& results;  ///< index for index with sweep.points
  std::string out_dir;
  std::string store_path;
  std::string shard;  ///< "K/N" when the run was one shard, else ""
  size_t kept = 0;    ///< points reused from the store
  double wall_s = 0;
  bool interrupted = false;
  /// Adaptive refinement: how far it got (RefinementOutcome::used false otherwise).
  RefinementOutcome refinement = {};
};

/// Writes every report into out_dir, prints the summary (counts, the largest
/// disagreements with the hand calculation, the files written) and returns
/// the exit status (exit_codes.h).
int WriteReportsAndSummarize(const RunSummaryInput& in);

}  // namespace zvsmap::cli
