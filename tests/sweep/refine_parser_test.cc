#include "sweep/refine_parser.h"

#include <gtest/gtest.h>

#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

// The expected messages, lines and halvings are the <refine> element's own
// specification (README "Adaptive refinement"), written by hand.
class RefineParserTest : public ::testing::Test {
 protected:
  static constexpr const char* kPath = "sweeps/refine.xml";
  // A sweep with a template on line 2, Vin fixed on line 3, the axes L and
  // Iout on lines 4 and 5, a device axis on lines 6-8; `body` starts on line 9.
  static std::string Sweep(const std::string& body) {
    return "<sweep>\n  <template file=\"../netlists/buck.cir\"/>\n"
           "  <set param=\"Vin\" value=\"48\"/>\n"
           "  <axis param=\"L\" from=\"0.6u\" to=\"3u\" step=\"0.6u\"/>\n"
           "  <axis param=\"Iout\" from=\"0\" to=\"8\" step=\"2\"/>\n"
           "  <device name=\"a\" model=\"zsw_linear\"/>\n"
           "  <device name=\"b\" model=\"zsw_linear\"/>\n"
           "  <axis device=\"leg.high leg.low\" values=\"a b\"/>\n" +
           body + "</sweep>\n";
  }
  std::string Error(const std::string& xml) {
    SweepSpec spec;
    Diagnostic error;
    EXPECT_FALSE(ParseSweepText(xml, kPath, &spec, &error));
    EXPECT_EQ(error.where.file, kPath);
    return std::to_string(error.where.line) + ": " + error.message;
  }
};

TEST_F(RefineParserTest, HalvingsReachTheResolution) {
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(ParseSweepText(Sweep("  <refine param=\"Iout\" resolution=\"0.5\"/>\n"
                                   "  <refine param=\"l\" resolution=\"0.1u\"/>\n"),
                             kPath, &spec, &error))
      << error.Format();
  ASSERT_EQ(spec.refine.size(), 2u);
  // Iout steps 2 -> 1 -> 0.5: two halvings reach 0.5 exactly.
  EXPECT_EQ(spec.refine[0].group, 1u);
  EXPECT_EQ(spec.refine[0].levels, 2);
  EXPECT_DOUBLE_EQ(spec.refine[0].coarse_step, 2);
  // L steps 0.6u -> 0.3u -> 0.15u -> 0.075u: three to get to 0.1u or finer.
  EXPECT_EQ(spec.refine[1].group, 0u);
  EXPECT_EQ(spec.refine[1].levels, 3);
  EXPECT_EQ(spec.refine[1].where.line, 10);
}

TEST_F(RefineParserTest, BadElementsNameTheirLine) {
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iuot\" resolution=\"0.5\"/>\n")),
            "9: no axis 'Iuot' to refine (did you mean 'Iout'?)");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"0\"/>\n")),
            "9: 'resolution' must be positive, got '0'");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"-1\"/>\n")),
            "9: 'resolution' must be positive, got '-1'");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"abc\"/>\n")),
            "9: bad number 'abc' in attribute 'resolution'");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\"/>\n")),
            "9: missing attribute 'resolution' on <refine>");
  EXPECT_EQ(Error(Sweep("  <refine resolution=\"1\"/>\n")),
            "9: missing attribute 'param' on <refine>");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"1\" step=\"1\"/>\n")),
            "9: unknown attribute 'step' on <refine> (it takes 'param' and 'resolution')");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"1\"/>\n"
                        "  <refine param=\"IOUT\" resolution=\"0.5\"/>\n")),
            "10: axis 'IOUT' is refined twice (first on line 9)");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Vin\" resolution=\"1\"/>\n")),
            "9: 'Vin' is held fixed by <set>, not swept by an <axis>");
  EXPECT_EQ(Error(Sweep("  <refine param=\"leg.high\" resolution=\"1\"/>\n")),
            "9: 'leg.high' is a device axis: its values are switch models, with no spacing to "
            "refine");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"2\"/>\n")),
            "9: resolution 2 of axis 'Iout' is not finer than its spacing 2: nothing to refine");
  EXPECT_EQ(Error(Sweep("  <refine param=\"Iout\" resolution=\"1m\"/>\n")),
            "9: resolution 1m of axis 'Iout' is more than 1024 times finer than its spacing 2 "
            "(refine a finer coarse grid instead)");
}

TEST_F(RefineParserTest, LockstepDerivedAndSingleValueAxesAreRefused) {
  std::string lockstep =
      "<sweep>\n  <template file=\"x.cir\"/>\n  <lockstep>\n"
      "    <axis param=\"Vin\" values=\"36 48\"/>\n    <axis param=\"Vout\" values=\"9 12\"/>\n"
      "  </lockstep>\n  <refine param=\"Vout\" resolution=\"1\"/>\n</sweep>\n";
  EXPECT_EQ(Error(lockstep),
            "7: axis 'Vout' moves in a <lockstep> group; only a plain <axis> can be refined");
  std::string derived =
      "<sweep>\n  <template file=\"x.cir\"/>\n  <axis param=\"Vin\" values=\"36 48\"/>\n"
      "  <derive param=\"D\" expr=\"12/Vin\"/>\n  <refine param=\"D\" resolution=\"0.01\"/>\n"
      "</sweep>\n";
  EXPECT_EQ(Error(derived), "5: 'D' is derived by <derive>, not swept by an <axis>");
  std::string single =
      "<sweep>\n  <template file=\"x.cir\"/>\n  <axis param=\"Vin\" values=\"48\"/>\n"
      "  <refine param=\"Vin\" resolution=\"1\"/>\n</sweep>\n";
  EXPECT_EQ(Error(single), "4: axis 'Vin' has one value: nothing to refine between");
}

}  // namespace
}  // namespace zvsmap
