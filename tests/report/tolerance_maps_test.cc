#include "report/tolerance_maps.h"

#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <map>
#include <pugixml.hpp>
#include <sstream>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::MakeEdge;
using testing_report::MakeGrid;
using testing_report::Synthetic;
using testing_report::TempDir;

std::string Read(const std::string& path) {
  std::ifstream in(path);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// The Wilson score interval written out again from its definition (E. B.
// Wilson, "Probable inference, the law of succession, and statistical
// inference", JASA 22, 1927, eq. for the score interval), with z = 1.959964
// for 95 % two-sided (the normal quantile, from any table).
std::pair<double, double> Wilson95(int passes, int n) {
  const double z = 1.959963985;
  double p = static_cast<double>(passes) / n;
  double centre = p + z * z / (2.0 * n);
  double half = z * std::sqrt(p * (1 - p) / n + z * z / (4.0 * n * n));
  double scale = 1 + z * z / n;
  return {(centre - half) / scale, (centre + half) / scale};
}

// tolerance.csv as rows of column name -> text, in file order.
std::vector<std::map<std::string, std::string>> ReadCsv(const std::string& path) {
  std::ifstream in(path);
  std::string line;
  std::vector<std::string> header;
  std::vector<std::map<std::string, std::string>> rows;
  auto split = [](const std::string& s) {
    std::vector<std::string> out;
    std::stringstream ss(s);
    std::string field;
    while (std::getline(ss, field, ',')) out.push_back(field);
    if (!s.empty() && s.back() == ',') out.push_back("");
    return out;
  };
  if (std::getline(in, line)) header = split(line);
  while (std::getline(in, line)) {
    std::vector<std::string> f = split(line);
    std::map<std::string, std::string> row;
    for (size_t k = 0; k < header.size() && k < f.size(); ++k) row[header[k]] = f[k];
    rows.push_back(row);
  }
  return rows;
}

// The map cells of an SVG file: data-point -> the rect element.
std::map<std::string, pugi::xml_node> Cells(const pugi::xml_document& doc) {
  std::map<std::string, pugi::xml_node> out;
  for (pugi::xml_node r : doc.child("svg").children("rect")) {
    if (r.attribute("data-point")) out[r.attribute("data-point").value()] = r;
  }
  return out;
}

// A 2 x 2 sweep (Iout x Vin) whose nominal points each have two corners of L
// and ten Monte Carlo samples; a sample passes when its energy margin is >= 0.
// Point k passes kPasses[k] of its ten samples; the corners' margins are set
// so that the worst corner is L+ at points 0 and 2 and L- at 1 and 3.
class ToleranceMapsTest : public ::testing::Test {
 protected:
  static constexpr int kPasses[4] = {10, 8, 3, 0};
  void SetUp() override {
    s_ = MakeGrid({{"Iout", {2, 4}}, {"Vin", {36, 48}}}, [](const auto&) { return 1.0; });
    ToleranceSpec& t = s_.spec.tolerances;
    t.used = true;
    t.seed = 7;
    t.samples = 10;
    t.pass = ToleranceSpec::Pass::kEnergy;
    VarySpec l;
    l.param = "L";
    l.within = 0.1;
    t.vary = {l};
    size_t n = s_.points.size();
    for (size_t k = 0; k < n; ++k) {
      s_.results[k].edges[0].metrics.push_back({"zvs_energy_margin", 0.1});
      double low = k % 2 ? -0.3 - 0.01 * k : 0.4, high = k % 2 ? 0.2 : -0.1 * (k + 1);
      AddVariant(k, VariantTag::Kind::kCorner, 0, low);
      AddVariant(k, VariantTag::Kind::kCorner, 1, high);
      for (unsigned m = 0; m < 10; ++m) {
        AddVariant(k, VariantTag::Kind::kSample, m,
                   static_cast<int>(m) < kPasses[k] ? 0.05 : -0.05);
      }
    }
  }
  void AddVariant(size_t nominal, VariantTag::Kind kind, unsigned number, double energy_margin) {
    Point p = s_.points[nominal];
    p.index = s_.points.size();
    p.variant = VariantTag{nominal, kind, number};
    PointResult r;
    r.index = p.index;
    r.status = PointStatus::kOk;
    r.edges.push_back(MakeEdge("leg", "high_on", energy_margin >= 0 ? 1 : -1,
                               {{"zvs_energy_margin", energy_margin},
                                {"zvs_timing_margin_early_s", 10e-9 + nominal * 1e-9},
                                {"zvs_timing_margin_late_s", 30e-9}}));
    s_.points.push_back(p);
    s_.results.push_back(r);
  }
  Synthetic s_;
};

TEST_F(ToleranceMapsTest, YieldMapDrawsTheYieldsAndIntervalsOfToleranceCsv) {
  std::string dir = TempDir("tolerance_maps");
  ReportOutcome outcome;
  std::string error;
  ASSERT_TRUE(
      WriteReports(ReportInput{s_.spec, s_.tmpl, s_.points, s_.results}, dir, &outcome, &error))
      << error;
  std::vector<std::map<std::string, std::string>> rows = ReadCsv(dir + "/tolerance.csv");
  pugi::xml_document svg;
  ASSERT_TRUE(svg.load_file((dir + "/yield_leg_high_on.svg").c_str()));
  std::map<std::string, pugi::xml_node> cells = Cells(svg);
  ASSERT_EQ(cells.size(), 4u);
  int checked = 0;
  for (const auto& row : rows) {
    if (row.at("edge") != "high_on") continue;
    const std::string& point = row.at("point");
    ASSERT_TRUE(cells.count(point)) << point;
    pugi::xml_node cell = cells[point];
    int passes = std::stoi(row.at("passes")), samples = std::stoi(row.at("samples"));
    EXPECT_EQ(samples, 10);
    EXPECT_EQ(passes, kPasses[std::stoi(point)]);
    // The drawn numbers are tolerance.csv's...
    EXPECT_DOUBLE_EQ(cell.attribute("data-value").as_double(), std::stod(row.at("yield")));
    EXPECT_DOUBLE_EQ(cell.attribute("data-low").as_double(), std::stod(row.at("yield_low")));
    EXPECT_DOUBLE_EQ(cell.attribute("data-high").as_double(), std::stod(row.at("yield_high")));
    EXPECT_EQ(cell.attribute("data-passes").as_int(), passes);
    // ...the interval is Wilson's, computed here independently...
    auto [low, high] = Wilson95(passes, samples);
    EXPECT_NEAR(cell.attribute("data-low").as_double(), low, 1e-6) << point;
    EXPECT_NEAR(cell.attribute("data-high").as_double(), high, 1e-6) << point;
    // ...the colour is the yield's band and the tooltip says the interval.
    double yield = static_cast<double>(passes) / samples;
    EXPECT_EQ(cell.attribute("fill").value(), YieldColour(yield));
    std::string tip = cell.child("title").text().get();
    char expected[64];
    std::snprintf(expected, sizeof expected, "Wilson interval %.1f %% to %.1f %%", low * 100,
                  high * 100);
    EXPECT_NE(tip.find(expected), std::string::npos) << tip;
    ++checked;
  }
  EXPECT_EQ(checked, 4);
  // Bands: 10/10 in the top band, 0/10 in the bottom one.
  EXPECT_EQ(std::string(cells["0"].attribute("fill").value()), YieldBands().front().colour);
  EXPECT_EQ(std::string(cells["3"].attribute("fill").value()), YieldBands().back().colour);
  std::string html = Read(dir + "/index.html");
  for (const char* file :
       {"yield_leg_high_on.svg", "worst_energy_leg_high_on.svg", "worst_timing_leg_high_on.svg"}) {
    EXPECT_NE(html.find(std::string("<img src=\"") + file + "\""), std::string::npos) << file;
  }
}

TEST_F(ToleranceMapsTest, WorstCaseMapsDrawTheWorstCornerOfToleranceCsv) {
  std::string dir = TempDir("tolerance_worst");
  ReportOutcome outcome;
  std::string error;
  ASSERT_TRUE(
      WriteReports(ReportInput{s_.spec, s_.tmpl, s_.points, s_.results}, dir, &outcome, &error))
      << error;
  std::vector<std::map<std::string, std::string>> rows = ReadCsv(dir + "/tolerance.csv");
  pugi::xml_document energy, timing;
  ASSERT_TRUE(energy.load_file((dir + "/worst_energy_leg_high_on.svg").c_str()));
  ASSERT_TRUE(timing.load_file((dir + "/worst_timing_leg_high_on.svg").c_str()));
  std::map<std::string, pugi::xml_node> e = Cells(energy), t = Cells(timing);
  int checked = 0;
  for (const auto& row : rows) {
    if (row.at("edge") != "high_on") continue;
    int k = std::stoi(row.at("point"));
    pugi::xml_node cell = e[row.at("point")];
    EXPECT_DOUBLE_EQ(cell.attribute("data-value").as_double(),
                     std::stod(row.at("worst_energy_margin")));
    // The corners set above: the lower of the two margins, at its corner.
    double low = k % 2 ? -0.3 - 0.01 * k : 0.4, high = k % 2 ? 0.2 : -0.1 * (k + 1);
    EXPECT_DOUBLE_EQ(cell.attribute("data-value").as_double(), std::min(low, high));
    EXPECT_STREQ(cell.attribute("data-corner").value(), k % 2 ? "L-" : "L+");
    EXPECT_EQ(row.at("worst_energy_corner"), k % 2 ? "L-" : "L+");
    // Negative margins red, positive green (the scale's two ends).
    std::string fill = cell.attribute("fill").value();
    EXPECT_TRUE(fill.size() == 7 && fill[0] == '#') << fill;
    unsigned r = 0, g = 0, b = 0;
    std::sscanf(fill.c_str() + 1, "%2x%2x%2x", &r, &g, &b);
    EXPECT_GT(r, g) << "a negative margin is drawn in the warm colour: " << fill;
    EXPECT_DOUBLE_EQ(t[row.at("point")].attribute("data-value").as_double(),
                     std::stod(row.at("worst_timing_margin_s")));
    EXPECT_NEAR(t[row.at("point")].attribute("data-value").as_double(), 10e-9 + k * 1e-9, 1e-15);
    ++checked;
  }
  EXPECT_EQ(checked, 4);
}

TEST_F(ToleranceMapsTest, OneSweptAxisGivesOneRowAndNoBlockGivesNoMap) {
  Synthetic one = MakeGrid({{"Iout", {2, 4, 6}}}, [](const auto&) { return 1.0; });
  EXPECT_TRUE(MakeToleranceMaps(one.Input()).empty());  // no <tolerances> block
  one.spec.tolerances = s_.spec.tolerances;
  for (size_t k = 0; k < 3; ++k) {
    Point p = one.points[k];
    p.index = one.points.size();
    p.variant = VariantTag{k, VariantTag::Kind::kSample, 0};
    PointResult r;
    r.index = p.index;
    r.status = PointStatus::kOk;
    r.edges.push_back(MakeEdge("leg", "high_on", 1, {{"zvs_energy_margin", k == 1 ? -1.0 : 1.0}}));
    one.points.push_back(p);
    one.results.push_back(r);
  }
  std::vector<Point> nominal(one.points.begin(), one.points.begin() + 3);
  std::vector<PointResult> nominal_results(one.results.begin(), one.results.begin() + 3);
  ReportBasis basis(ReportInput{one.spec, one.tmpl, nominal, nominal_results});
  basis.tolerance =
      SummarizeTolerances(one.spec.tolerances, one.points, one.results, ChooseMargin(one.results));
  std::vector<Plot> plots = MakeToleranceMaps(basis);
  ASSERT_EQ(plots.size(), 1u);  // samples only: the yield map of leg.high_on
  EXPECT_EQ(plots[0].file, "yield_leg_high_on.svg");
  pugi::xml_document doc;
  ASSERT_TRUE(doc.load_string(plots[0].svg.c_str()));
  std::map<std::string, pugi::xml_node> cells = Cells(doc);
  ASSERT_EQ(cells.size(), 3u);
  EXPECT_DOUBLE_EQ(cells["0"].attribute("data-value").as_double(), 1.0);
  EXPECT_DOUBLE_EQ(cells["1"].attribute("data-value").as_double(), 0.0);
  // One row: every cell at the same height.
  EXPECT_STREQ(cells["0"].attribute("y").value(), cells["2"].attribute("y").value());
}

}  // namespace
}  // namespace zvsmap
