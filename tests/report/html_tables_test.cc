#include "report/html_tables.h"

#include <gtest/gtest.h>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::MakeGrid;

// The synthetic margin is linear in Iout with its zero at 2.5 A, so the
// boundary interpolated between the grid values 2 A and 3 A lies at 2.5 A
// (linear interpolation of a linear function is exact; common practice).
TEST(HtmlTablesTest, BoundaryWorstPointsFailuresAndSettings) {
  auto s = MakeGrid({{"Iout", {0, 1, 2, 3, 4}}}, [](const auto& v) { return v[0] - 2.5; });
  s.results[4].status = PointStatus::kFailed;
  s.results[4].reason = "timestep too small <at> 1 & 2";
  s.results[4].edges.clear();
  FixedValue f;
  f.param = "L";
  f.value = 680e-9;
  s.spec.fixed.push_back(f);
  s.results[3].solver_aid = "gmin";
  std::vector<Plot> plots = {{"map_leg_high_on.svg", "map", ""},
                             {"curve_leg_high_on_margin.svg", "curve", ""},
                             {"deadtime_leg_high_on.svg", "chart", ""}};
  std::vector<bool> placed;
  std::string edges = HtmlEdgeSections(s.Input(), plots, &placed);
  EXPECT_NE(edges.find("id=\"edge-leg-high_on\""), std::string::npos);
  EXPECT_NE(edges.find("data-value=\"2.5\">2.5 A</td>"), std::string::npos) << edges;
  // The worst point is Iout = 0 A with margin -2.5 V.
  EXPECT_NE(edges.find("data-value=\"-2.5\">-2.5 V</td>"), std::string::npos);
  // Operating points in the unit's own symbol, sorting in sweep order.
  EXPECT_NE(edges.find("<td data-value=\"0\">Iout = 0 A</td>"), std::string::npos) << edges;
  EXPECT_EQ(edges.find("Iout=0"), std::string::npos);
  EXPECT_NE(edges.find("<table class=\"worst sortable\">"), std::string::npos);
  // The edge's map and dead-time chart sit in its section; the curve does not.
  EXPECT_NE(edges.find("src=\"map_leg_high_on.svg\""), std::string::npos);
  EXPECT_NE(edges.find("src=\"deadtime_leg_high_on.svg\""), std::string::npos);
  EXPECT_EQ(placed, (std::vector<bool>{true, false, true}));
  EXPECT_NE(edges.find("<td>larger Iout</td>"), std::string::npos);
  std::string failed = HtmlFailedPoints(s.Input());
  EXPECT_NE(failed.find("timestep too small &lt;at&gt; 1 &amp; 2"), std::string::npos);
  EXPECT_NE(failed.find("Iout = 4 A"), std::string::npos) << failed;
  std::string aids = HtmlSolverAids(s.Input());
  EXPECT_NE(aids.find("1 of 5 points ran with a solver aid (gmin 1)"), std::string::npos) << aids;
  EXPECT_NE(aids.find("<td>gmin</td><td class=\"num\" data-value=\"1\">1</td><td>3</td>"),
            std::string::npos)
      << aids;
  CellSpec cell;
  cell.name = "leg";
  cell.high_dead = "td_lh";
  s.tmpl.cells.push_back(cell);
  ParamDecl td;
  td.name = "td_lh";
  td.expression = "40n";
  s.tmpl.params.push_back(td);
  std::string settings = HtmlSettings(s.Input());
  // The dead time used, from the template's default, with its unit.
  EXPECT_NE(settings.find(
                "dead time leg.high_on (td_lh)</td><td class=\"num\" data-value=\"4e-08\">40 ns"),
            std::string::npos)
      << settings;
  EXPECT_NE(settings.find("680 nH"), std::string::npos);
  EXPECT_NE(HtmlRecommendedDeadTime(s.Input()).find("id=\"recommended-dead-time\""),
            std::string::npos);
}

// The hand calculation's worst point per prediction: 12 ns predicted where
// 10 ns was simulated is (10 - 12) / 12 = -16.7 % (definition of the relative
// difference in result/comparison.h), larger than -1/11 = -9.1 % elsewhere.
TEST(HtmlTablesTest, DisagreementsShowTheWorstPointPerPrediction) {
  auto s = MakeGrid({{"Iout", {0, 1, 2}}}, [](const auto& v) { return v[0] - 0.5; });
  for (size_t i = 0; i < 3; ++i) {
    Comparison c;
    c.metric = "t_transition_s";
    c.tag = "pred";
    c.predicted = i == 1 ? 12e-9 : 11e-9;
    c.difference = 10e-9 - c.predicted;
    c.relative_difference = c.difference / c.predicted;
    c.beyond_tolerance = i == 1;
    for (Metric& m : s.results[i].edges[0].metrics) {
      if (m.column == "t_transition_s") m.value = 10e-9;
    }
    s.results[i].edges[0].comparisons.push_back(c);
  }
  std::vector<bool> placed;
  std::string edges = HtmlEdgeSections(s.Input(), {}, &placed);
  EXPECT_NE(edges.find("<td>t_transition_s</td><td>pred</td><td class=\"num\" data-value=\"1\">1"
                       "</td><td data-value=\"1\">Iout = 1 A</td><td class=\"num\" "
                       "data-value=\"1e-08\">10 ns</td><td class=\"num\" data-value=\"1.2e-08\">12 "
                       "ns</td>"),
            std::string::npos)
      << edges;
  EXPECT_NE(edges.find("-16.7 %"), std::string::npos);
  std::string glance = HtmlAtAGlance(s.Input());
  EXPECT_NE(glance.find("-16.7 % (t_transition_s__pred)"), std::string::npos) << glance;
  EXPECT_NE(edges.find("1 of 3 points"), std::string::npos);
}

}  // namespace
}  // namespace zvsmap
