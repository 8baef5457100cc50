#include "sweep/requirement_parser.h"

#include <gtest/gtest.h>

#include <cmath>

#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

// Expected values and messages are the <require> element's own specification,
// written by hand from the format description. // common practice, no source
class RequirementParserTest : public ::testing::Test {
 protected:
  static std::string Sweep(const std::string& body) {
    return "<sweep>\n  <template file=\"../netlists/buck.cir\"/>\n"
           "  <axis param=\"Iout\" values=\"0 2 4\"/>\n" +
           body + "</sweep>\n";
  }
  SweepSpec Parse(const std::string& xml) {
    SweepSpec spec;
    Diagnostic error;
    EXPECT_TRUE(ParseSweepText(xml, "sweeps/demo.xml", &spec, &error)) << error.Format();
    return spec;
  }
  std::string Error(const std::string& xml) {
    SweepSpec spec;
    Diagnostic error;
    EXPECT_FALSE(ParseSweepText(xml, "sweeps/demo.xml", &spec, &error));
    return error.where.file + ":" + std::to_string(error.where.line) + ": " + error.message;
  }
};

TEST_F(RequirementParserTest, ThreeKinds) {
  SweepSpec spec = Parse(
      Sweep("  <require edge=\"leg.high_on\" class=\"full\" where=\"Iout >= 2\"/>\n"
            "  <require edge=\"leg.high_on\" metric=\"zvs_margin\" min=\"0.2\" name=\"margin\"/>\n"
            "  <require edge=\"low_on\" dead-time-within-window=\"true\"/>\n"));
  ASSERT_EQ(spec.requirements.size(), 3u);
  const RequirementSpec& a = spec.requirements[0];
  EXPECT_EQ(a.kind, RequirementSpec::Kind::kClass);
  EXPECT_EQ(a.cell, "leg");
  EXPECT_EQ(a.edge, "high_on");
  EXPECT_EQ(a.min_class, "full");
  EXPECT_EQ(a.where_expression, "Iout >= 2");
  EXPECT_EQ(a.where_names, std::vector<std::string>{"Iout"});
  EXPECT_EQ(a.where.line, 4);
  EXPECT_EQ(a.Describe(), "leg.high_on full ZVS where Iout >= 2");
  const RequirementSpec& b = spec.requirements[1];
  EXPECT_EQ(b.kind, RequirementSpec::Kind::kMetric);
  EXPECT_DOUBLE_EQ(b.min, 0.2);
  EXPECT_TRUE(std::isnan(b.max));
  EXPECT_EQ(b.name, "margin");
  EXPECT_EQ(b.Describe(), "leg.high_on zvs_margin >= 200m over the whole grid");
  const RequirementSpec& c = spec.requirements[2];
  EXPECT_EQ(c.kind, RequirementSpec::Kind::kDeadTimeWindow);
  EXPECT_EQ(c.cell, "");
  EXPECT_EQ(c.Describe(),
            "every cell's low_on dead time within the measured window over the whole grid");
}

TEST_F(RequirementParserTest, GivenDeadTimeWithinTheWindow) {
  SweepSpec spec =
      Parse(Sweep("  <require edge=\"high_on\" dead-time=\"45n\" within-window=\"true\" "
                  "where=\"Iout > 0\"/>\n"));
  ASSERT_EQ(spec.requirements.size(), 1u);
  const RequirementSpec& r = spec.requirements[0];
  EXPECT_EQ(r.kind, RequirementSpec::Kind::kGivenDeadTime);
  EXPECT_DOUBLE_EQ(r.dead_time_s, 45e-9);
  EXPECT_EQ(r.Describe(),
            "every cell's high_on dead time 45ns within the probe's window where Iout > 0");
}

TEST_F(RequirementParserTest, GivenDeadTimeErrors) {
  EXPECT_EQ(Error(Sweep("  <require edge=\"high_on\" dead-time=\"45n\"/>\n")),
            "sweeps/demo.xml:4: 'dead-time' needs within-window=\"true\" (the dead time lies "
            "inside the probe's window at every point)");
  EXPECT_EQ(Error(Sweep("  <require edge=\"high_on\" within-window=\"true\"/>\n")),
            "sweeps/demo.xml:4: 'within-window' goes with 'dead-time' (e.g. dead-time=\"45n\" "
            "within-window=\"true\")");
  EXPECT_EQ(Error(Sweep("  <require edge=\"high_on\" dead-time=\"45n\" within-window=\"yes\"/>\n")),
            "sweeps/demo.xml:4: 'within-window' takes \"true\" (leave the requirement out "
            "otherwise)");
  EXPECT_EQ(Error(Sweep("  <require edge=\"high_on\" dead-time=\"0\" within-window=\"true\"/>\n")),
            "sweeps/demo.xml:4: 'dead-time' must be > 0 (it is 0)");
  EXPECT_EQ(
      Error(Sweep("  <require edge=\"high_on\" dead-time=\"fast\" within-window=\"true\"/>\n")),
      "sweeps/demo.xml:4: bad number 'fast' in attribute 'dead-time'");
  // SPICE reads M as milli (common practice; ngspice manual, "Scale factors"): refused
  // like every other number of the sweep file, with what it reads.
  std::string milli =
      Error(Sweep("  <require edge=\"high_on\" dead-time=\"45M\" within-window=\"true\"/>\n"));
  EXPECT_EQ(milli.rfind("sweeps/demo.xml:4: in attribute 'dead-time': ", 0), 0u) << milli;
  EXPECT_NE(milli.find("milli"), std::string::npos) << milli;
  EXPECT_EQ(Error(Sweep("  <require edge=\"high_on\" dead-time=\"45n\" within-window=\"true\" "
                        "dead-time-within-window=\"true\"/>\n")),
            "sweeps/demo.xml:4: <require> takes exactly one of 'class', 'metric', "
            "'dead-time-within-window', 'dead-time' (with within-window=\"true\"), 'yield-min' "
            "or 'worst-margin-min'");
}

TEST_F(RequirementParserTest, ErrorsNameFileAndLine) {
  EXPECT_EQ(
      Error(Sweep("  <require edge=\"leg.high_on\" class=\"ful\"/>\n")),
      "sweeps/demo.xml:4: bad class 'ful' (use \"full\", or \"partial\" for full or partial)");
  EXPECT_EQ(Error(Sweep("  <require edge=\"leg.high_on\" class=\"full\" metric=\"x\"/>\n")),
            "sweeps/demo.xml:4: <require> takes exactly one of 'class', 'metric', "
            "'dead-time-within-window', 'dead-time' (with within-window=\"true\"), 'yield-min' "
            "or 'worst-margin-min'");
  EXPECT_EQ(Error(Sweep("  <require edge=\"leg.high_on\" metric=\"zvs_margin\"/>\n")),
            "sweeps/demo.xml:4: <require metric=...> needs 'min', 'max' or both");
  EXPECT_EQ(Error(Sweep("  <require edge=\"leg.high_on\" class=\"full\" wher=\"1\"/>\n")),
            "sweeps/demo.xml:4: unknown attribute 'wher' on <require> (did you mean 'where'?)");
  EXPECT_EQ(Error(Sweep("  <require class=\"full\"/>\n")),
            "sweeps/demo.xml:4: <require> needs 'edge' (\"cell.edge\" or \"edge\")");
  EXPECT_EQ(Error(Sweep("\n  <require edge=\"leg.high_on\" class=\"full\" where=\"Iuot > 2\"/>\n")),
            "sweeps/demo.xml:5: where-expression names 'Iuot', which the sweep does not set (did "
            "you mean 'Iout'?)");
  std::string bad =
      Error(Sweep("  <require edge=\"leg.high_on\" class=\"full\" where=\"Iout >\"/>\n"));
  EXPECT_EQ(bad.rfind("sweeps/demo.xml:4: bad where-expression 'Iout >': ", 0), 0u) << bad;
}

}  // namespace
}  // namespace zvsmap
