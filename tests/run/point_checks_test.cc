#include "run/point_checks.h"

#include <gtest/gtest.h>

#include <cstdlib>

#include "run/check_fixture.h"
#include "run/point_evaluator.h"

namespace zvsmap {
namespace {

// The expected texts are the checks' contract (README "Checked before a run");
// the numbers in them are worked by hand from the fixture template: T = 1/fsw,
// the high command is on for D*T - tdh - tedge, the low command's PULSE spans
// tedge + (D*T + tdl - tedge) + tedge of its period T (ngspice manual,
// "Pulse" source: PULSE(V1 V2 TD TR TF PW PER), from memory).
class PointChecksTest : public CheckFixture {
 protected:
  std::vector<Diagnostic> Check() {
    PointEvaluator evaluator(spec_, tmpl_);
    return CheckPoints(spec_, tmpl_, points_, evaluator, sweep_text_);
  }
  std::string Swept(int line, const std::string& name) const {
    return " [values set at " + SweepPath() + ":" + std::to_string(line) + " (" + name + ")]";
  }
};

TEST_F(PointChecksTest, TheFixtureItselfPasses) {
  Load("  <axis param=\"fsw\" values=\"200k 500k 1meg\"/>\n");
  EXPECT_TRUE(Check().empty());
}

TEST_F(PointChecksTest, TheTitleLineIsNoCard) {
  // SPICE takes the first line as the title (ngspice manual, "Input file
  // structure", from memory), even when it reads like a capacitor card.
  std::string text = TemplateText();
  text.replace(0, text.find('\n'), "c1 a b 0 title line, invented");
  Load("", text);
  EXPECT_TRUE(Check().empty());
}

TEST_F(PointChecksTest, ZeroFrequencyLeavesNoPeriod) {
  Load("  <axis param=\"fsw\" values=\"500k 0\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  // 1/0 is no finite number (muParser gives inf; expression.h refuses it).
  EXPECT_EQ(problems[0].Format(),
            TemplatePath() +
                ":2: the period '1/fsw' cannot be evaluated: expression does not give a finite "
                "number (division by zero?) at 1 of 2 points: point 1 (fsw=0)" +
                Swept(3, "fsw") + "\n  *@ period 1/fsw\n            ^");
}

TEST_F(PointChecksTest, TheFirstFewFailingPointsAndHowManyMore) {
  Load("  <axis param=\"fsw\" values=\"0 0 500k 0 0\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_NE(problems[0].message.find(" at 4 of 5 points: point 0 (fsw=0); point 1 (fsw=0); "
                                     "point 3 (fsw=0); and 1 more ["),
            std::string::npos)
      << problems[0].message;
}

TEST_F(PointChecksTest, ParamThatCannotBeEvaluated) {
  Load("  <axis param=\"fsw\" values=\"400k 500k\"/>\n",
       TemplateText(".param x={1/(fsw - 500k)}\n"));
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].Format(),
            TemplatePath() +
                ":18: cannot evaluate .param x '1/(fsw - 500k)': expression does not give a "
                "finite number (division by zero?) at 1 of 2 points: point 1 (fsw=500k)" +
                Swept(3, "fsw") + "\n  .param x={1/(fsw - 500k)}");
}

TEST_F(PointChecksTest, DeadTimeLongerThanTheOnTime) {
  // D*T = 0.25 * 2 us = 500 ns < tdh = 600 ns: the high command's width is negative.
  Load("  <axis param=\"tdh\" values=\"40n 600n\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  const std::string& m = problems[0].message;
  EXPECT_EQ(m.substr(0, m.rfind(" width ")),
            "command source vch (cell leg, high_cmd): its PULSE width 'D/fsw - tdh - tedge' must "
            "be >= 0: is a dead time longer than the interval it sits in? at 1 of 2 points: "
            "point 1 (tdh=600n):");
  // width = 500n - 600n - 1n = -101 ns
  EXPECT_NEAR(std::atof(m.substr(m.rfind(" width ") + 7).c_str()), -101e-9, 1e-15);
  EXPECT_NE(m.find(" s with tdh = 6e-07 s, tdl = 4e-08 s, period 2e-06 s" + Swept(3, "tdh")),
            std::string::npos)
      << m;
  EXPECT_EQ(problems[0].where.line, 16);
  EXPECT_EQ(problems[0].source_line,
            "vch ch 0 PULSE(0 1 {tdh} {tedge} {tedge} {D/fsw - tdh - tedge} {1/fsw})");
  EXPECT_EQ(problems[0].where.column, 10);  // the 'P' of PULSE
}

TEST_F(PointChecksTest, DeadTimeLongerThanTheOffTime) {
  // (1 - D)*T = 1.5 us < tdl = 1.6 us: the low command's pulse overruns its period.
  Load("  <set param=\"tdl\" value=\"1.6u\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].where.line, 17);
  const std::string& m = problems[0].message;
  EXPECT_EQ(m.substr(0, m.find(" = ") + 3),
            "command source vcl (cell leg, low_cmd): its PULSE rise + width + fall must fit in "
            "its period: is a dead time longer than the interval it sits in? at 1 of 1 points: "
            "point 0 (tdl=1.6u): rise + width + fall = ");
  // tedge + (500n + 1.6u - tedge) + tedge = 2.101 us
  EXPECT_NEAR(std::atof(m.substr(m.find(" = ") + 3).c_str()), 2.101e-6, 1e-15);
}

TEST_F(PointChecksTest, NegativeDeadTime) {
  Load("  <set param=\"tdh\" value=\"-1n\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 2u);
  EXPECT_EQ(problems[0].Format(),
            TemplatePath() +
                ":7: dead time 'tdh' (cell leg, before the high turn-on) must be >= 0 at 1 of 1 "
                "points: point 0 (tdh=-1n): tdh = -1e-09 s" +
                Swept(3, "tdh") + "\n  .param tdh=40n\n         ^");
  // The same mistake seen in the high command: its delay is the dead time.
  EXPECT_EQ(problems[1].where.line, 16);
  EXPECT_EQ(problems[1].message.rfind(
                "command source vch (cell leg, high_cmd): its PULSE delay, rise and fall must be "
                ">= 0: is a dead time longer than the interval it sits in? at 1 of 1 points: "
                "point 0 (tdh=-1n): delay -1e-09 s, rise 1e-09 s, fall 1e-09 s with tdh = ",
                0),
            0u)
      << problems[1].message;
}

TEST_F(PointChecksTest, DeadTimesThatTogetherFillThePeriod) {
  // 1.1 us + 1.1 us >= T = 2 us, each alone shorter than T.
  Load("  <set param=\"tdh\" value=\"1.1u\"/>\n  <set param=\"tdl\" value=\"1.1u\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_FALSE(problems.empty());
  EXPECT_EQ(problems[0].message,
            "the dead times of cell leg ('tdh' + 'tdl') must add up to less than the period at 1 "
            "of 1 points: point 0 (tdh=1.1u tdl=1.1u): sum 2.2e-06 s, period 2e-06 s [values set "
            "at " +
                SweepPath() + ":3 (tdh), " + SweepPath() + ":4 (tdl)]");
  EXPECT_EQ(problems[0].where.line, 3);  // the cell annotation
}

TEST_F(PointChecksTest, DeadTimeNotShorterThanThePeriod) {
  Load("  <set param=\"tdh\" value=\"3u\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_FALSE(problems.empty());
  EXPECT_EQ(problems[0].message,
            "dead time 'tdh' (cell leg, before the high turn-on) must be shorter than the period "
            "at 1 of 1 points: point 0 (tdh=3u): tdh = 3e-06 s, period 2e-06 s" +
                Swept(3, "tdh"));
}

TEST_F(PointChecksTest, RequiredDeadTimeNotShorterThanThePeriod) {
  // T = 1/fsw: 5 µs at 200 kHz, 2 µs at 500 kHz, 1 µs at 1 MHz.
  Load("  <axis param=\"fsw\" values=\"200k 500k 1meg\"/>\n"
       "  <require edge=\"high_on\" dead-time=\"1.5u\" within-window=\"true\"/>\n"
       "  <require edge=\"high_on\" dead-time=\"3u\" within-window=\"true\" "
       "where=\"fsw &lt; 300k\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].where.line, 4);
  EXPECT_EQ(problems[0].message,
            "<require>'s dead-time must be shorter than the period at 1 of 3 points: point 2 "
            "(fsw=1meg): dead-time 1.5e-06 s, period 1e-06 s" +
                Swept(3, "fsw"));
}

TEST_F(PointChecksTest, ZeroInductanceAndCapacitance) {
  Load("  <set param=\"L\" value=\"0\"/>\n  <set param=\"Cout\" value=\"-1u\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 3u);
  EXPECT_EQ(problems[0].message,
            "cell leg's inductance 'l' must be > 0 at 1 of 1 points: point 0 (L=0 Cout=-1u): l = "
            "0" +
                Swept(3, "L"));
  EXPECT_EQ(problems[1].Format(),
            TemplatePath() +
                ":14: inductor l1's value '{L}' must be > 0 at 1 of 1 points: point 0 (L=0 "
                "Cout=-1u): it is 0" +
                Swept(3, "L") + "\n  l1 sw out {L}\n            ^");
  EXPECT_EQ(problems[2].message,
            "capacitor c1's value '{Cout}' must be > 0 at 1 of 1 points: point 0 (L=0 Cout=-1u): "
            "it is -1e-06" +
                Swept(4, "Cout"));
}

TEST_F(PointChecksTest, AbsurdStepCountFromAPeriodOfThousandsOfSeconds) {
  // 0.5 mHz (what SPICE makes of "0.5MHz"): T = 2000 s against the derived step
  // bound tdh/20 = 2 ns is 1e12 steps per period.
  Load("  <set param=\"fsw\" value=\"0.5m\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].Format(),
            TemplatePath() +
                ":2: a point may take at most 1e+06 steps per period (is the period or the step "
                "bound what you meant?) at 1 of 1 points: point 0 (fsw=500u): period 2000 s "
                "against the step bound 2e-09 s: 1e+12 steps per period" +
                Swept(3, "fsw") + "\n  *@ period 1/fsw\n            ^");
}

TEST_F(PointChecksTest, MaxStepTooCoarseForThePeriod) {
  Load("  <simulation max-step=\"1u\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].Format(),
            SweepPath() +
                ":3: 'max-step' must give at least 20 steps per period to resolve the "
                "commutations at 1 of 1 points: point 0: period 2e-06 s against the step bound "
                "1e-06 s: 2 steps per period\n  <simulation max-step=\"1u\"/>\n              ^");
}

TEST_F(PointChecksTest, TooManyStepsForOnePoint) {
  // 2000 steps per period (max-step T/2000) x (1e6 + 2.06) periods > 1e9: the
  // measured run is the default lead of one period, the measured period, the
  // 40 ns dead time (0.02 of the 2 us period) and two edge guards of 0.02.
  Load("  <simulation max-step=\"1n\" max-periods=\"1000000\"/>\n");
  std::vector<Diagnostic> problems = Check();
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].message,
            "a point may take at most 1e+09 steps at 1 of 1 points: point 0: (max-periods "
            "1000000 + 2.06 periods of the measured run) x 2000 steps per period = "
            "2e+09");
  EXPECT_EQ(problems[0].where.column, 27);  // max-periods
}

}  // namespace
}  // namespace zvsmap
