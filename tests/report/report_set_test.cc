#include "report/report_set.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::AddRequirement;
using testing_report::MakeGrid;
using testing_report::TempDir;
using testing_report::ValidateSummary;

std::string Read(const std::string& path) {
  std::ifstream in(path);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

// The verdict counts are the requirement definitions applied by hand to the
// synthetic margins. // common practice, no source
TEST(ReportSetTest, WritesEveryFileAndCountsRequirements) {
  auto s = MakeGrid({{"L", {1e-6, 2e-6}}, {"Iout", {0, 2, 4}}},
                    [](const auto& v) { return v[1] - 1 - v[0] * 1e6; });
  AddRequirement(&s, R"(<require edge="leg.high_on" class="full" where="Iout >= 4"/>)", 10);
  AddRequirement(&s, R"(<require edge="leg.high_on" metric="zvs_margin" min="0.2"/>)", 11);
  std::string dir = TempDir("set");
  ReportOutcome outcome;
  std::string error;
  ASSERT_TRUE(WriteReports(s.Input(), dir, &outcome, &error)) << error;
  EXPECT_EQ(outcome.requirements_total, 2);
  EXPECT_EQ(outcome.requirements_failed, 1);
  for (const char* name : {"edges.csv", "summary.xml", "junit.xml", "index.html",
                           "map_leg_high_on.svg", "map_leg_low_on.svg"}) {
    EXPECT_TRUE(std::filesystem::exists(dir + "/" + name)) << name;
  }
  EXPECT_EQ(ValidateSummary(dir + "/summary.xml"), 0);
  std::string html = Read(dir + "/index.html");
  EXPECT_NE(html.find("<img src=\"map_leg_high_on.svg\""), std::string::npos);
  EXPECT_NE(html.find("1 of 2 requirements did not hold"), std::string::npos);
  EXPECT_NE(html.find("High voltage and stored energy"), std::string::npos);
  EXPECT_NE(html.find("qualified engineer"), std::string::npos);
  EXPECT_EQ(html.find("http"), std::string::npos);  // nothing fetched from the network
}

TEST(ReportSetTest, UnwritableFolderIsAnError) {
  auto s = MakeGrid({{"x", {0, 1}}}, [](const auto&) { return 1.0; });
  ReportOutcome outcome;
  std::string error;
  EXPECT_FALSE(WriteReports(s.Input(), "/nonexistent/zvsmap", &outcome, &error));
  EXPECT_EQ(error, "/nonexistent/zvsmap/edges.csv: cannot write: No such file or directory");
}

}  // namespace
}  // namespace zvsmap
