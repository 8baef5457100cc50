#include "run/sweep_checks.h"

#include <gtest/gtest.h>

#include "result/edge_metrics.h"
#include "run/check_fixture.h"

namespace zvsmap {
namespace {

// Expected texts are the checks' contract (README "Checked before a run");
// number readings follow ngspice (src/spicelib/parser/inpeval.c, INPevaluate).
class SweepChecksTest : public CheckFixture {
 protected:
  std::vector<Diagnostic> Names() { return CheckResultNames(spec_, tmpl_, points_, sweep_text_); }
  static std::string WithParam(const std::string& line5) {
    std::string text = TemplateText();
    return text.replace(text.find(".param fsw=500k"), 15, line5);
  }
};

TEST_F(SweepChecksTest, TemplateParamReadingDifferentlyThanItLooks) {
  Load("", WithParam(".param fsw=0.5MHz"));
  std::vector<Diagnostic> problems = CheckTemplateNumbers(tmpl_);
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].Format(),
            TemplatePath() +
                ":5: .param fsw: '0.5MHz' is 0.5 milli (0.0005) in SPICE, which reads 'M' as "
                "milli; write '0.5meg' for mega or '0.5m' for milli\n"
                "  .param fsw=0.5MHz\n"
                "             ^");
}

TEST_F(SweepChecksTest, TemplateParamWithUnitLettersOrJunk) {
  Load("", WithParam(".param fsw=500kHz L2=1xyz"));
  std::vector<Diagnostic> problems = CheckTemplateNumbers(tmpl_);
  ASSERT_EQ(problems.size(), 2u);
  EXPECT_EQ(problems[0].message,
            ".param fsw: '500kHz' has unit letters, which a template .param may not have (zvsmap "
            "evaluates its value as an expression); write '500k'");
  EXPECT_EQ(problems[1].message,
            ".param l2: SPICE ignores the letters 'xyz' in '1xyz' and reads 1; write '1' (after a "
            "number and its scale factor zvsmap takes only the unit symbols V, A, H, F, Hz, s, "
            "Ohm, W, J)");
  EXPECT_EQ(problems[1].where.column, 22);  // the value after "L2="
}

TEST_F(SweepChecksTest, PlainTemplateParamsPass) {
  Load("", WithParam(".param fsw=500k R=1Meg E=1e-3 X={2*fsw}"));
  EXPECT_TRUE(CheckTemplateNumbers(tmpl_).empty());
}

TEST_F(SweepChecksTest, RequireNamingAnUnknownCellEdgeOrMetric) {
  Load(
      "  <require edge=\"lg.high_on\" class=\"full\"/>\n"
      "  <require edge=\"leg.hi_on\" class=\"full\"/>\n"
      "  <require edge=\"leg.high_on\" metric=\"v_turnon_v\" max=\"1\"/>\n"
      "  <require edge=\"high_on\" metric=\"t_zvs_s\" max=\"1\"/>\n");
  std::vector<Diagnostic> problems = Names();
  ASSERT_EQ(problems.size(), 3u);
  EXPECT_EQ(problems[0].Format(),
            SweepPath() +
                ":3: <require> names cell 'lg', which the template does not declare (did you "
                "mean 'leg'? cells: leg)\n"
                "  <require edge=\"lg.high_on\" class=\"full\"/>\n"
                "           ^");
  EXPECT_EQ(problems[1].message,
            "<require> names edge 'hi_on', which no cell has (did you mean 'high_on'? edges: "
            "high_on, low_on)");
  std::string all;
  for (const std::string& n : EdgeMetricNames()) all += n + ", ";
  EXPECT_EQ(problems[2].message,
            "<require> names metric 'v_turnon_v', which no high_on edge has (did you mean "
            "'v_turn_on_v'? metrics: " +
                all + "zvs_margin)");
  EXPECT_EQ(problems[2].where.line, 5);
  EXPECT_EQ(problems[2].where.column, 29);  // metric=
}

TEST_F(SweepChecksTest, RequireMayNameAPredictionColumn) {
  // hand_calculation.h: a <predict compare=M> adds M__NAME, __diff, __rel_diff, __beyond_tol.
  Load(
      "  <predict name=\"t_est_s\" expr=\"1n\" compare=\"t_transition_s\" edge=\"high_on\"/>\n"
      "  <require edge=\"high_on\" metric=\"t_transition_s__t_est_s__rel_diff\" max=\"0.2\"/>\n"
      "  <require edge=\"low_on\" metric=\"t_transition_s__t_est_s\" max=\"0.2\"/>\n");
  std::vector<Diagnostic> problems = Names();
  ASSERT_EQ(problems.size(), 1u);  // the prediction is on high_on edges only
  EXPECT_EQ(problems[0].where.line, 5);
  EXPECT_EQ(problems[0].message.substr(0, 91),
            "<require> names metric 't_transition_s__t_est_s', which no low_on edge has (metrics:"
            " rail_v");
}

TEST_F(SweepChecksTest, PredictComparingNoColumnOrNamingNoCell) {
  Load(
      "  <predict name=\"a\" expr=\"1n\" compare=\"t_transtion_s\" edge=\"high_on\"/>\n"
      "  <predict name=\"b\" expr=\"1\" cell=\"lag\"/>\n");
  std::vector<Diagnostic> problems = Names();
  ASSERT_EQ(problems.size(), 2u);
  EXPECT_EQ(problems[0].message.substr(0, 97),
            "<predict compare=...> names no metric column: 't_transtion_s' (did you mean "
            "'t_transition_s'? col");
  EXPECT_EQ(problems[0].where.column, 29);  // compare=
  EXPECT_EQ(problems[1].message,
            "<predict> names cell 'lag', which the template does not declare (did you mean "
            "'leg'? cells: leg)");
}

}  // namespace
}  // namespace zvsmap
