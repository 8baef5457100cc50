// Unit tests of the data-directory search order (core/data_dir.h).
#include "core/data_dir.h"

#include <gtest/gtest.h>

#include <cstdlib>

namespace zvsmap {
namespace {

// Restores both variables after each test.
class DataDirTest : public ::testing::Test {
 protected:
  void TearDown() override {
    unsetenv(kDataDirEnv);
    unsetenv(kNoSourceDirEnv);
  }
};

TEST_F(DataDirTest, TheEnvironmentVariableComesFirst) {
  setenv(kDataDirEnv, "/opt/zvsmap-data", 1);
  std::vector<std::string> searched;
  EXPECT_EQ(DataDir(&searched), "/opt/zvsmap-data");
  EXPECT_EQ(searched, std::vector<std::string>{"/opt/zvsmap-data"});
  EXPECT_EQ(DataFile("netlists/switches.lib"), "/opt/zvsmap-data/netlists/switches.lib");
}

// The test binary has no ../share/zvsmap beside it: the source tree is next,
// and switching it off leaves nothing.
TEST_F(DataDirTest, ThenBesideTheExecutableThenTheSourceTree) {
  std::vector<std::string> searched;
  EXPECT_EQ(DataDir(&searched), ZVSMAP_SOURCE_DIR);
  ASSERT_EQ(searched.size(), 2u);
  EXPECT_NE(searched[0].find("share/zvsmap"), std::string::npos) << searched[0];
  EXPECT_EQ(searched[1], ZVSMAP_SOURCE_DIR);
  setenv(kNoSourceDirEnv, "1", 1);
  EXPECT_EQ(DataDir(), "");
  EXPECT_EQ(DataFile("netlists/switches.lib"), "netlists/switches.lib");
}

}  // namespace
}  // namespace zvsmap
