// The regulation annotations of a template (*@ control, *@ regulate,
// *@ power): what they read and the file:line errors for malformed ones.
#include "netlist/regulation_annotations.h"

#include <gtest/gtest.h>

#include "netlist/template.h"

namespace zvsmap {
namespace {

const char* kHead = R"(regulated half bridge under test
.param Vin=48 Vout=12 fsw=500k D={Vout/Vin} il0=1
*@ period 1/fsw
*@ cell leg node=sw rail_high=in rail_low=0 current=vsense
*@+ high=xhs low=xls high_cmd=ch low_cmd=cl
*@ state i(l1) init=il0
)";

class RegulationAnnotationsTest : public ::testing::Test {
 protected:
  bool Parse(const std::string& annotations) {
    return ParseTemplateText(std::string(kHead) + annotations + "V1 in 0 {Vin}\n.end\n", "t.cir",
                             &tmpl_, &error_);
  }
  Template tmpl_;
  Diagnostic error_;
};

TEST_F(RegulationAnnotationsTest, ReadsControlRegulationAndPowerPorts) {
  ASSERT_TRUE(
      Parse("*@ control D min=0.02 max=950m\n*@ regulate V(out) target=Vout\n"
            "*@ power input=-v(in)*i(v1) output=v(out)*i(l1)\n"))
      << error_.Format();
  const RegulationSpec& r = tmpl_.regulation;
  EXPECT_TRUE(r.declared());
  EXPECT_EQ(r.param, "d");
  EXPECT_DOUBLE_EQ(r.min, 0.02);
  EXPECT_DOUBLE_EQ(r.max, 0.95);
  EXPECT_EQ(r.vector, "v(out)");
  EXPECT_EQ(r.target, "vout");
  EXPECT_EQ(r.control_where.line, 7);
  ASSERT_TRUE(tmpl_.power.declared());
  EXPECT_EQ(tmpl_.power.input.sign, -1);
  EXPECT_EQ(tmpl_.power.input.voltage, "v(in)");
  EXPECT_EQ(tmpl_.power.input.current, "i(v1)");
  EXPECT_EQ(tmpl_.power.output.sign, 1);
  std::vector<std::string> want = {"v(out)", "v(in)", "i(v1)", "v(out)", "i(l1)"};
  EXPECT_EQ(RegulationVectors(tmpl_.regulation, tmpl_.power), want);
}

TEST_F(RegulationAnnotationsTest, ATemplateWithoutThemRunsOpenLoopOnly) {
  ASSERT_TRUE(Parse("")) << error_.Format();
  EXPECT_FALSE(tmpl_.regulation.declared());
  EXPECT_FALSE(tmpl_.power.declared());
}

struct BadCase {
  const char* annotations;
  int line;
  const char* message;
};

TEST_F(RegulationAnnotationsTest, MalformedAnnotationsAreRefusedAtTheirLine) {
  const BadCase cases[] = {
      {"*@ control D min=0.9 max=0.1\n*@ regulate v(out) target=Vout\n", 7, "min < max"},
      {"*@ control D min=0.1\n*@ regulate v(out) target=Vout\n", 7, "needs max="},
      // A unit letter on a bound: ngspice would read 0.95V as 0.95, but the
      // spelling says something else, so it is refused (common practice: the
      // same rule as every number of the sweep file, core/spice_number.h).
      {"*@ control D min=0.1 max=0.95V\n*@ regulate v(out) target=Vout\n", 7, "max=0.95V"},
      {"*@ control D min=1MHz max=2\n*@ regulate v(out) target=Vout\n", 7, "min=1MHz"},
      {"*@ control D min=0.1 max=0.9 default=closed\n*@ regulate v(out) target=Vout\n", 7,
       "default=regulated or default=open"},
      {"*@ control D min=0.1 max=0.9 gain=2\n*@ regulate v(out) target=Vout\n", 7,
       "unknown key 'gain'"},
      {"*@ control Dx min=0.1 max=0.9\n*@ regulate v(out) target=Vout\n", 7, "did you mean 'd'"},
      {"*@ control D min=0.1 max=0.9\n*@ regulate v(out) target=Vo\n", 8, "did you mean"},
      {"*@ control D min=0.1 max=0.9\n*@ regulate i(l1) target=Vout\n", 8, "v(<node>)"},
      {"*@ control D min=0.1 max=0.9\n", 7, "needs a '*@ regulate"},
      {"*@ regulate v(out) target=Vout\n", 7, "needs a '*@ control"},
      {"*@ control D min=0.1 max=0.9\n*@ control D min=0.1 max=0.9\n", 8, "more than one"},
      {"*@ power input=v(in) output=v(out)*i(l1)\n", 7, "[-]v(node)*i(source)"},
      {"*@ power input=-v(in)*i(v1;x) output=v(out)*i(l1)\n", 7, "[-]v(node)*i(source)"},
  };
  for (const BadCase& c : cases) {
    SCOPED_TRACE(c.annotations);
    ASSERT_FALSE(Parse(c.annotations));
    EXPECT_EQ(error_.where.line, c.line);
    EXPECT_NE(error_.message.find(c.message), std::string::npos) << error_.message;
  }
}

}  // namespace
}  // namespace zvsmap
