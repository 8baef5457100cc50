#include "report/deadtime_chart.h"

#include <gtest/gtest.h>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::MakeGrid;

int Count(pugi::xml_node svg, const char* name) {
  int n = 0;
  for (pugi::xml_node c : svg.children(name)) n += c ? 1 : 0;
  return n;
}

// A window that opens at 10 ns + 2 ns/A and closes at 60 ns (invented
// numbers): one band per value of the second axis, the set dead time dashed.
TEST(DeadTimeChartTest, OneBandPerSecondAxisValueAndTheSetDeadTime) {
  auto s = MakeGrid(
      {{"Iout", {0, 2, 4}}, {"L", {1e-6, 2e-6}}}, [](const auto& v) { return 3 - v[0]; },
      [](const auto& v) {
        return std::vector<Metric>{
            {"t_clamp_s", 10e-9 + 2e-9 * v[0]}, {"t_ringback_s", 60e-9}, {"t_dead_s", 40e-9}};
      });
  std::vector<Plot> charts = DeadTimeCharts(s.Input());
  ASSERT_EQ(charts.size(), 2u);  // one per edge
  EXPECT_EQ(charts[0].file, "deadtime_leg_high_on.svg");
  pugi::xml_document doc;
  ASSERT_TRUE(doc.load_string(charts[0].svg.c_str()));
  pugi::xml_node svg = doc.child("svg");
  EXPECT_EQ(Count(svg, "polygon"), 2);  // L = 1 µH and 2 µH
  int dashed = 0;
  for (pugi::xml_node p : svg.children("polyline"))
    dashed += p.attribute("stroke-dasharray") ? 1 : 0;
  EXPECT_EQ(dashed, 2);  // the set dead time over each band
}

TEST(DeadTimeChartTest, NoWindowColumnsNoChart) {
  auto s = MakeGrid({{"Iout", {0, 2, 4}}}, [](const auto& v) { return 3 - v[0]; });
  EXPECT_TRUE(DeadTimeCharts(s.Input()).empty());
}

}  // namespace
}  // namespace zvsmap
