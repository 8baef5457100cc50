#include "sweep/sharding.h"

#include <algorithm>
#include <cerrno>
#include <cstdlib>

#include "sweep/chain_layout.h"

namespace zvsmap {

namespace {

// A non-negative decimal integer, the whole string.
bool ParseCount(const char* text, long long* value) {
  if (!text || !*text) return false;
  char* end = nullptr;
  errno = 0;
  long long v = std::strtoll(text, &end, 10);
  if (errno != 0 || *end != '\0' || v < 0) return false;
  *value = v;
  return true;
}

}  // namespace

std::string ShardSpec::Describe() const {
  return std::to_string(index) + "/" + std::to_string(count);
}

bool ParseShard(const std::string& text, ShardSpec* shard, std::string* error) {
  size_t slash = text.find('/');
  long long k = 0, n = 0;
  if (slash == std::string::npos || !ParseCount(text.substr(0, slash).c_str(), &k) ||
      !ParseCount(text.substr(slash + 1).c_str(), &n)) {
    *error = "bad shard '" + text + "' (expected K/N, e.g. 0/4)";
    return false;
  }
  if (n < 1 || k >= n) {
    *error = "bad shard '" + text + "': need 0 <= K < N";
    return false;
  }
  shard->index = static_cast<size_t>(k);
  shard->count = static_cast<size_t>(n);
  shard->source = "--shard";
  return true;
}

bool ShardFromEnvironment(const std::function<const char*(const char*)>& getenv,
                          size_t count_hint, std::optional<ShardSpec>* shard, std::string* error) {
  shard->reset();
  const char* task_id = getenv("SLURM_ARRAY_TASK_ID");
  if (task_id && *task_id) {
    long long id = 0, min = 0, max = 0, step = 1, count = 0;
    if (!ParseCount(task_id, &id)) {
      *error = std::string("bad SLURM_ARRAY_TASK_ID '") + task_id + "'";
      return false;
    }
    const char* min_text = getenv("SLURM_ARRAY_TASK_MIN");
    const char* max_text = getenv("SLURM_ARRAY_TASK_MAX");
    const char* step_text = getenv("SLURM_ARRAY_TASK_STEP");
    const char* count_text = getenv("SLURM_ARRAY_TASK_COUNT");
    if (!ParseCount(min_text, &min) || !ParseCount(max_text, &max)) {
      *error = "SLURM_ARRAY_TASK_ID is set but SLURM_ARRAY_TASK_MIN/MAX are missing or bad";
      return false;
    }
    if (step_text && *step_text && (!ParseCount(step_text, &step) || step < 1)) {
      *error = std::string("bad SLURM_ARRAY_TASK_STEP '") + step_text + "'";
      return false;
    }
    if (count_text && *count_text) {
      if (!ParseCount(count_text, &count) || count < 1) {
        *error = std::string("bad SLURM_ARRAY_TASK_COUNT '") + count_text + "'";
        return false;
      }
    } else {
      count = (max - min) / step + 1;
    }
    if (id < min || id > max || (id - min) % step != 0) {
      *error = "SLURM_ARRAY_TASK_ID " + std::to_string(id) + " is not in the array " +
               std::to_string(min) + "-" + std::to_string(max) + ":" + std::to_string(step);
      return false;
    }
    long long index = (id - min) / step;
    if (index >= count) {
      *error = "Slurm array task " + std::to_string(id) + " gives shard " +
               std::to_string(index) + ", beyond SLURM_ARRAY_TASK_COUNT " +
               std::to_string(count) + " (arrays with a '%' limit or holes are not supported)";
      return false;
    }
    *shard = ShardSpec{static_cast<size_t>(index), static_cast<size_t>(count), "slurm"};
    return true;
  }
  const char* completion = getenv("JOB_COMPLETION_INDEX");
  if (completion && *completion) {
    long long index = 0;
    if (!ParseCount(completion, &index)) {
      *error = std::string("bad JOB_COMPLETION_INDEX '") + completion + "'";
      return false;
    }
    if (count_hint == 0) {
      *error = "JOB_COMPLETION_INDEX is set; give the number of shards with --shards N";
      return false;
    }
    if (static_cast<size_t>(index) >= count_hint) {
      *error = "JOB_COMPLETION_INDEX " + std::to_string(index) + " is not below --shards " +
               std::to_string(count_hint);
      return false;
    }
    *shard = ShardSpec{static_cast<size_t>(index), count_hint, "indexed job"};
  }
  return true;
}

std::vector<size_t> ShardPointIndices(size_t total_points, const ShardSpec& shard) {
  std::vector<size_t> out;
  for (size_t i = shard.index; i < total_points; i += shard.count) out.push_back(i);
  return out;
}

std::vector<size_t> ShardPointsOf(const std::vector<Point>& points, size_t begin,
                                  const ShardSpec& shard) {
  std::vector<size_t> out;
  std::vector<std::vector<size_t>> units = ChainUnits(points, begin);
  for (size_t u = shard.index; u < units.size(); u += shard.count) {
    for (size_t k : units[u]) out.push_back(k - begin);
  }
  std::sort(out.begin(), out.end());
  return out;
}

}  // namespace zvsmap
