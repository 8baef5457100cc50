// Splitting a sweep into deterministic shards, for cluster job arrays, CI
// matrices and indexed jobs: every point belongs to exactly one shard.
#pragma once

#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "sweep/point.h"

namespace zvsmap {

/// Shard `index` of `count` (0-based index).
struct ShardSpec {
  size_t index = 0;
  size_t count = 1;
  std::string source;  ///< where it came from: "--shard", "slurm", "indexed job"

  /// "2/4" (index/count).
  std::string Describe() const;
};

/// Parses "K/N" (0 <= K < N). On failure returns false with a message.
bool ParseShard(const std::string& text, ShardSpec* shard, std::string* error);

/// Reads a shard from the environment when no --shard is given:
/// - a Slurm job array: SLURM_ARRAY_TASK_ID with SLURM_ARRAY_TASK_MIN,
///   SLURM_ARRAY_TASK_MAX, SLURM_ARRAY_TASK_STEP (default 1) and
///   SLURM_ARRAY_TASK_COUNT; the shard index is (ID - MIN) / STEP and the count
///   is COUNT (or (MAX - MIN) / STEP + 1 when COUNT is absent);
/// - an indexed job: JOB_COMPLETION_INDEX, with the count from `count_hint`
///   (the --shards option); without a count it is an error.
/// Returns false with a message on inconsistent values; `shard` stays empty
/// when the environment names no shard. `getenv` is injectable for tests.
bool ShardFromEnvironment(const std::function<const char*(const char*)>& getenv,
                          size_t count_hint, std::optional<ShardSpec>* shard, std::string* error);

/// The point indices of a shard, ascending: those with index % count == shard
/// index. Interleaving spreads neighbouring (similarly costly) grid points over
/// all shards, which balances them when the cost varies smoothly over the grid.
std::vector<size_t> ShardPointIndices(size_t total_points, const ShardSpec& shard);

/// The shard's points among points[begin..]: positions k (from `begin`),
/// ascending, of the work units (sweep/chain_layout.h: a chain along the
/// innermost axis with the tolerance variants of its points) whose ordinal %
/// count == shard index. So one shard runs every point a warm start chains
/// together, a nominal point with all its variants (and the merged shards
/// hold every variant of a point), and neighbouring chains go to different
/// shards, which balances them when the cost varies smoothly over the grid.
std::vector<size_t> ShardPointsOf(const std::vector<Point>& points, size_t begin,
                                  const ShardSpec& shard);

}  // namespace zvsmap
