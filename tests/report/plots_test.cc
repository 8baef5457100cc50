#include "report/plots.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <regex>

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
  // Simulated, hand calculation (dashed) and the ZVS limit line.
  EXPECT_EQ(Count(svg, "polyline"), 3);
  int dashed = 0;
  for (pugi::xml_node l : svg.children("polyline")) {
    dashed += l.attribute("stroke-dasharray") ? 1 : 0;
  }
  EXPECT_EQ(dashed, 1);
  EXPECT_TRUE(svg.find_child_by_attribute("text", "text-anchor", "middle"));
  // Units on both axes; ticks at 1-2-5 steps (common practice): the x axis
  // 0..4 A shows 0 A, 1 A ... (or 0.5 A steps), never 0.667 A.
  std::vector<std::string> texts;
  for (pugi::xml_node t : svg.children("text")) texts.push_back(t.text().get());
  auto has = [&](const std::string& x) {
    return std::find(texts.begin(), texts.end(), x) != texts.end();
  };
  EXPECT_TRUE(has("Iout [A]"));
  EXPECT_TRUE(has("v_turn_on_v [V]"));
  EXPECT_TRUE(has("2 A"));
  EXPECT_TRUE(has("ZVS limit"));
}

// A dimensionless margin is printed plainly, never with SI prefixes.
TEST(PlotsTest, DimensionlessMarginTicksArePlainNumbers) {
  auto s = MakeGrid(
      {{"Iout", {0, 1, 2, 3, 4}}}, [](const auto& v) { return v[0] - 2.5; },
      [](const auto& v) {
        return std::vector<Metric>{{"zvs_energy_margin", (v[0] - 2) * 1e-4}};
      });
  std::vector<Plot> plots = MakePlots(s.Input());
  ASSERT_FALSE(plots.empty());
  ASSERT_EQ(plots[0].file, "curve_leg_high_on_zvs_margin.svg");
  pugi::xml_document doc;
  pugi::xml_node svg = ParseSvg(plots[0].svg, &doc);
  for (pugi::xml_node t : svg.children("text")) {
    std::string text = t.text().get();
    // No number followed by a prefix letter ("-100u", "200 \u00b5").
    EXPECT_FALSE(std::regex_search(text, std::regex("[0-9] ?(u|n|m|p|\u00b5)( |$)"))) << text;
  }
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
  // Background, 18 cells and one legend swatch per class present: full,
  // partial or hard by the margins, and the failed point.
  std::vector<std::string> texts;
  for (pugi::xml_node t : svg.children("text")) texts.push_back(t.text().get());
  auto has = [&](const std::string& x) {
    return std::find(texts.begin(), texts.end(), x) != texts.end();
  };
  EXPECT_TRUE(has("full ZVS"));
  EXPECT_TRUE(has("did not run"));
  EXPECT_FALSE(has("unknown"));
  int swatches = has("full ZVS") + has("partial") + has("hard") + has("did not run");
  EXPECT_EQ(Count(svg, "rect"), 1 + 18 + swatches);
  EXPECT_TRUE(has("Iout [A]"));
  EXPECT_TRUE(has("L [H]"));
  EXPECT_TRUE(has("2 \u00b5H"));
  // The boundary follows the colours: every 3 px segment but the legend's
  // lies on a border between two cells (x or y on the cell lattice), and
  // there is one per class change between measured neighbours.
  pugi::xml_node first_cell = svg.child("rect").next_sibling("rect");
  double x0 = first_cell.attribute("x").as_double(), y0 = first_cell.attribute("y").as_double();
  double cw = first_cell.attribute("width").as_double();
  double ch = first_cell.attribute("height").as_double();
  int thick = 0, on_lattice = 0;
  for (pugi::xml_node l : svg.children("line")) {
    if (std::string(l.attribute("stroke-width").value()) != "3.00") continue;
    ++thick;
    double x1 = l.attribute("x1").as_double(), y1 = l.attribute("y1").as_double();
    double fx = (x1 - x0) / cw, fy = (y1 - y0) / ch;
    on_lattice += std::fabs(fx - std::round(fx)) < 1e-3 && std::fabs(fy - std::round(fy)) < 1e-3;
  }
  EXPECT_GE(thick, 1 + 2);  // legend sample + at least the two intact rows
  EXPECT_EQ(on_lattice, thick - 1);
  EXPECT_GT(plots[0].svg.size(), 1000u);
}

TEST(PlotsTest, NoSweptAxisNoPlots) {
  auto s = MakeGrid({{"Iout", {2}}}, [](const auto&) { return 1.0; });
  EXPECT_TRUE(MakePlots(s.Input()).empty());
}

}  // namespace
}  // namespace zvsmap
