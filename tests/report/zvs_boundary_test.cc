#include "report/zvs_boundary.h"

#include <gtest/gtest.h>

#include "report_fixture.h"
#include "sweep/sweep_expand.h"

namespace zvsmap {
namespace {

using testing_report::MakeGrid;

// The expected boundaries follow from the synthetic margins by the definition
// of linear interpolation (a margin linear in x has its zero exactly where
// the straight line through two neighbours crosses zero). // common practice, no source
TEST(ZvsBoundaryTest, OneDimensionLinearMarginGivesExactZero) {
  auto s = MakeGrid({{"x", {0, 1, 2, 3, 4, 5}}}, [](const auto& v) { return v[0] - 2.5; });
  Grid grid = BuildGrid(s.spec, s.points);
  MarginSource margin = ChooseMargin(s.results);
  EXPECT_EQ(margin.column, "");
  EXPECT_EQ(margin.description, "v_residual_limit_v - v_turn_on_v");
  auto b = FindBoundaries(grid, s.results, {"leg", "high_on"}, margin);
  ASSERT_EQ(b.size(), 1u);
  EXPECT_DOUBLE_EQ(b[0].value, 2.5);
  EXPECT_DOUBLE_EQ(b[0].lower, 2);
  EXPECT_DOUBLE_EQ(b[0].upper, 3);
  EXPECT_TRUE(b[0].interpolated);
  EXPECT_TRUE(b[0].zvs_above);
  // The low-side edge keeps +4 V everywhere: no boundary.
  EXPECT_TRUE(FindBoundaries(grid, s.results, {"leg", "low_on"}, margin).empty());
}

// The words summary.xml and the map give each margin: the energy margin
// says it does not consider the set dead time; the voltage difference is
// about the turn-on itself (definitions in src/analysis/commutation.h).
// Mixed-radix counting (common practice, no source): held dimensions of 2
// and 3 values give 6 slices, the first held dimension fastest, then wrap.
TEST(ZvsBoundaryTest, NextSliceVisitsEveryHeldCombinationOnce) {
  Grid grid;
  grid.dims.resize(4);
  grid.dims[0].values = {1, 2, 3};
  grid.dims[1].values = {1, 2, 3, 4};
  grid.dims[2].values = {1, 2};
  grid.dims[3].values = {1, 2, 3};
  std::vector<int> at(4, 0);
  std::vector<std::pair<int, int>> seen = {{at[2], at[3]}};
  while (grid.NextSlice({2, 3}, &at)) seen.push_back({at[2], at[3]});
  const std::vector<std::pair<int, int>> expected = {{0, 0}, {1, 0}, {0, 1},
                                                     {1, 1}, {0, 2}, {1, 2}};
  EXPECT_EQ(seen, expected);
  EXPECT_EQ(at, std::vector<int>(4, 0));
  EXPECT_FALSE(grid.NextSlice({}, &at));  // nothing held: one slice only
}

TEST(ZvsBoundaryTest, MarginWordsSayWhatEachMeasures) {
  auto s = MakeGrid({{"x", {0, 1}}}, [](const auto& v) { return v[0] - 0.5; });
  MarginSource voltage = ChooseMargin(s.results);
  EXPECT_EQ(voltage.positive_means, "turn-on within the ZVS criterion");
  for (PointResult& r : s.results) {
    for (EdgeMeasurement& e : r.edges) e.metrics.push_back({"zvs_energy_margin", 0.3});
  }
  MarginSource energy = ChooseMargin(s.results);
  EXPECT_EQ(energy.column, "zvs_energy_margin");
  EXPECT_EQ(energy.label, "energy margin (any dead time)");
  EXPECT_NE(energy.positive_means.find("at some dead time"), std::string::npos);
  EXPECT_NE(energy.positive_means.find("set dead time is not considered"), std::string::npos);
}

TEST(ZvsBoundaryTest, FallingMarginHasZvsBelow) {
  // margin = 1 - x/4: zero at x = 4 exactly (between 3 and 5 on this grid).
  auto s = MakeGrid({{"x", {1, 3, 5, 7}}}, [](const auto& v) { return 1 - v[0] / 4; });
  auto b = FindBoundaries(BuildGrid(s.spec, s.points), s.results, {"leg", "high_on"},
                          ChooseMargin(s.results));
  ASSERT_EQ(b.size(), 1u);
  EXPECT_DOUBLE_EQ(b[0].value, 4);
  EXPECT_FALSE(b[0].zvs_above);
}

TEST(ZvsBoundaryTest, TwoDimensionsOneBoundaryPerRow) {
  // margin = x - 2.5 - y/2: along x, for each y, the zero is at 2.5 + y/2.
  auto s = MakeGrid({{"y", {0, 1, 2}}, {"x", {0, 1, 2, 3, 4, 5}}},
                    [](const auto& v) { return v[1] - 2.5 - v[0] / 2; });
  Grid grid = BuildGrid(s.spec, s.points);
  ASSERT_EQ(grid.SweptDims().size(), 2u);
  std::vector<double> along_x;
  for (const Boundary& b :
       FindBoundaries(grid, s.results, {"leg", "high_on"}, ChooseMargin(s.results))) {
    if (b.dim == 1) {
      EXPECT_DOUBLE_EQ(b.value, 2.5 + grid.dims[0].values[b.at[0]] / 2);
      along_x.push_back(b.value);
    }
  }
  EXPECT_EQ(along_x, (std::vector<double>{2.5, 3, 3.5}));
}

TEST(ZvsBoundaryTest, MarginColumnIsPreferredAndFailedPointsSkipped) {
  // A margin column that disagrees in scale with the voltage margin: its zero
  // (x = 1.25, from 2x - 2.5) is used only where the class changes.
  auto s = MakeGrid(
      {{"x", {0, 1, 2, 3}}}, [](const auto& v) { return v[0] - 1.5; },
      [](const auto& v) {
        return std::vector<Metric>{{"zvs_margin", 2 * v[0] - 2.5}};
      });
  MarginSource margin = ChooseMargin(s.results);
  EXPECT_EQ(margin.column, "zvs_margin");
  auto b = FindBoundaries(BuildGrid(s.spec, s.points), s.results, {"leg", "high_on"}, margin);
  ASSERT_EQ(b.size(), 1u);
  EXPECT_DOUBLE_EQ(b[0].value, 1.25);

  s.results[2].status = PointStatus::kFailed;
  s.results[2].edges.clear();
  EXPECT_TRUE(
      FindBoundaries(BuildGrid(s.spec, s.points), s.results, {"leg", "high_on"}, margin).empty());
}

TEST(ZvsBoundaryTest, MidpointWhenMarginsDoNotBracketZero) {
  // Class changes but the margin column stays positive: midpoint, flagged.
  auto s = MakeGrid(
      {{"x", {0, 1}}}, [](const auto& v) { return v[0] - 0.5; },
      [](const auto& v) {
        return std::vector<Metric>{{"zvs_margin", 1 + v[0]}};
      });
  auto b = FindBoundaries(BuildGrid(s.spec, s.points), s.results, {"leg", "high_on"},
                          ChooseMargin(s.results));
  ASSERT_EQ(b.size(), 1u);
  EXPECT_DOUBLE_EQ(b[0].value, 0.5);
  EXPECT_FALSE(b[0].interpolated);
}

// A device axis sets no parameter, so its points cannot be placed by value:
// they keep the grid position ExpandSweep gave them. With one device the grid
// is the plain one and the boundary stays where the linear margin puts it.
// // common practice, no source (linear interpolation, as above)
TEST(ZvsBoundaryTest, OneValueDeviceAxisKeepsTheBoundary) {
  auto s = MakeGrid({{"x", {0, 1, 2, 3, 4, 5}}}, [](const auto& v) { return v[0] - 2.5; });
  AxisGroup devices;
  AxisSpec axis;
  axis.device_roles = {"leg.high", "leg.low"};
  axis.device_names = {"lin"};
  axis.values = {0};
  devices.axes.push_back(axis);
  s.spec.groups.insert(s.spec.groups.begin(), devices);
  std::vector<Point> expanded;
  Diagnostic error;
  ASSERT_TRUE(ExpandSweep(s.spec, &expanded, &error)) << error.Format();
  ASSERT_EQ(expanded.size(), s.points.size());
  Grid grid = BuildGrid(s.spec, expanded);
  ASSERT_EQ(grid.dims.size(), 2u);
  EXPECT_EQ(grid.dims[0].param, "leg.high leg.low");
  EXPECT_TRUE(grid.dims[0].Categorical());
  for (size_t i = 0; i < expanded.size(); ++i) {
    EXPECT_EQ(grid.coords[i], (std::vector<int>{0, static_cast<int>(i)})) << i;
  }
  auto b = FindBoundaries(grid, s.results, {"leg", "high_on"}, ChooseMargin(s.results));
  ASSERT_EQ(b.size(), 1u);
  EXPECT_EQ(b[0].dim, 1u);
  EXPECT_DOUBLE_EQ(b[0].value, 2.5);
}

}  // namespace
}  // namespace zvsmap
