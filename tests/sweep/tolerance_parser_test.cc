#include "sweep/tolerance_parser.h"

#include <gtest/gtest.h>

#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

// The expected messages and lines follow the <tolerances> block's own
// specification (README "Tolerances and yield"), written by hand.
class ToleranceParserTest : public ::testing::Test {
 protected:
  static constexpr const char* kPath = "sweeps/tol.xml";
  // Template on line 2, Vin fixed on line 3, axis Iout on line 4, a derived
  // td on line 5; `body` starts on line 6.
  static std::string Sweep(const std::string& body) {
    return "<sweep>\n  <template file=\"../netlists/buck.cir\"/>\n"
           "  <set param=\"Vin\" value=\"48\"/>\n"
           "  <axis param=\"Iout\" from=\"0\" to=\"8\" step=\"2\"/>\n"
           "  <derive param=\"td\" expr=\"10n*Vin/48\"/>\n" +
           body + "</sweep>\n";
  }
  static std::string Block(const std::string& attributes, const std::string& varies) {
    return "  <tolerances" + attributes + ">\n" + varies + "  </tolerances>\n";
  }
  std::string Error(const std::string& xml) {
    SweepSpec spec;
    Diagnostic error;
    EXPECT_FALSE(ParseSweepText(xml, kPath, &spec, &error));
    EXPECT_EQ(error.where.file, kPath);
    return std::to_string(error.where.line) + ": " + error.message;
  }
};

TEST_F(ToleranceParserTest, ReadsTheBlock) {
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(ParseSweepText(
      Sweep(Block(" seed=\"7\" samples=\"200\" confidence=\"99%\" pass=\"energy\"",
                  "    <vary param=\"L\" within=\"10%\" spread=\"normal\" sigma=\"4%\"/>\n"
                  "    <vary param=\"Coss\" within=\"50p\" spread=\"corners\"/>\n"
                  "    <vary param=\"Vin\" within=\"2\"/>\n")),
      kPath, &spec, &error))
      << error.Format();
  const ToleranceSpec& t = spec.tolerances;
  ASSERT_TRUE(t.used);
  EXPECT_EQ(t.seed, 7u);
  EXPECT_EQ(t.samples, 200);
  EXPECT_DOUBLE_EQ(t.confidence, 0.99);
  EXPECT_EQ(t.pass, ToleranceSpec::Pass::kEnergy);
  EXPECT_EQ(t.corners, ToleranceSpec::Corners::kAuto);
  ASSERT_EQ(t.vary.size(), 3u);
  EXPECT_TRUE(t.vary[0].relative);
  EXPECT_DOUBLE_EQ(t.vary[0].within, 0.10);
  EXPECT_DOUBLE_EQ(t.vary[0].sigma, 0.04);
  EXPECT_EQ(t.vary[0].where.line, 7);
  EXPECT_FALSE(t.vary[1].relative);
  EXPECT_DOUBLE_EQ(t.vary[1].within, 50e-12);
  EXPECT_EQ(t.vary[1].spread, VarySpec::Spread::kCorners);
  // Uniform is the default spread; a normal's default sigma is a third of the band.
  EXPECT_EQ(t.vary[2].spread, VarySpec::Spread::kUniform);
  EXPECT_DOUBLE_EQ(t.vary[2].sigma, 2.0 / 3);
  // Moving a nominal value: relative widths scale it, absolute ones add.
  EXPECT_DOUBLE_EQ(t.vary[0].At(2e-6, 0.1), 2.2e-6);
  EXPECT_DOUBLE_EQ(t.vary[2].At(48, -2), 46);
}

TEST_F(ToleranceParserTest, BadVaryNamesItsLine) {
  const std::string s = " seed=\"1\" samples=\"10\"";
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"L\" within=\"0%\"/>\n"))),
            "7: 'within' must be positive, got '0%'");
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"L\" within=\"-50n\"/>\n"))),
            "7: 'within' must be positive, got '-50n'");
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"L\" within=\"10%\" spread=\"gauss\"/>\n"))),
            "7: unknown spread 'gauss' (use 'uniform', 'normal' or 'corners')");
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"L\" within=\"10%\" spread=\"normall\"/>\n"))),
            "7: unknown spread 'normall' (use 'uniform', 'normal' or 'corners'); did you mean "
            "'normal'?");
  EXPECT_EQ(Error(Sweep(Block(s,
                              "    <vary param=\"L\" within=\"10%\"/>\n"
                              "    <vary param=\"l\" within=\"5%\"/>\n"))),
            "8: parameter 'l' is varied twice (first on line 7)");
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"Iout\" within=\"10%\"/>\n"))),
            "7: 'Iout' is a swept axis (line 4); a tolerance varies a parameter around each "
            "point, so vary one the axes do not sweep");
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"td\" within=\"10%\"/>\n"))),
            "7: 'td' is derived by <derive> (line 5); vary a parameter it is derived from, or "
            "set it with <set>");
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"L\" within=\"10%\" sigma=\"3%\"/>\n"))),
            "7: 'sigma' goes with spread=\"normal\"");
  EXPECT_EQ(Error(Sweep(Block(
                s, "    <vary param=\"L\" within=\"10%\" spread=\"normal\" sigma=\"30n\"/>\n"))),
            "7: 'sigma' must be written like 'within' (a percentage)");
  EXPECT_EQ(Error(Sweep(Block(s, "    <vary param=\"L\" witin=\"10%\"/>\n"))),
            "7: unknown attribute 'witin' on <vary> (did you mean 'within'?)");
}

TEST_F(ToleranceParserTest, NumbersAreJudgedLikeEveryOther) {
  // "50MEGX" reads as 50MEG in SPICE, which is not what it looks like
  // (core/spice_number), so it is refused here as in every other attribute.
  std::string message = Error(
      Sweep(Block(" seed=\"1\" samples=\"4\"", "    <vary param=\"L\" within=\"50MEGX\"/>\n")));
  EXPECT_EQ(message.rfind("7: in attribute 'within': SPICE ignores the letters 'X'", 0), 0u)
      << message;
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(
      ParseSweepText(Sweep(Block(" corners=\"all\"", "    <vary param=\"L\" within=\"50nH\"/>\n")),
                     kPath, &spec, &error))
      << error.Format();
  ASSERT_EQ(spec.warnings.size(), 1u);  // the unit letters SPICE ignores
  EXPECT_EQ(spec.warnings[0].where.line, 7);
}

TEST_F(ToleranceParserTest, BadBlockNamesItsLine) {
  const std::string v = "    <vary param=\"L\" within=\"10%\"/>\n";
  EXPECT_EQ(Error(Sweep(Block(" samples=\"10\"", v))),
            "6: <tolerances samples=...> needs a 'seed' (a whole number), so every run draws the "
            "same samples");
  EXPECT_EQ(Error(Sweep(Block(" corners=\"some\"", v))),
            "6: 'corners' must be 'auto', 'all' or 'none', got 'some'");
  EXPECT_EQ(Error(Sweep(Block(" seed=\"1\" samples=\"2.5\"", v))),
            "6: 'samples' must be a whole number from 0 to 100000, got '2.5'");
  EXPECT_EQ(Error(Sweep(Block(" corners=\"none\"", v))),
            "6: <tolerances corners=\"none\"> without 'samples' asks for no variant at all");
  EXPECT_EQ(Error(Sweep(Block("", ""))), "6: <tolerances> has no <vary> element");
  EXPECT_EQ(Error(Sweep(Block(" confidence=\"40%\"", v))),
            "6: 'confidence' must lie from 50% to 99.99%, got '40%'");
  EXPECT_EQ(Error(Sweep(Block(" seeds=\"1\"", v))),
            "6: unknown attribute 'seeds' on <tolerances> (did you mean 'seed'?)");
  EXPECT_EQ(Error(Sweep(Block("", "    <vari param=\"L\" within=\"10%\"/>\n"))),
            "7: unknown element <vari> in <tolerances> (did you mean <vary>?)");
  EXPECT_EQ(Error(Sweep(Block("", v) + Block("", v))),
            "9: more than one <tolerances> (first on line 6)");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"0.5\"/>\n" + Block("", v))),
            "7: <tolerances> and <refine> in one sweep are not supported yet: refine the nominal "
            "map first, then run the tolerances on the points you keep");
}

// <vary device=...>: a parameter of a <device>'s subcircuit. The device on
// line 6, its axis on line 7, the block from line 8 (its <vary> on line 9).
TEST_F(ToleranceParserTest, DeviceParameterIsReadAndChecked) {
  auto with_device = [&](const std::string& axis, const std::string& varies) {
    return Sweep("  <device name=\"fast\" model=\"zsw_linear\"/>\n" + axis +
                 Block(" seed=\"1\" samples=\"4\"", varies));
  };
  const std::string axis = "  <axis device=\"leg.high leg.low\" values=\"fast\"/>\n";
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(
      ParseSweepText(with_device(axis,
                                 "    <vary device=\"fast\" param=\"COSS_F\" within=\"20%\"/>\n"
                                 "    <vary param=\"L\" within=\"10%\"/>\n"),
                     kPath, &spec, &error))
      << error.Format();
  ASSERT_EQ(spec.tolerances.vary.size(), 2u);
  const VarySpec& v = spec.tolerances.vary[0];
  EXPECT_TRUE(v.OnDevice());
  EXPECT_EQ(v.device, "fast");
  EXPECT_EQ(v.param, "coss_f");  // subcircuit parameters match in lower case
  EXPECT_EQ(v.Label(), "fast.coss_f");
  EXPECT_EQ(spec.tolerances.vary[1].Label(), "L");
  // A device parameter is not looked up among the template's .params.
  EXPECT_TRUE(CheckParamsKnown(spec, {"vin", "iout", "td", "l"}).empty());
  // The device's parameter and a template parameter of the same name are two things.
  EXPECT_TRUE(ParseSweepText(with_device(axis,
                                         "    <vary device=\"fast\" param=\"L\" within=\"20%\"/>\n"
                                         "    <vary param=\"L\" within=\"10%\"/>\n"),
                             kPath, &spec, &error))
      << error.Format();

  EXPECT_EQ(
      Error(with_device(axis, "    <vary device=\"fats\" param=\"coss_f\" within=\"20%\"/>\n")),
      "9: unknown device 'fats' in <vary device=...> (declared: fast; did you mean "
      "'fast'?)");
  EXPECT_EQ(Error(with_device("", "    <vary device=\"fast\" param=\"coss_f\" within=\"20%\"/>\n")),
            "8: device 'fast' is in no <axis device=...>, so no point uses it and varying its "
            "'coss_f' would change nothing");
  EXPECT_EQ(
      Error(with_device(axis, "    <vary device=\"fa st\" param=\"coss_f\" within=\"20%\"/>\n")),
      "9: bad device name 'fa st' (the name of a <device>: letters, digits, '_' and '-')");
  EXPECT_EQ(Error(with_device(axis,
                              "    <vary device=\"fast\" param=\"coss_f\" within=\"20%\"/>\n"
                              "    <vary device=\"FAST\" param=\"Coss_F\" within=\"5%\"/>\n")),
            "10: parameter 'FAST.coss_f' is varied twice (first on line 9)");
  EXPECT_EQ(
      Error(with_device(axis, "    <vary device=\"fast\" param=\"coss_f\" within=\"-1n\"/>\n")),
      "9: 'within' must be positive, got '-1n'");
}

TEST_F(ToleranceParserTest, UnknownParameterGetsADidYouMean) {
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(ParseSweepText(Sweep(Block("", "    <vary param=\"Lx\" within=\"10%\"/>\n")), kPath,
                             &spec, &error))
      << error.Format();
  std::vector<Diagnostic> problems = CheckParamsKnown(spec, {"vin", "iout", "td", "l", "lx1"});
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].where.line, 7);
  EXPECT_NE(problems[0].message.find("unknown parameter 'Lx'"), std::string::npos)
      << problems[0].message;
  EXPECT_NE(problems[0].message.find("did you mean"), std::string::npos) << problems[0].message;
}

}  // namespace
}  // namespace zvsmap
