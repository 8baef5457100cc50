// <predict> elements of the sweep file. The expected text, line and values
// are the format's own specification (written by hand, not produced by
// running the parser).
#include "sweep/prediction_parser.h"

#include <gtest/gtest.h>

#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

class PredictionParserTest : public ::testing::Test {
 protected:
  // The <predict> element is on line 3.
  std::string Error(const std::string& element) {
    std::string xml = "<sweep>\n  <template file=\"b.cir\"/>\n  " + element + "\n</sweep>\n";
    SweepSpec spec;
    Diagnostic error;
    EXPECT_FALSE(ParseSweepText(xml, "s.xml", &spec, &error));
    return error.Format();
  }
};

TEST_F(PredictionParserTest, ReadsAllAttributes) {
  std::string xml =
      "<sweep>\n  <template file=\"b.cir\"/>\n"
      "  <predict name=\"t_s\" expr=\"2*Coss*Vin/abs(i_valley_a)\" compare=\"t_transition_s\"\n"
      "           edge=\"high_on\" cell=\"leg\" tolerance=\"0.5n\"/>\n"
      "  <predict name=\"q\" expr=\"Coss*Vin\"/>\n</sweep>\n";
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(ParseSweepText(xml, "s.xml", &spec, &error)) << error.Format();
  ASSERT_EQ(spec.predictions.size(), 2u);
  const PredictionSpec& p = spec.predictions[0];
  EXPECT_EQ(p.name, "t_s");
  EXPECT_EQ(p.expression, "2*Coss*Vin/abs(i_valley_a)");
  EXPECT_EQ(p.compare, "t_transition_s");
  EXPECT_EQ(p.edge, "high_on");
  EXPECT_EQ(p.cell, "leg");
  EXPECT_DOUBLE_EQ(p.tolerance_abs, 0.5e-9);
  EXPECT_EQ(p.tolerance_rel, 0.0);
  EXPECT_EQ(p.names, (std::vector<std::string>{"Coss", "Vin", "i_valley_a"}));
  EXPECT_EQ(p.where.line, 3);
  EXPECT_EQ(spec.predictions[1].tolerance_rel, 0.05);  // default 5 %
}

TEST_F(PredictionParserTest, SyntaxErrorNamesTheColumn) {
  EXPECT_EQ(Error("<predict name=\"t\" expr=\"2*(Vin\"/>"),
            "s.xml:3: bad expression '2*(Vin' at column 7: Missing parenthesis\n"
            "  <predict name=\"t\" expr=\"2*(Vin\"/>\n"
            "                    ^");
}

TEST_F(PredictionParserTest, CompareNeedsAnEdge) {
  EXPECT_EQ(Error("<predict name=\"t\" expr=\"1\" compare=\"t_transition_s\"/>"),
            "s.xml:3: 'compare' needs 'edge' (the metric is measured per edge)\n"
            "  <predict name=\"t\" expr=\"1\" compare=\"t_transition_s\"/>\n"
            "                             ^");
}

TEST_F(PredictionParserTest, BadEdgeAndTolerance) {
  EXPECT_EQ(Error("<predict name=\"t\" expr=\"1\" edge=\"high\"/>"),
            "s.xml:3: bad edge 'high' (use 'high_on' or 'low_on')\n"
            "  <predict name=\"t\" expr=\"1\" edge=\"high\"/>\n"
            "                             ^");
  EXPECT_EQ(Error("<predict name=\"t\" expr=\"1\" tolerance=\"five\"/>").substr(0, 64),
            "s.xml:3: bad tolerance 'five' (e.g. '5%' or an absolute '0.5n')\n");
}

TEST_F(PredictionParserTest, UnknownAttributeAndDuplicateName) {
  EXPECT_EQ(Error("<predict name=\"t\" exp=\"1\"/>").substr(0, 68),
            "s.xml:3: unknown attribute 'exp' on <predict> (did you mean 'expr'?)");
  std::string xml =
      "<sweep>\n  <template file=\"b.cir\"/>\n  <predict name=\"t\" expr=\"1\"/>\n"
      "  <predict name=\"t\" expr=\"2\"/>\n</sweep>\n";
  SweepSpec spec;
  Diagnostic error;
  EXPECT_FALSE(ParseSweepText(xml, "s.xml", &spec, &error));
  EXPECT_EQ(error.message, "prediction 't' is named twice (first on line 3)");
  EXPECT_EQ(error.where.line, 4);
}

}  // namespace
}  // namespace zvsmap
