#include "sweep/sharding.h"

#include <gtest/gtest.h>

#include <map>
#include <string>

namespace zvsmap {
namespace {

// An injectable environment.
struct FakeEnv {
  std::map<std::string, std::string> vars;
  std::function<const char*(const char*)> Getter() {
    return [this](const char* name) -> const char* {
      auto it = vars.find(name);
      return it == vars.end() ? nullptr : it->second.c_str();
    };
  }
};

TEST(ShardingTest, ParsesKOverN) {
  ShardSpec s;
  std::string error;
  ASSERT_TRUE(ParseShard("2/4", &s, &error));
  EXPECT_EQ(s.index, 2u);
  EXPECT_EQ(s.count, 4u);
  EXPECT_EQ(s.Describe(), "2/4");
  EXPECT_FALSE(ParseShard("4/4", &s, &error));
  EXPECT_EQ(error, "bad shard '4/4': need 0 <= K < N");
  EXPECT_FALSE(ParseShard("1-4", &s, &error));
  EXPECT_EQ(error, "bad shard '1-4' (expected K/N, e.g. 0/4)");
  EXPECT_FALSE(ParseShard("0/0", &s, &error));
  EXPECT_FALSE(ParseShard("-1/3", &s, &error));
}

TEST(ShardingTest, EveryPointInExactlyOneShardForAnyCount) {
  for (size_t total : {0u, 1u, 7u, 25u, 100u}) {
    for (size_t n = 1; n <= 9; ++n) {
      std::vector<int> seen(total, 0);
      for (size_t k = 0; k < n; ++k) {
        ShardSpec s{k, n, "--shard"};
        for (size_t i : ShardPointIndices(total, s)) {
          ASSERT_LT(i, total);
          ++seen[i];
        }
      }
      for (size_t i = 0; i < total; ++i) EXPECT_EQ(seen[i], 1) << total << " " << n << " " << i;
    }
  }
}

// Slurm sets these for a job array (sbatch --array=MIN-MAX:STEP); names from
// the Slurm sbatch documentation, "OUTPUT ENVIRONMENT VARIABLES" (from memory).
TEST(ShardingTest, ReadsASlurmArrayWithAStep) {
  FakeEnv env;
  env.vars = {{"SLURM_ARRAY_TASK_ID", "7"},
              {"SLURM_ARRAY_TASK_MIN", "1"},
              {"SLURM_ARRAY_TASK_MAX", "9"},
              {"SLURM_ARRAY_TASK_STEP", "2"},
              {"SLURM_ARRAY_TASK_COUNT", "5"}};
  std::optional<ShardSpec> s;
  std::string error;
  ASSERT_TRUE(ShardFromEnvironment(env.Getter(), 0, &s, &error)) << error;
  ASSERT_TRUE(s.has_value());
  EXPECT_EQ(s->index, 3u);  // tasks 1,3,5,7,9 -> 7 is the fourth
  EXPECT_EQ(s->count, 5u);
  EXPECT_EQ(s->source, "slurm");
  env.vars.erase("SLURM_ARRAY_TASK_COUNT");  // derived from MIN, MAX, STEP
  ASSERT_TRUE(ShardFromEnvironment(env.Getter(), 0, &s, &error));
  EXPECT_EQ(s->count, 5u);
  env.vars["SLURM_ARRAY_TASK_ID"] = "4";  // not on the step grid
  EXPECT_FALSE(ShardFromEnvironment(env.Getter(), 0, &s, &error));
  EXPECT_EQ(error, "SLURM_ARRAY_TASK_ID 4 is not in the array 1-9:2");
}

TEST(ShardingTest, ReadsASlurmArrayWithoutStep) {
  FakeEnv env;
  env.vars = {{"SLURM_ARRAY_TASK_ID", "0"},
              {"SLURM_ARRAY_TASK_MIN", "0"},
              {"SLURM_ARRAY_TASK_MAX", "3"},
              {"SLURM_ARRAY_TASK_COUNT", "4"}};
  std::optional<ShardSpec> s;
  std::string error;
  ASSERT_TRUE(ShardFromEnvironment(env.Getter(), 0, &s, &error));
  EXPECT_EQ(s->Describe(), "0/4");
  env.vars.erase("SLURM_ARRAY_TASK_MIN");
  EXPECT_FALSE(ShardFromEnvironment(env.Getter(), 0, &s, &error));
  EXPECT_EQ(error, "SLURM_ARRAY_TASK_ID is set but SLURM_ARRAY_TASK_MIN/MAX are missing or bad");
}

// Kubernetes indexed Jobs set JOB_COMPLETION_INDEX (0-based), from memory.
TEST(ShardingTest, ReadsAnIndexedJobOnlyWithACount) {
  FakeEnv env;
  env.vars = {{"JOB_COMPLETION_INDEX", "2"}};
  std::optional<ShardSpec> s;
  std::string error;
  EXPECT_FALSE(ShardFromEnvironment(env.Getter(), 0, &s, &error));
  EXPECT_EQ(error, "JOB_COMPLETION_INDEX is set; give the number of shards with --shards N");
  ASSERT_TRUE(ShardFromEnvironment(env.Getter(), 3, &s, &error));
  EXPECT_EQ(s->Describe(), "2/3");
  EXPECT_FALSE(ShardFromEnvironment(env.Getter(), 2, &s, &error));
}

TEST(ShardingTest, NoShardWhenTheEnvironmentNamesNone) {
  FakeEnv env;
  std::optional<ShardSpec> s;
  std::string error;
  ASSERT_TRUE(ShardFromEnvironment(env.Getter(), 0, &s, &error));
  EXPECT_FALSE(s.has_value());
}

}  // namespace
}  // namespace zvsmap
