#include "report/plots.h"

#include <gtest/gtest.h>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::MakeGrid;

// Well-formedness per XML 1.0 (W3C) as pugixml checks it; SVG root element
// and namespace per SVG 1.1 (W3C). // from memory
pugi::xml_node ParseSvg(const std::string& text, pugi::xml_document* doc) {
  pugi::xml_parse_result r = doc->load_string(text.c_str());
  EXPECT_TRUE(r) << r.description();
  pugi::xml_node svg = doc->child("svg");
  EXPECT_STREQ(svg.attribute("xmlns").value(), "http://www.w3.org/2000/svg");
  return svg;
}

int Count(pugi::xml_node svg, const char* name) {
  int n = 0;
  for (pugi::xml_node c : svg.children(name)) n += c ? 1 : 0;
  return n;
}

TEST(PlotsTest, OneDimensionCurvesWithPrediction) {
  auto s = MakeGrid(
      {{"Iout", {0, 1, 2, 3, 4}}}, [](const auto& v) { return v[0] - 2.5; },
      [](const auto& v) {
        return std::vector<Metric>{{"v_turn_on_v__pred", 7.3 - v[0] + 0.1}};
      });
  std::vector<Plot> plots = MakePlots(s.Input());
  // Two edges x four metrics (margin, v_turn_on_v, i_commutated_a, t_transition_s).
  ASSERT_EQ(plots.size(), 8u);
  EXPECT_EQ(plots[0].file, "curve_leg_high_on_zvs_margin.svg");
  const Plot* von = nullptr;
  for (const Plot& p : plots) {
    if (p.file == "curve_leg_high_on_v_turn_on_v.svg") von = &p;
  }
  ASSERT_NE(von, nullptr);
  pugi::xml_document doc;
  pugi::xml_node svg = ParseSvg(von->svg, &doc);
  EXPECT_EQ(Count(svg, "circle"), 5 + 3);  // five points and three legend markers
  EXPECT_EQ(Count(svg, "polyline"), 2);    // simulated and hand calculation
  EXPECT_TRUE(svg.find_child_by_attribute("text", "text-anchor", "middle"));
  bool has_label = false;
  for (pugi::xml_node t : svg.children("text")) has_label |= std::string(t.text().get()) == "Iout";
  EXPECT_TRUE(has_label);
}

TEST(PlotsTest, TwoDimensionMapWithBoundary) {
  auto s = MakeGrid({{"L", {1e-6, 2e-6, 3e-6}}, {"Iout", {0, 1, 2, 3, 4, 5}}},
                    [](const auto& v) { return v[1] - 2.5 - v[0] * 0.5e6; });
  s.results[7].status = PointStatus::kFailed;
  s.results[7].reason = "a reason with <angle> & ampersand";
  s.results[7].edges.clear();
  std::vector<Plot> plots = MakePlots(s.Input());
  ASSERT_EQ(plots.size(), 2u);  // one map per edge
  EXPECT_EQ(plots[0].file, "map_leg_high_on.svg");
  pugi::xml_document doc;
  pugi::xml_node svg = ParseSvg(plots[0].svg, &doc);
  // Background + 18 cells + 5 legend swatches.
  EXPECT_EQ(Count(svg, "rect"), 1 + 18 + 5);
  // One boundary segment per row along Iout (three rows; the failed point in
  // row 1 removes that row's crossing) plus any along L, drawn 3 px wide.
  int thick = 0;
  for (pugi::xml_node l : svg.children("line")) {
    thick += std::string(l.attribute("stroke-width").value()) == "3.00" ? 1 : 0;
  }
  EXPECT_GE(thick, 1 + 2);  // legend sample + at least the two intact rows
  EXPECT_GT(plots[0].svg.size(), 1000u);
}

TEST(PlotsTest, NoSweptAxisNoPlots) {
  auto s = MakeGrid({{"Iout", {2}}}, [](const auto&) { return 1.0; });
  EXPECT_TRUE(MakePlots(s.Input()).empty());
}

}  // namespace
}  // namespace zvsmap
