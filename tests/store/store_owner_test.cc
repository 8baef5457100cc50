// Unit tests of which sweep a run store belongs to: one key per file however
// its path is spelled, another file refused with the message, and clearing.
#include "store/store_owner.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <map>
#include <vector>

namespace zvsmap {
namespace {

namespace fs = std::filesystem;

class StoreOwnerTest : public ::testing::Test {
 protected:
  void SetUp() override {
    char pattern[] = "/tmp/zvsmap-owner-XXXXXX";
    ASSERT_NE(mkdtemp(pattern), nullptr);
    dir_ = fs::canonical(pattern).string();
    fs::create_directory(dir_ + "/sweeps");
    std::ofstream(dir_ + "/sweeps/a.xml") << "<sweep/>";
    std::ofstream(dir_ + "/sweeps/b.xml") << "<sweep/>";
    store_path_ = dir_ + "/run.sqlite";
    std::string error;
    store_ = RunStore::Open(store_path_, &error);
    ASSERT_NE(store_, nullptr) << error;
  }
  void TearDown() override {
    store_.reset();
    fs::remove_all(dir_);
  }
  std::string dir_, store_path_;
  std::unique_ptr<RunStore> store_;
};

TEST_F(StoreOwnerTest, EverySpellingOfOneFileIsOneKey) {
  std::string key = dir_ + "/sweeps/a.xml";
  EXPECT_EQ(SweepOwnerKey(key), key);
  EXPECT_EQ(SweepOwnerKey(dir_ + "/sweeps/../sweeps/./a.xml"), key);
  fs::create_symlink(dir_ + "/sweeps", dir_ + "/link");
  EXPECT_EQ(SweepOwnerKey(dir_ + "/link/a.xml"), key);
  fs::path cwd = fs::current_path();
  fs::current_path(dir_);
  EXPECT_EQ(SweepOwnerKey("sweeps/a.xml"), key);
  fs::current_path(cwd);
}

TEST_F(StoreOwnerTest, ANewStoreBelongsToAnySweepUntilClaimed) {
  std::string message;
  EXPECT_TRUE(StoreBelongsTo(*store_, store_path_, dir_ + "/sweeps/a.xml", &message));
  std::string error;
  ASSERT_TRUE(ClaimStore(*store_, dir_ + "/sweeps/a.xml", &error)) << error;
  EXPECT_EQ(store_->GetMeta(kStoreOwnerKey), dir_ + "/sweeps/a.xml");
  EXPECT_TRUE(StoreBelongsTo(*store_, store_path_, dir_ + "/link/../sweeps/a.xml", &message));
  EXPECT_FALSE(StoreBelongsTo(*store_, store_path_, dir_ + "/sweeps/b.xml", &message));
  EXPECT_EQ(message, store_path_ + " holds the results of another sweep (" + dir_ +
                         "/sweeps/a.xml), not of " + dir_ + "/sweeps/b.xml");
}

TEST_F(StoreOwnerTest, DeleteAllPointsEmptiesTheStoreAndKeepsItsMeta) {
  std::string error;
  ASSERT_TRUE(ClaimStore(*store_, dir_ + "/sweeps/a.xml", &error));
  Point point;
  point.index = 3;
  PointResult result;
  result.index = 3;
  result.status = PointStatus::kOk;
  result.edges.push_back({"leg", "high_on", ZvsClass::kFull, "v <= 1", {{"v_turn_on_v", 0.5}}});
  ASSERT_TRUE(store_->SavePoint(point, "abc", result, &error)) << error;
  std::vector<StoredPointKey> keys;
  ASSERT_TRUE(store_->ListPoints(&keys, &error));
  ASSERT_EQ(keys.size(), 1u);
  ASSERT_TRUE(store_->DeleteAllPoints(&error)) << error;
  keys.clear();
  ASSERT_TRUE(store_->ListPoints(&keys, &error));
  EXPECT_TRUE(keys.empty());
  std::map<size_t, PointResult> loaded;
  ASSERT_TRUE(store_->LoadResults(&loaded, &error));
  EXPECT_TRUE(loaded.empty());
  EXPECT_EQ(store_->GetMeta(kStoreOwnerKey), dir_ + "/sweeps/a.xml");
}

}  // namespace
}  // namespace zvsmap
