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
  std::string edges = HtmlEdgeSections(s.Input());
  EXPECT_NE(edges.find("id=\"edge-leg-high_on\""), std::string::npos);
  EXPECT_NE(edges.find("data-value=\"2.5\">2.5 A</td>"), std::string::npos) << edges;
  // The worst point is Iout = 0 A with margin -2.5 V.
  EXPECT_NE(edges.find("data-value=\"-2.5\">-2.5 V</td>"), std::string::npos);
  std::string failed = HtmlFailedPoints(s.Input());
  EXPECT_NE(failed.find("timestep too small &lt;at&gt; 1 &amp; 2"), std::string::npos);
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

}  // namespace
}  // namespace zvsmap
