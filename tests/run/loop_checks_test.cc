// The up-front checks of a sweep's loop against its template's regulation
// annotations: each mistake at its file:line, before anything is simulated.
#include "run/loop_checks.h"

#include <gtest/gtest.h>

#include "run/check_fixture.h"

namespace zvsmap {
namespace {

class LoopChecksTest : public CheckFixture {
 protected:
  // The fixture's template with a control on D regulating v(out) at Vout.
  static std::string Regulated(const std::string& period = "*@ period 1/fsw\n") {
    std::string text = TemplateText(
        ".param Vout=12\n*@ control D min=0.05 max=0.9\n"
        "*@ regulate v(out) target=Vout\n");
    return text.replace(text.find("*@ period 1/fsw\n"), 16, period);
  }
  std::vector<Diagnostic> Check() { return CheckLoop(spec_, tmpl_, points_); }
};

TEST_F(LoopChecksTest, ARegulatedTemplateRunsRegulatedByDefaultAndOpenOnRequest) {
  Load("  <axis param=\"L\" values=\"1u 2u\"/>\n", Regulated());
  EXPECT_TRUE(Check().empty());
  EXPECT_TRUE(RunsRegulated(tmpl_.regulation, spec_.simulation));
  Load("  <axis param=\"D\" values=\"0.2 0.3\"/>\n  <simulation loop=\"open\"/>\n", Regulated());
  EXPECT_TRUE(Check().empty());
  EXPECT_FALSE(RunsRegulated(tmpl_.regulation, spec_.simulation));
}

// A control marked default=open offers regulation on request only: a sweep
// that says nothing runs open loop (and may then set the control itself), one
// that asks for loop="regulated" runs regulated.
TEST_F(LoopChecksTest, AControlMarkedDefaultOpenRegulatesOnRequestOnly) {
  std::string tmpl = Regulated();
  tmpl.replace(tmpl.find("max=0.9"), 7, "max=0.9 default=open");
  Load("  <axis param=\"D\" values=\"0.2 0.3\"/>\n", tmpl);
  EXPECT_FALSE(tmpl_.regulation.regulated_by_default);
  EXPECT_TRUE(Check().empty());
  EXPECT_FALSE(RunsRegulated(tmpl_.regulation, spec_.simulation));
  Load("  <axis param=\"L\" values=\"1u 2u\"/>\n  <simulation loop=\"regulated\"/>\n", tmpl);
  EXPECT_TRUE(Check().empty());
  EXPECT_TRUE(RunsRegulated(tmpl_.regulation, spec_.simulation));
}

TEST_F(LoopChecksTest, RegulatedLoopOnATemplateWithoutAControl) {
  Load("  <simulation loop=\"regulated\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].where.file, SweepPath());
  EXPECT_EQ(problems[0].where.line, 3);
  EXPECT_NE(problems[0].message.find("declares neither"), std::string::npos);
}

TEST_F(LoopChecksTest, SweepingTheControlOfARegulatedLoop) {
  Load("  <axis param=\"L\" values=\"1u 2u\"/>\n  <axis param=\"d\" values=\"0.2 0.3\"/>\n",
       Regulated());
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].where.line, 4);
  EXPECT_NE(problems[0].message.find("loop=\"open\""), std::string::npos);
}

TEST_F(LoopChecksTest, ATolerancedControlOfARegulatedLoop) {
  Load(
      "  <axis param=\"L\" values=\"1u 2u\"/>\n  <tolerances seed=\"1\" samples=\"4\">\n"
      "    <vary param=\"D\" within=\"1%\" spread=\"uniform\"/>\n  </tolerances>\n",
      Regulated());
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].where.line, 5);
}

TEST_F(LoopChecksTest, APeriodThatFollowsTheControl) {
  Load("", Regulated("*@ period 1/fsw + D*1n\n"));
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].where.file, TemplatePath());
  EXPECT_NE(problems[0].message.find("period depends on the control"), std::string::npos);
}

}  // namespace
}  // namespace zvsmap
