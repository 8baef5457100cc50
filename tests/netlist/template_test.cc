#include "netlist/template.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

const char* kGood = R"(half bridge under test
.param Vin=48
.param Vout = 12 fsw=500k
+ L={1u*2}
.param il0={Vout/1} td='20n'
*@ period 1/fsw
*@ cell leg node=sw rail_high=in rail_low=0 current=vsense
*@+ high=xhs low=xls high_cmd=ch low_cmd=cl high_dead=td
*@ state i(L1) init=il0
V1 in 0 {Vin}
.tran 1n 10u
.end
)";

class TemplateTest : public ::testing::Test {
 protected:
  bool Parse(const std::string& text) { return ParseTemplateText(text, "t.cir", &tmpl_, &error_); }
  Template tmpl_;
  Diagnostic error_;
};

TEST_F(TemplateTest, ReadsParamsAnnotationsAndContinuations) {
  ASSERT_TRUE(Parse(kGood)) << error_.Format();
  ASSERT_EQ(tmpl_.params.size(), 6u);
  EXPECT_EQ(tmpl_.params[0].name, "vin");
  EXPECT_EQ(tmpl_.params[0].expression, "48");
  EXPECT_EQ(tmpl_.params[3].name, "l");
  EXPECT_EQ(tmpl_.params[3].expression, "1u*2");
  EXPECT_EQ(tmpl_.params[3].where.line, 3);  // a continuation keeps its first line
  EXPECT_EQ(tmpl_.params[5].expression, "20n");
  EXPECT_EQ(tmpl_.period_expression, "1/fsw");
  ASSERT_EQ(tmpl_.cells.size(), 1u);
  const CellSpec& c = tmpl_.cells[0];
  EXPECT_EQ(c.name, "leg");
  EXPECT_EQ(c.node, "sw");
  EXPECT_EQ(c.current, "vsense");
  EXPECT_EQ(c.high_cmd, "ch");
  EXPECT_EQ(c.high_dead, "td");
  EXPECT_EQ(c.where.line, 7);
  ASSERT_EQ(tmpl_.states.size(), 1u);
  EXPECT_EQ(tmpl_.states[0].vector, "i(l1)");
  EXPECT_EQ(tmpl_.states[0].init_param, "il0");
  EXPECT_NE(tmpl_.FindParam("VIN"), nullptr);
}

TEST_F(TemplateTest, UnknownCellKeySuggestsTheClosest) {
  ASSERT_FALSE(Parse("t\n.param fsw=1\n*@ period 1/fsw\n*@ cell a node=sw rail_hihg=in\n"));
  EXPECT_EQ(error_.Format(), "t.cir:4: unknown cell key 'rail_hihg' (did you mean 'rail_high'?)");
}

TEST_F(TemplateTest, MissingRequiredCellKey) {
  ASSERT_FALSE(Parse("t\n.param fsw=1\n*@ period 1/fsw\n*@ cell a node=sw rail_high=in\n"));
  EXPECT_EQ(error_.Format(), "t.cir:4: cell 'a' lacks required key 'rail_low'");
}

TEST_F(TemplateTest, MissingPeriodAndCell) {
  ASSERT_FALSE(Parse("t\n.param fsw=1\n"));
  EXPECT_EQ(error_.Format(), "t.cir: template has no '*@ period' annotation");
  ASSERT_FALSE(Parse("t\n.param fsw=1\n*@ period 1/fsw\n"));
  EXPECT_EQ(error_.Format(), "t.cir: template declares no commutation cell ('*@ cell ...')");
}

TEST_F(TemplateTest, StateMustNameADeclaredParam) {
  ASSERT_FALSE(Parse(
      "t\n.param fsw=1 il0=0\n*@ period 1/fsw\n"
      "*@ cell a node=sw rail_high=in rail_low=0 current=v1 high_cmd=a low_cmd=b\n"
      "*@ state i(l1) init=il9\n"));
  EXPECT_EQ(error_.Format(),
            "t.cir:5: state 'i(l1)' names parameter 'il9', which has no .param (did you mean "
            "'il0'?)");
}

TEST_F(TemplateTest, MalformedParamAndUnknownAnnotation) {
  ASSERT_FALSE(Parse("t\n.param fsw\n"));
  EXPECT_EQ(error_.Format(), "t.cir:2: malformed .param declaration (expected name=value)");
  ASSERT_FALSE(Parse("t\n.param fsw={1\n"));
  EXPECT_EQ(error_.Format(), "t.cir:2: unclosed '{' in .param fsw");
  ASSERT_FALSE(Parse("t\n*@ perod 1\n"));
  EXPECT_EQ(error_.Format(),
            "t.cir:2: unknown annotation '*@ perod' (known: period, cell, state, model, control, "
            "regulate, power, measure)");
  ASSERT_FALSE(Parse("t\n.param a=1\n.param A=2\n"));
  EXPECT_EQ(error_.Format(), "t.cir:3: .param 'a' declared twice");
}

// `*@ measure lead=`: the template's lead, used unless the sweep sets its own
// or brings its own switch models; bad values are refused at their line.
TEST_F(TemplateTest, MeasureLeadAnnotation) {
  auto with = [](const std::string& lines) {  // inserted as line 10, before V1
    std::string text = kGood;
    return text.insert(text.find("V1 in"), lines);
  };
  ASSERT_TRUE(Parse(with("*@ measure lead=0.25\n"))) << error_.Format();
  EXPECT_DOUBLE_EQ(tmpl_.measure_lead, 0.25);
  SweepSpec spec;
  EXPECT_DOUBLE_EQ(MeasureLead(spec, tmpl_), 0.25);
  spec.devices.push_back(DeviceSpec());
  EXPECT_DOUBLE_EQ(MeasureLead(spec, tmpl_), kDefaultMeasureLead);
  spec.simulation.measure_lead = 2;
  EXPECT_DOUBLE_EQ(MeasureLead(spec, tmpl_), 2);
  ASSERT_TRUE(Parse(kGood));
  EXPECT_DOUBLE_EQ(MeasureLead(SweepSpec(), tmpl_), kDefaultMeasureLead);

  ASSERT_FALSE(Parse(with("*@ measure lead=0.01\n")));
  EXPECT_EQ(error_.Format(),
            "t.cir:10: '*@ measure lead=' must be a number of periods from 0.05 to 100, got "
            "'0.01'");
  ASSERT_FALSE(Parse(with("*@ measure 0.25\n")));
  EXPECT_EQ(error_.Format(),
            "t.cir:10: expected '*@ measure lead=<periods>', e.g. '*@ measure lead=0.25'");
  ASSERT_FALSE(Parse(with("*@ measure lead=1\n*@ measure lead=2\n")));
  EXPECT_EQ(error_.Format(), "t.cir:11: more than one '*@ measure'");
}

TEST_F(TemplateTest, MissingFile) {
  ASSERT_FALSE(LoadTemplate("/nonexistent/x.cir", &tmpl_, &error_));
  EXPECT_EQ(error_.Format(), "/nonexistent/x.cir: cannot open template file");
}

}  // namespace
}  // namespace zvsmap
