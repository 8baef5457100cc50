#include "report/tolerance_report.h"

#include <gtest/gtest.h>

#include <sstream>

#include "report/requirements.h"
#include "report/summary_xml.h"
#include "report_fixture.h"

namespace zvsmap {
namespace {

// One nominal point with two corners (L-, L+) and ten samples whose energy
// margins the test sets by hand; every expectation follows from the
// definitions (README "Tolerances and yield"); the interval is Wilson's
// (E. B. Wilson, JASA 22, 1927), 8 of 10 at 95 %: [0.490162, 0.943318] worked
// by hand in tests/core/statistics_test.cc.
class ToleranceReportTest : public ::testing::Test {
 protected:
  void SetUp() override {
    spec_.path = "sweeps/synthetic.xml";
    ToleranceSpec& t = spec_.tolerances;
    t.used = true;
    t.seed = 1;
    t.samples = 10;
    t.pass = ToleranceSpec::Pass::kEnergy;
    VarySpec l;
    l.param = "L";
    l.within = 0.1;
    l.spread = VarySpec::Spread::kNormal;
    l.sigma = 0.05;
    t.vary = {l};
    Add(Nominal(), 0.2, 10e-9);
    Add(Variant(VariantTag::Kind::kCorner, 0), 0.3, 12e-9);  // L-
    Add(Variant(VariantTag::Kind::kCorner, 1), -0.1, 4e-9);  // L+
    const double margins[10] = {0.1, 0.2, -0.05, 0.3, 0.15, -0.2, 0.05, 0.25, 0.12, 0.02};
    for (unsigned s = 0; s < 10; ++s) {
      Add(Variant(VariantTag::Kind::kSample, s), margins[s], 8e-9);
    }
  }
  Point Nominal() const {
    Point p;
    p.index = 0;
    p.values = {{"Iout", 2}};
    return p;
  }
  Point Variant(VariantTag::Kind kind, unsigned number) const {
    Point p = Nominal();
    p.index = points_.size();
    p.variant = VariantTag{0, kind, number};
    return p;
  }
  void Add(Point p, double energy_margin, double timing_late_s) {
    PointResult r;
    r.index = p.index;
    r.status = PointStatus::kOk;
    r.edges.push_back(testing_report::MakeEdge("leg", "high_on", 1,
                                               {{"zvs_energy_margin", energy_margin},
                                                {"zvs_timing_margin_early_s", 20e-9},
                                                {"zvs_timing_margin_late_s", timing_late_s}}));
    points_.push_back(std::move(p));
    results_.push_back(std::move(r));
  }
  ToleranceSummary Summary() const {
    return SummarizeTolerances(spec_.tolerances, points_, results_, ChooseMargin(results_));
  }
  SweepSpec spec_;
  Template tmpl_;
  std::vector<Point> points_;
  std::vector<PointResult> results_;
};

TEST_F(ToleranceReportTest, WorstCornersAndYield) {
  ToleranceSummary s = Summary();
  ASSERT_EQ(s.points.size(), 1u);
  ASSERT_EQ(s.points[0].edges.size(), 1u);
  const EdgeTolerance& t = s.points[0].edges[0];
  EXPECT_EQ(t.key.Label(), "leg.high_on");
  EXPECT_EQ(t.corners, 2);
  EXPECT_DOUBLE_EQ(t.worst_energy_margin, -0.1);
  EXPECT_EQ(t.worst_energy_corner, "L+");
  EXPECT_DOUBLE_EQ(t.worst_timing_margin_s, 4e-9);
  EXPECT_EQ(t.worst_timing_corner, "L+");
  EXPECT_EQ(t.samples, 10);
  EXPECT_EQ(t.passes, 8);  // margins -0.05 and -0.2 fail
  EXPECT_DOUBLE_EQ(t.yield, 0.8);
  EXPECT_NEAR(t.interval.low, 0.490162, 1e-6);
  EXPECT_NEAR(t.interval.high, 0.943318, 1e-6);
  EXPECT_EQ(t.worst_sample, 5);
  EXPECT_DOUBLE_EQ(t.worst_sample_margin, -0.2);
  std::ostringstream csv;
  WriteToleranceCsv(csv, s);
  std::string text = csv.str();
  EXPECT_EQ(text.substr(0, text.find('\n')),
            "point,Iout,cell,edge,corners,worst_energy_margin,worst_energy_corner,"
            "worst_timing_margin_s,worst_timing_corner,samples,passes,unmeasured,pass_rule,yield,"
            "yield_low,yield_high,confidence,worst_sample,worst_sample_margin");
  EXPECT_NE(text.find("\n0,2,leg,high_on,2,-0.1,L+,4e-09,L+,10,8,0,energy,0.8,0.490"),
            std::string::npos)
      << text;
}

TEST_F(ToleranceReportTest, FailedSamplesAreUnmeasuredNotFailures) {
  results_.back().status = PointStatus::kFailed;  // sample 9 (margin 0.02) did not run
  ToleranceSummary s = Summary();
  const EdgeTolerance& t = s.points[0].edges[0];
  EXPECT_EQ(t.samples, 9);
  EXPECT_EQ(t.passes, 7);
  EXPECT_EQ(t.unmeasured, 1);
}

TEST_F(ToleranceReportTest, RequirementsOnYieldAndWorstMargin) {
  RequirementSpec yield;
  yield.kind = RequirementSpec::Kind::kYield;
  yield.edge = "high_on";
  yield.min = 0.99;
  yield.where = {"sweeps/synthetic.xml", 9, 3};
  RequirementSpec lenient = yield;
  lenient.min = 0.8;
  RequirementSpec worst;
  worst.kind = RequirementSpec::Kind::kWorstMargin;
  worst.edge = "high_on";
  worst.min = -0.15;
  spec_.requirements = {yield, lenient, worst};
  // The reports see the nominal points; the summary comes from all points.
  std::vector<Point> nominal = {points_[0]};
  std::vector<PointResult> nominal_results = {results_[0]};
  ReportBasis basis(ReportInput{spec_, tmpl_, nominal, nominal_results});
  basis.tolerance = Summary();
  std::vector<RequirementVerdict> v = EvaluateRequirements(basis);
  ASSERT_EQ(v.size(), 3u);
  EXPECT_FALSE(v[0].held);
  EXPECT_EQ(v[0].title,
            "sweeps/synthetic.xml:9: every cell's high_on ZVS yield >= 99% at each point over the "
            "whole grid");
  ASSERT_EQ(v[0].details.size(), 1u);
  EXPECT_NE(v[0].details[0].find("leg.high_on yield 80% (49.02% to 94.33% at 95%) over 10 "
                                 "samples, worst sample 5"),
            std::string::npos)
      << v[0].details[0];
  EXPECT_TRUE(v[1].held) << v[1].message;
  EXPECT_TRUE(v[2].held) << v[2].message;  // worst corner -0.1 >= -0.15
  spec_.requirements[2].min = 0;
  v = EvaluateRequirements(basis);
  EXPECT_FALSE(v[2].held);
}

TEST_F(ToleranceReportTest, SummaryXmlCarriesTheWorstCornerAndTheYield) {
  std::vector<Point> nominal = {points_[0]};
  std::vector<PointResult> nominal_results = {results_[0]};
  ReportBasis basis(ReportInput{spec_, tmpl_, nominal, nominal_results});
  basis.tolerance = Summary();
  pugi::xml_document doc;
  BuildSummaryXml(basis, {}, &doc);
  pugi::xml_node block = doc.select_node("/zvs-summary/tolerances").node();
  ASSERT_TRUE(block);
  EXPECT_STREQ(block.attribute("pass").value(), "energy");
  EXPECT_STREQ(block.child("vary").attribute("spread").value(), "normal");
  pugi::xml_node e = block.select_node("point[@index='0']/edge[@name='leg.high_on']").node();
  ASSERT_TRUE(e);
  EXPECT_STREQ(e.attribute("worst-energy-corner").value(), "L+");
  EXPECT_DOUBLE_EQ(e.attribute("worst-energy-margin").as_double(), -0.1);
  EXPECT_EQ(e.attribute("samples").as_int(), 10);
  EXPECT_EQ(e.attribute("passes").as_int(), 8);
  EXPECT_NEAR(e.attribute("yield-low").as_double(), 0.490162, 1e-6);
  EXPECT_EQ(e.attribute("worst-sample").as_int(), 5);
}

// A tolerance on a device's parameter: <vary device=...> in summary.xml, valid
// against the schema (sweeps/schema/zvsmap-summary.xsd), and its corners named
// "device.param" in the worst-corner attribute.
TEST_F(ToleranceReportTest, DeviceParameterVaryIsNamedWithItsDevice) {
  VarySpec& v = spec_.tolerances.vary[0];
  v.device = "lin";
  v.param = "coss_f";
  std::vector<Point> nominal = {points_[0]};
  std::vector<PointResult> nominal_results = {results_[0]};
  ReportBasis basis(ReportInput{spec_, tmpl_, nominal, nominal_results});
  basis.tolerance = Summary();
  pugi::xml_document doc;
  BuildSummaryXml(basis, {}, &doc);
  pugi::xml_node vary = doc.select_node("/zvs-summary/tolerances/vary").node();
  EXPECT_STREQ(vary.attribute("device").value(), "lin");
  EXPECT_STREQ(vary.attribute("param").value(), "coss_f");
  pugi::xml_node e = doc.select_node("//edge[@name='leg.high_on']").node();
  EXPECT_STREQ(e.attribute("worst-energy-corner").value(), "lin.coss_f+");
  std::string path = testing_report::TempDir("tolerance_device") + "/summary.xml";
  ASSERT_TRUE(doc.save_file(path.c_str()));
  EXPECT_EQ(testing_report::ValidateSummary(path), 0);
}

}  // namespace
}  // namespace zvsmap
