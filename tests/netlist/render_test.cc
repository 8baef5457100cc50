#include "netlist/render.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

const char* kTemplate = R"(buck under test
.param Vin=48 Vout=12
.param D={Vout/Vin}
.param fsw=500k
*@ period 1/fsw
*@ cell leg node=sw rail_high=in rail_low=0 current=vsense high_cmd=ch low_cmd=cl
*@ state v(out) init=vout
V1 in 0 {Vin}
.tran 1n 10u
.save v(sw)
.end
)";

class RenderTest : public ::testing::Test {
 protected:
  void SetUp() override {
    Diagnostic error;
    ASSERT_TRUE(ParseTemplateText(kTemplate, "b.cir", &tmpl_, &error)) << error.Format();
  }
  Template tmpl_;
};

TEST_F(RenderTest, PointValuesOverrideDefaultsAndFlowIntoExpressions) {
  Variables resolved;
  Diagnostic error;
  ASSERT_TRUE(ResolveParams(tmpl_, {{"Vout", 24}}, &resolved, &error)) << error.Format();
  EXPECT_DOUBLE_EQ(resolved.at("vout"), 24);
  EXPECT_DOUBLE_EQ(resolved.at("d"), 0.5);  // D follows the swept Vout
  double period = 0;
  ASSERT_TRUE(ResolvePeriod(tmpl_, resolved, &period, &error));
  EXPECT_DOUBLE_EQ(period, 2e-6);
}

TEST_F(RenderTest, UnknownNameIsRefused) {
  Variables resolved;
  Diagnostic error;
  ASSERT_FALSE(ResolveParams(tmpl_, {{"Lx", 1}}, &resolved, &error));
  EXPECT_EQ(error.Format(), "b.cir: template declares no parameter 'lx'");
}

TEST_F(RenderTest, BadExpressionNamesTheParamAndLine) {
  Template t;
  Diagnostic error;
  ASSERT_TRUE(ParseTemplateText(
      "t\n.param a=1\n.param b={a/zz}\n*@ period 1\n"
      "*@ cell c node=sw rail_high=in rail_low=0 current=v1 high_cmd=x low_cmd=y\n",
      "t.cir", &t, &error));
  Variables resolved;
  ASSERT_FALSE(ResolveParams(t, {}, &resolved, &error));
  EXPECT_EQ(error.where.line, 3);
  EXPECT_NE(error.message.find("cannot evaluate .param b 'a/zz'"), std::string::npos)
      << error.message;
}

TEST_F(RenderTest, ReplacesAnalysisCommandsAndResolvesParams) {
  Variables resolved;
  Diagnostic error;
  ASSERT_TRUE(ResolveParams(tmpl_, {}, &resolved, &error));
  TranSettings tran;
  tran.tstop_s = 10e-6;
  tran.tstart_s = 6e-6;
  tran.max_step_s = 1e-9;
  std::string net = RenderNetlist(tmpl_, resolved, tran, VectorsToSave(tmpl_));
  EXPECT_EQ(net.rfind("buck under test\n", 0), 0u);  // title stays the first line
  EXPECT_NE(net.find(".param d=0.25\n"), std::string::npos) << net;
  EXPECT_NE(net.find(".param fsw=500000\n"), std::string::npos);
  EXPECT_NE(net.find("V1 in 0 {Vin}\n"), std::string::npos);
  EXPECT_EQ(net.find(".tran 1n 10u"), std::string::npos);
  EXPECT_EQ(net.find(".control"), std::string::npos);
  EXPECT_EQ(net.find("\nrun\n"), std::string::npos);
  EXPECT_NE(net.find(".options method=gear reltol=0.0001\n"), std::string::npos);
  EXPECT_NE(net.find(".save v(sw) v(in) i(vsense) v(ch) v(cl) v(out)\n"), std::string::npos) << net;
  EXPECT_NE(net.find(".tran 1e-09 1e-05 6e-06 1e-09 uic\n.end\n"), std::string::npos) << net;
}

}  // namespace
}  // namespace zvsmap
