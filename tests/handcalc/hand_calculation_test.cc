// The sweep file's own <predict> formulas, the *@ model annotation and the
// prediction columns. Unless a check names another source, the expected text
// is the format's own specification, written by hand.
#include "handcalc/hand_calculation.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <fstream>

#include "netlist/render.h"
#include "report/disagreement_summary.h"
#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

// The check case of netlists/references.md section 8.
constexpr const char* kTemplate =
    "buck for tests\n"
    ".param Vin=48 Vout=12 fsw=500k L=1u Iout=5 Coss=1n Vf=0.7\n"
    ".param td_lh=40n td_hl=40n\n"
    "*@ period 1/fsw\n"
    "*@ model buck\n"
    "*@ cell leg node=sw rail_high=in rail_low=0 current=vsense high_cmd=ch low_cmd=cl\n"
    "*@+ high_dead=td_lh low_dead=td_hl\n";

class HandCalculationTest : public ::testing::Test {
 protected:
  void SetUp() override {
    Diagnostic error;
    ASSERT_TRUE(ParseTemplateText(kTemplate, "buck.cir", &tmpl_, &error)) << error.Format();
    ASSERT_TRUE(ResolveParams(tmpl_, {}, &resolved_, &error)) << error.Format();
  }
  // Writes a sweep file whose <predict> elements (`body`) start on line 3.
  bool Load(const std::string& body) {
    // One file per test process: CTest runs these tests in parallel. (The
    // file is read back to show the offending line under a message.)
    path_ = ::testing::TempDir() + "handcalc_test_" + std::to_string(getpid()) + ".xml";
    std::string text = "<sweep>\n  <template file=\"buck.cir\"/>\n" + body + "</sweep>\n";
    std::ofstream(path_) << text;
    Diagnostic error;
    bool ok = ParseSweepText(text, path_, &spec_, &error);
    EXPECT_TRUE(ok) << error.Format();
    return ok;
  }
  std::string path_;
  Template tmpl_;
  Variables resolved_;
  SweepSpec spec_;
};

TEST_F(HandCalculationTest, TemplateChoosesTheModel) {
  EXPECT_EQ(tmpl_.model, "buck");
  EXPECT_EQ(tmpl_.model_where.line, 5);
}

// 2*C*Vin/|Iv| = 2 * 1n * 48 / 4 = 24 ns: the linear transition of
// netlists/references.md sec. 2 (Mohan et al. 2003), arithmetic by hand. Names match
// case-insensitively, as SPICE parameter names do.
TEST_F(HandCalculationTest, UserFormulaOverParametersAndModelValues) {
  ASSERT_TRUE(
      Load("  <predict name=\"t_lin_s\" expr=\"2*COSS*Vin/abs(I_Valley_A)\" "
           "compare=\"t_transition_s\" edge=\"high_on\" tolerance=\"10%\"/>\n"
           "  <predict name=\"t_lin_ns\" expr=\"t_lin_s/1n\"/>\n"));
  HandCalculation calc;
  Diagnostic error;
  ASSERT_TRUE(ComputeHandCalculation(spec_, tmpl_, resolved_, &calc, &error)) << error.Format();
  ASSERT_EQ(calc.cells.size(), 1u);
  const Prediction* p = calc.cells[0].Find("t_lin_s");
  ASSERT_NE(p, nullptr);
  EXPECT_NEAR(p->value, 24e-9, 1e-18);
  EXPECT_EQ(p->metric, "t_transition_s");
  EXPECT_EQ(p->edge, "high_on");
  EXPECT_DOUBLE_EQ(p->tolerance.relative, 0.10);
  EXPECT_NEAR(calc.cells[0].Find("t_lin_ns")->value, 24.0, 1e-9);
}

TEST_F(HandCalculationTest, UnknownNameSuggestsTheClosest) {
  ASSERT_TRUE(Load("  <predict name=\"t_s\" expr=\"2*Coss*Vin/abs(i_valey_a)\"/>\n"));
  HandCalculation calc;
  Diagnostic error;
  EXPECT_FALSE(ComputeHandCalculation(spec_, tmpl_, resolved_, &calc, &error));
  EXPECT_EQ(error.Format(), path_ +
                                ":3: prediction 't_s': unknown name 'i_valey_a' (did you mean "
                                "'i_valley_a'?) (column 16 of the expression)\n"
                                "  <predict name=\"t_s\" expr=\"2*Coss*Vin/abs(i_valey_a)\"/>\n"
                                "                                           ^");
}

TEST_F(HandCalculationTest, DivisionByZeroIsNamed) {
  ASSERT_TRUE(
      Load("  <predict name=\"x\" expr=\"Vin/(Iout - 5)\"/>\n"
           "  <predict name=\"y\" expr=\"1/zero_a\"/>\n"
           "  <predict name=\"zero_a\" expr=\"0\"/>\n"));
  HandCalculation calc;
  Diagnostic error;
  EXPECT_FALSE(ComputeHandCalculation(spec_, tmpl_, resolved_, &calc, &error));
  EXPECT_EQ(error.Format(), path_ +
                                ":3: prediction 'x': 'Vin/(Iout - 5)' is not a finite number here "
                                "(division by zero?)");
  EXPECT_TRUE(std::isnan(calc.cells[0].Find("x")->value));
}

TEST_F(HandCalculationTest, DivisionByAZeroValuedNameNamesIt) {
  ASSERT_TRUE(
      Load("  <predict name=\"zero_a\" expr=\"Iout - 5\"/>\n"
           "  <predict name=\"y\" expr=\"1/zero_a\"/>\n"));
  HandCalculation calc;
  Diagnostic error;
  EXPECT_FALSE(ComputeHandCalculation(spec_, tmpl_, resolved_, &calc, &error));
  EXPECT_EQ(error.Format(), path_ +
                                ":4: prediction 'y': '1/zero_a' is not a finite number here "
                                "(division by zero: zero_a = 0)");
}

TEST_F(HandCalculationTest, UnknownModelSuggestsARegisteredOne) {
  std::string text = kTemplate;
  text.replace(text.find("model buck"), 10, "model bukc");
  Template tmpl;
  Diagnostic error;
  ASSERT_TRUE(ParseTemplateText(text, "buck.cir", &tmpl, &error));
  HandCalculation calc;
  SweepSpec spec;
  EXPECT_FALSE(ComputeHandCalculation(spec, tmpl, resolved_, &calc, &error));
  EXPECT_EQ(error.Format(),
            "buck.cir:5: unknown model 'bukc' in '*@ model' (did you mean 'buck'?)");
}

TEST_F(HandCalculationTest, CheckBeforeRunningNamesEveryProblem) {
  ASSERT_TRUE(
      Load("  <predict name=\"a\" expr=\"Vin\" cell=\"lge\"/>\n"
           "  <predict name=\"b\" expr=\"Vinn*2\"/>\n"));
  std::vector<Point> points = {{0, {{"Iout", 2}}}};
  std::vector<Diagnostic> problems = CheckPredictions(spec_, tmpl_, points);
  ASSERT_EQ(problems.size(), 2u);
  EXPECT_EQ(problems[0].Format(),
            path_ + ":3: prediction 'a': the template has no cell 'lge' (did you mean 'leg'?)");
  EXPECT_EQ(problems[1].message,
            "prediction 'b': unknown name 'Vinn' (did you mean 'vin'?) (column 1 of the "
            "expression)");
  EXPECT_EQ(problems[1].where.line, 4);
}

// Columns beside the measured metric: predicted, difference, relative
// difference and the beyond-tolerance flag (arithmetic by hand: measured
// -3.8 A against a predicted -4 A: diff +0.2 A, rel +5 %, beyond 5 % or 0.1 A).
TEST_F(HandCalculationTest, PairedColumnsOnTheEdge) {
  ASSERT_TRUE(
      Load("  <predict name=\"iv\" expr=\"i_valley_a\" compare=\"i_commutated_a\" "
           "edge=\"high_on\" tolerance=\"0.3\"/>\n"));
  std::vector<EdgeMeasurement> edges(2);
  edges[0].cell = edges[1].cell = "leg";
  edges[0].edge = "high_on";
  edges[0].metrics = {{"i_commutated_a", -3.8}};
  edges[1].edge = "low_on";
  edges[1].metrics = {{"i_commutated_a", 14.0}};
  edges[0].zvs = edges[1].zvs = ZvsClass::kFull;  // as predicted (zvs_full pairs agree)
  Diagnostic error;
  ASSERT_TRUE(AddPredictionMetrics(spec_, tmpl_, resolved_, &edges, &error)) << error.Format();
  const EdgeMeasurement& e = edges[0];
  EXPECT_DOUBLE_EQ(e.Get("i_commutated_a__pred"), -4.0);
  EXPECT_NEAR(e.Get("i_commutated_a__pred__diff"), 0.2, 1e-12);
  EXPECT_NEAR(e.Get("i_commutated_a__pred__rel_diff"), 0.05, 1e-12);
  EXPECT_EQ(e.Get("i_commutated_a__pred__beyond_tol"), 1.0);  // 0.2 > max(5 % of 4, 0.1)
  EXPECT_EQ(e.Get("i_commutated_a__iv__beyond_tol"), 0.0);    // 0.2 <= 0.3 absolute
  EXPECT_EQ(edges[1].Get("i_commutated_a__pred__beyond_tol"), 0.0);
  EXPECT_TRUE(std::isnan(edges[1].Get("i_commutated_a__iv")));  // paired with high_on only
  EXPECT_EQ(e.Get("zvs_full__pred"), 1.0);  // I0 = 4 A >= 1.518 A (netlists/references.md sec. 8)
  EXPECT_EQ(e.Get("zvs_full__pred__beyond_tol"), 0.0);
  EXPECT_EQ(e.Get("zvs_full__pred_energy__beyond_tol"), 0.0);

  std::vector<Point> points = {{0, {{"Iout", 5}}}};
  std::vector<PointResult> results(1);
  results[0].edges = edges;
  std::vector<std::string> lines = DisagreementSummary(points, results, 2);
  ASSERT_EQ(lines.size(), 4u);
  EXPECT_EQ(lines[0], "hand calculation vs simulation, largest relative differences:");
  EXPECT_EQ(lines[1],
            "  leg.high_on i_commutated_a__pred: up to +5.0 % at point 0 (Iout=5); beyond "
            "tolerance at 1 of 1 points");
  EXPECT_EQ(lines[3], "  (9 more pairs in edges.csv, columns *__rel_diff)");
}

}  // namespace
}  // namespace zvsmap
