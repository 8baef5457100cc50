// Unit tests of joining shard stores.
#include "store/store_merge.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <map>

namespace zvsmap {
namespace {

class StoreMergeTest : public ::testing::Test {
 protected:
  void SetUp() override {
    char pattern[] = "/tmp/zvsmap-merge-test-XXXXXX";
    ASSERT_NE(mkdtemp(pattern), nullptr);
    dir_ = pattern;
    for (size_t i = 0; i < 6; ++i) {
      points_.push_back(Point{i, {{"Iout", static_cast<double>(i)}}, {}});
      hashes_.push_back("h" + std::to_string(i));
    }
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }

  // A shard store holding `indices`, tagged with `identity`.
  std::string MakeShard(const std::string& name, const std::string& identity,
                        const std::vector<size_t>& indices, PointStatus status = PointStatus::kOk) {
    std::string path = dir_ + "/" + name + ".sqlite";
    std::string error;
    auto store = RunStore::Open(path, &error);
    EXPECT_TRUE(store) << error;
    EXPECT_TRUE(store->SetMeta("sweep_identity", identity, &error));
    for (size_t i : indices) {
      PointResult r;
      r.index = i;
      r.status = status;
      r.reason = status == PointStatus::kOk ? "" : "engine error: from " + name;
      EdgeMeasurement e{"leg", "high_on", ZvsClass::kFull, "", {{"v_turn_on_v", 0.5 + i}}};
      r.edges = {e};
      EXPECT_TRUE(store->SavePoint(points_[i], hashes_[i], r, &error)) << error;
    }
    return path;
  }

  std::string dir_;
  std::vector<Point> points_;
  std::vector<std::string> hashes_;
};

TEST_F(StoreMergeTest, JoinsShardsAndReportsMissingAndDuplicated) {
  std::string a = MakeShard("a", "id1", {0, 2, 4});
  std::string b = MakeShard("b", "id1", {1, 4});
  std::string error;
  auto target = RunStore::Open(dir_ + "/merged.sqlite", &error);
  ASSERT_TRUE(target) << error;
  MergeReport report;
  ASSERT_TRUE(MergeStores({a, b}, "id1", points_, hashes_, target.get(), &report, &error)) << error;
  EXPECT_EQ(report.merged, 4u);
  EXPECT_EQ(report.missing, (std::vector<size_t>{3, 5}));
  EXPECT_EQ(report.duplicated, (std::vector<size_t>{4}));
  std::map<size_t, PointResult> merged;
  ASSERT_TRUE(target->LoadResults(&merged, &error));
  ASSERT_EQ(merged.size(), 4u);
  EXPECT_DOUBLE_EQ(merged.at(1).edges.at(0).Get("v_turn_on_v"), 1.5);
}

TEST_F(StoreMergeTest, RefusesAStoreFromAnotherSweep) {
  std::string a = MakeShard("a", "id1", {0});
  std::string b = MakeShard("b", "other", {1});
  std::string error;
  auto target = RunStore::Open(dir_ + "/merged.sqlite", &error);
  MergeReport report;
  EXPECT_FALSE(MergeStores({a, b}, "id1", points_, hashes_, target.get(), &report, &error));
  EXPECT_EQ(error, b + ": from a different sweep (identity other, this sweep is id1); refusing "
                       "to merge");
  std::map<size_t, PointResult> merged;
  ASSERT_TRUE(target->LoadResults(&merged, &error));
  EXPECT_TRUE(merged.empty());  // nothing written before the check
}

TEST_F(StoreMergeTest, AnOkResultBeatsAFailedOneAndStaleHashesAreIgnored) {
  std::string a = MakeShard("a", "id1", {0, 1}, PointStatus::kFailed);
  std::string b = MakeShard("b", "id1", {1});
  hashes_[0] = "changed";
  std::string error;
  auto target = RunStore::Open(dir_ + "/merged.sqlite", &error);
  MergeReport report;
  ASSERT_TRUE(MergeStores({a, b}, "id1", points_, hashes_, target.get(), &report, &error));
  std::map<size_t, PointResult> merged;
  ASSERT_TRUE(target->LoadResults(&merged, &error));
  EXPECT_EQ(merged.count(0), 0u);
  EXPECT_EQ(merged.at(1).status, PointStatus::kOk);
  EXPECT_EQ(report.stale, (std::vector<size_t>{0}));
}

}  // namespace
}  // namespace zvsmap
