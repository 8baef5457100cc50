#include "report/summary_xml.h"

#include <gtest/gtest.h>

#include <fstream>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::AddRequirement;
using testing_report::MakeGrid;
using testing_report::TempDir;
using testing_report::ValidateSummary;

// Writes the summary of `s` and checks it against the XSD with xmllint
// (W3C XML Schema 1.0, as libxml2 implements it).
pugi::xml_document WriteAndValidate(const testing_report::Synthetic& s, const std::string& name) {
  auto input = s.Input();
  pugi::xml_document doc;
  BuildSummaryXml(input, EvaluateRequirements(input), &doc);
  std::string path = TempDir("summary") + "/" + name + ".xml";
  EXPECT_TRUE(doc.save_file(path.c_str()));
  EXPECT_EQ(ValidateSummary(path), 0) << path;
  return doc;
}

TEST(SummaryXmlTest, OneDimensionBoundaryAndCounts) {
  auto s = MakeGrid({{"x", {0, 1, 2, 3, 4, 5}}}, [](const auto& v) { return v[0] - 2.5; });
  AddRequirement(&s, R"(<require edge="leg.high_on" class="full" where="x >= 3"/>)", 4);
  pugi::xml_document doc = WriteAndValidate(s, "one_dim");
  pugi::xml_node root = doc.child("zvs-summary");
  pugi::xml_node edge = root.find_child_by_attribute("edge", "name", "high_on");
  ASSERT_TRUE(edge);
  // margins -2.5 -1.5 -0.5 (partial: v_on < 24 V) then 0.5 1.5 2.5 (full).
  EXPECT_EQ(edge.child("counts").attribute("full").as_int(), 3);
  EXPECT_EQ(edge.child("counts").attribute("partial").as_int(), 3);
  pugi::xml_node b = edge.child("zvs-region").child("boundary");
  EXPECT_STREQ(b.attribute("along").value(), "x");
  EXPECT_DOUBLE_EQ(b.attribute("value").as_double(), 2.5);  // linear interpolation, exact
  EXPECT_STREQ(b.attribute("method").value(), "margin-zero");
  EXPECT_STREQ(edge.child("zvs-region").attribute("located-on").value(),
               "v_residual_limit_v - v_turn_on_v");
  EXPECT_DOUBLE_EQ(edge.child("worst-margin").attribute("value").as_double(), -2.5);
  EXPECT_EQ(edge.child("worst-margin").attribute("point").as_int(), 0);
  EXPECT_FALSE(edge.child("range"));  // no t_zvs or window columns
  EXPECT_EQ(root.child("requirements").attribute("failed").as_int(), 0);
}

TEST(SummaryXmlTest, TwoDimensionsFailedPointsRangesAndWindow) {
  auto s = MakeGrid(
      {{"L", {1e-6, 2e-6}}, {"Iout", {0, 2, 4}}},
      [](const auto& v) { return 3 - v[1] - v[0] * 1e6; },
      [](const auto& v) {
        return std::vector<Metric>{{"t_zvs_s", 20e-9 + v[1] * 1e-9}, {"t_ring_back_s", 90e-9}};
      });
  s.results[1].status = PointStatus::kFailed;
  s.results[1].reason = "timestep too small at 1.2 us & <node>";
  s.results[1].edges.clear();
  s.results[5].status = PointStatus::kUnsettled;
  s.results[5].reason = "did not settle in 1000 periods";
  AddRequirement(&s, R"(<require edge="leg.high_on" metric="zvs_margin" min="0.2"/>)", 9);
  pugi::xml_document doc = WriteAndValidate(s, "two_dim");
  pugi::xml_node root = doc.child("zvs-summary");
  EXPECT_EQ(root.child("failed-points").attribute("count").as_int(), 2);
  EXPECT_STREQ(root.child("failed-points").child("point").attribute("reason").value(),
               "timestep too small at 1.2 us & <node>");
  pugi::xml_node edge = root.find_child_by_attribute("edge", "name", "high_on");
  EXPECT_EQ(edge.child("counts").attribute("failed").as_int(), 1);
  EXPECT_EQ(edge.child("counts").attribute("unsettled").as_int(), 1);
  pugi::xml_node range = edge.find_child_by_attribute("range", "quantity", "t-zvs");
  ASSERT_TRUE(range);
  EXPECT_DOUBLE_EQ(range.attribute("min").as_double(), 20e-9);  // Iout = 0
  EXPECT_DOUBLE_EQ(range.attribute("max").as_double(), 24e-9);  // Iout = 4 (point 2)
  EXPECT_TRUE(edge.find_child_by_attribute("range", "quantity", "dead-time-window-end"));
  EXPECT_EQ(root.child("requirements").attribute("failed").as_int(), 1);
}

TEST(SummaryXmlTest, NoEdgesAtAllStillValid) {
  auto s = MakeGrid({{"x", {0, 1}}}, [](const auto&) { return 1.0; });
  for (auto& r : s.results) {
    r.status = PointStatus::kFailed;
    r.reason = "not run";
    r.edges.clear();
  }
  pugi::xml_document doc = WriteAndValidate(s, "no_edges");
  EXPECT_FALSE(doc.child("zvs-summary").child("edge"));
}

}  // namespace
}  // namespace zvsmap
