#include "sweep/sweep_parser.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <fstream>

namespace zvsmap {
namespace {

// Unless a check names another source, the expected text, line and values are
// the sweep-file format's own specification (written by hand from the format
// description, not produced by running the parser).
class SweepParserTest : public ::testing::Test {
 protected:
  static constexpr const char* kPath = "sweeps/demo.xml";

  // A sweep with a template on line 2; `body` starts on line 3.
  static std::string Sweep(const std::string& body) {
    return "<sweep>\n  <template file=\"../netlists/buck.cir\"/>\n" + body + "</sweep>\n";
  }
  SweepSpec Parse(const std::string& xml) {
    SweepSpec spec;
    Diagnostic error;
    EXPECT_TRUE(ParseSweepText(xml, kPath, &spec, &error)) << error.Format();
    return spec;
  }
  // "line: message" of the failure; also keeps the diagnostic in error_.
  std::string Error(const std::string& xml) {
    SweepSpec spec;
    error_ = Diagnostic();
    EXPECT_FALSE(ParseSweepText(xml, kPath, &spec, &error_));
    EXPECT_EQ(error_.where.file, kPath);
    return std::to_string(error_.where.line) + ": " + error_.message;
  }
  Diagnostic error_;
};

// ---- valid files ----

TEST_F(SweepParserTest, FullExample) {
  SweepSpec spec = Parse(R"(<?xml version="1.0"?>
<!-- Invented scenario: a 48 V buck explored over load, inductance and frequency. -->
<sweep>
  <template file="../netlists/buck_halfbridge.cir"/>
  <set param="Vin" value="48"/>
  <axis param="Iout" from="0" to="8" step="1"/>
  <axis param="L" from="0.47u" to="2.2u" count="5"/>
  <axis param="fsw" from="200k" to="1meg" count="5" spacing="log"/>
  <lockstep>
    <axis param="Vout" values="5 12"/>
    <axis param="Cout" values="100u, 47u"/>
  </lockstep>
  <derive param="D" expr="Vout/Vin"/>
  <simulation settle-periods="60" measure-lead="0.5" max-step="2n" reltol="1e-4" timeout="120"/>
  <zvs residual="10%"/>
  <limits max-points="20000"/>
</sweep>
)");
  EXPECT_EQ(spec.path, kPath);
  EXPECT_EQ(spec.template_path, "netlists/buck_halfbridge.cir");
  EXPECT_EQ(spec.template_where.line, 4);
  ASSERT_EQ(spec.fixed.size(), 1u);
  EXPECT_EQ(spec.fixed[0].param, "Vin");
  EXPECT_EQ(spec.fixed[0].value, 48);
  EXPECT_EQ(spec.fixed[0].where.line, 5);
  ASSERT_EQ(spec.groups.size(), 4u);
  EXPECT_EQ(spec.groups[0].axes[0].param, "Iout");
  EXPECT_EQ(spec.groups[0].size(), 9u);
  EXPECT_EQ(spec.groups[1].size(), 5u);
  EXPECT_EQ(spec.groups[2].size(), 5u);
  EXPECT_FALSE(spec.groups[2].lockstep);
  EXPECT_TRUE(spec.groups[3].lockstep);
  EXPECT_EQ(spec.groups[3].where.line, 9);
  ASSERT_EQ(spec.groups[3].axes.size(), 2u);
  EXPECT_EQ(spec.groups[3].axes[1].param, "Cout");
  EXPECT_EQ(spec.groups[3].axes[1].where.line, 11);
  EXPECT_DOUBLE_EQ(spec.groups[3].axes[1].values[0], 100e-6);
  EXPECT_DOUBLE_EQ(spec.groups[3].axes[1].values[1], 47e-6);
  ASSERT_EQ(spec.derived.size(), 1u);
  EXPECT_EQ(spec.derived[0].expression, "Vout/Vin");
  EXPECT_EQ(spec.simulation.settle_periods, 60);
  EXPECT_DOUBLE_EQ(spec.simulation.measure_lead, 0.5);
  EXPECT_DOUBLE_EQ(spec.simulation.max_step_s, 2e-9);
  EXPECT_DOUBLE_EQ(spec.simulation.reltol, 1e-4);
  EXPECT_DOUBLE_EQ(spec.simulation.timeout_s, 120);
  EXPECT_EQ(spec.zvs.kind, ZvsCriterion::Kind::kFraction);
  EXPECT_DOUBLE_EQ(spec.zvs.value, 0.1);
  EXPECT_EQ(spec.max_points, 20000u);
  EXPECT_EQ(spec.limits_where.line, 16);
  EXPECT_EQ(spec.GridSize(), 9u * 5u * 5u * 2u);
}

TEST_F(SweepParserTest, Defaults) {
  SweepSpec spec = Parse(Sweep(""));
  SimulationSettings defaults;
  EXPECT_EQ(spec.simulation.settle_periods, defaults.settle_periods);
  EXPECT_TRUE(std::isnan(spec.simulation.measure_lead));  // the template's, or a period
  EXPECT_TRUE(std::isnan(defaults.measure_lead));
  EXPECT_EQ(spec.simulation.max_step_s, defaults.max_step_s);
  EXPECT_EQ(spec.simulation.reltol, defaults.reltol);
  EXPECT_EQ(spec.simulation.timeout_s, defaults.timeout_s);
  EXPECT_EQ(spec.zvs.kind, ZvsCriterion::Kind::kFraction);
  EXPECT_DOUBLE_EQ(spec.zvs.value, 0.1);
  EXPECT_EQ(spec.max_points, 10000u);
  EXPECT_EQ(spec.limits_where.line, 1);  // no <limits>: the <sweep> root
  EXPECT_EQ(spec.GridSize(), 1u);        // no axes: one point
}

TEST_F(SweepParserTest, TemplatePathIsRelativeToTheSweepFolder) {
  EXPECT_EQ(Parse(Sweep("")).template_path, "netlists/buck.cir");
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(
      ParseSweepText("<sweep><template file=\"t.cir\"/></sweep>", "demo.xml", &spec, &error));
  EXPECT_EQ(spec.template_path, "t.cir");
  ASSERT_TRUE(
      ParseSweepText("<sweep><template file=\"/abs/t.cir\"/></sweep>", kPath, &spec, &error));
  EXPECT_EQ(spec.template_path, "/abs/t.cir");
}

TEST_F(SweepParserTest, StepRangeWithFloatingRounding) {
  // 0..1 in steps of 0.1 is 11 values although 0.1 is not exact in binary
  // (IEEE 754; Goldberg, "What every computer scientist should know about
  // floating-point arithmetic", 1991).
  SweepSpec spec = Parse(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" step=\"0.1\"/>\n"));
  const std::vector<double>& v = spec.groups[0].axes[0].values;
  ASSERT_EQ(v.size(), 11u);
  for (int i = 0; i <= 10; ++i) EXPECT_NEAR(v[i], i / 10.0, 1e-15) << i;
  EXPECT_EQ(v.back(), 1.0);
  // 0.3 / 0.1 is 2.9999999999999996 in doubles: still 4 values.
  spec = Parse(Sweep("  <axis param=\"x\" from=\"0\" to=\"0.3\" step=\"0.1\"/>\n"));
  EXPECT_EQ(spec.groups[0].axes[0].values.size(), 4u);
}

TEST_F(SweepParserTest, StepRangeDownwardsAndSinglePoint) {
  SweepSpec spec =
      Parse(Sweep("  <axis param=\"x\" from=\"1\" to=\"0\" step=\"-0.25\"/>\n"
                  "  <axis param=\"y\" from=\"5\" to=\"5\" step=\"1\"/>\n"));
  EXPECT_EQ(spec.groups[0].axes[0].values, (std::vector<double>{1, 0.75, 0.5, 0.25, 0}));
  EXPECT_EQ(spec.groups[1].axes[0].values, (std::vector<double>{5}));
}

TEST_F(SweepParserTest, LinearCount) {
  // Evenly spaced: from + (to - from) * i / (count - 1) (from memory).
  SweepSpec spec = Parse(Sweep("  <axis param=\"L\" from=\"0.47u\" to=\"2.2u\" count=\"5\"/>\n"));
  const std::vector<double>& v = spec.groups[0].axes[0].values;
  ASSERT_EQ(v.size(), 5u);
  for (int i = 0; i < 5; ++i) EXPECT_NEAR(v[i], 0.47e-6 + (2.2e-6 - 0.47e-6) * i / 4, 1e-20);
  EXPECT_EQ(v.front(), 0.47e-6);
  EXPECT_EQ(v.back(), 2.2e-6);
}

TEST_F(SweepParserTest, LogSpacing) {
  // Geometric sequence: equal ratios, exp(ln a + t (ln b - ln a)) (from memory).
  SweepSpec spec = Parse(
      Sweep("  <axis param=\"fsw\" from=\"200k\" to=\"1meg\" count=\"5\" spacing=\"log\"/>\n"));
  const std::vector<double>& v = spec.groups[0].axes[0].values;
  ASSERT_EQ(v.size(), 5u);
  for (int i = 0; i < 5; ++i) {
    double expected = std::exp(std::log(200e3) + i / 4.0 * (std::log(1e6) - std::log(200e3)));
    EXPECT_NEAR(v[i], expected, 1e-9 * expected) << i;
  }
  EXPECT_NEAR(v[2], std::sqrt(200e3 * 1e6), 1e-6);  // the geometric mean in the middle
  EXPECT_EQ(v.front(), 200e3);
  EXPECT_EQ(v.back(), 1e6);
}

TEST_F(SweepParserTest, CountOneWithEqualBounds) {
  SweepSpec spec = Parse(Sweep("  <axis param=\"x\" from=\"3\" to=\"3\" count=\"1\"/>\n"));
  EXPECT_EQ(spec.groups[0].axes[0].values, (std::vector<double>{3}));
}

TEST_F(SweepParserTest, ValueListSeparators) {
  SweepSpec spec = Parse(Sweep("  <axis param=\"Vout\" values=\" 5,12 ,\n 24  3.3k\"/>\n"));
  EXPECT_EQ(spec.groups[0].axes[0].values, (std::vector<double>{5, 12, 24, 3300}));
}

TEST_F(SweepParserTest, ZvsResidual) {
  SweepSpec spec = Parse(Sweep("  <zvs residual=\"2.5\"/>\n"));
  EXPECT_EQ(spec.zvs.kind, ZvsCriterion::Kind::kAbsolute);
  EXPECT_DOUBLE_EQ(spec.zvs.value, 2.5);
  EXPECT_DOUBLE_EQ(spec.zvs.Limit(48), 2.5);
  EXPECT_EQ(spec.zvs.Describe(), "v_turn_on <= 2.5 V");
  spec = Parse(Sweep("  <zvs residual=\"500m\"/>\n"));
  EXPECT_DOUBLE_EQ(spec.zvs.value, 0.5);
  spec = Parse(Sweep("  <zvs residual=\"10%\"/>\n"));
  EXPECT_EQ(spec.zvs.Describe(), "v_turn_on <= 10% of rail");
  // The "10 % of the input voltage" convention, netlists/references.md section 6 [common].
  EXPECT_DOUBLE_EQ(spec.zvs.Limit(48), 4.8);
  spec = Parse(Sweep("  <zvs residual=\"2.5%\"/>\n"));
  EXPECT_EQ(spec.zvs.Describe(), "v_turn_on <= 2.5% of rail");
}

TEST_F(SweepParserTest, NamedParams) {
  SweepSpec spec =
      Parse(Sweep("  <derive param=\"D\" expr=\"Vout/Vin\"/>\n"
                  "  <axis param=\"Vout\" values=\"5\"/>\n"
                  "  <set param=\"Vin\" value=\"48\"/>\n"));
  auto named = spec.NamedParams();
  ASSERT_EQ(named.size(), 3u);
  // fixed, then axes, then derived
  EXPECT_EQ(named[0].first, "Vin");
  EXPECT_EQ(named[0].second.line, 5);
  EXPECT_EQ(named[1].first, "Vout");
  EXPECT_EQ(named[1].second.line, 4);
  EXPECT_EQ(named[2].first, "D");
  EXPECT_EQ(named[2].second.line, 3);
}

// ---- errors, one per rule ----

TEST_F(SweepParserTest, MalformedXml) {
  // pugixml's own description (pugixml 1.13 manual, xml_parse_result).
  EXPECT_EQ(Error("<sweep>\n  <set param=\"a\" value=\"1\">\n</sweep>\n"),
            "3: malformed XML: Start-end tags mismatch");
  EXPECT_EQ(Error(""), "1: malformed XML: No document element found");
  EXPECT_EQ(Error("<sweep>\n  <set param=\"a\n"),
            "2: malformed XML: Error parsing element attribute");
}

TEST_F(SweepParserTest, RootElement) {
  EXPECT_EQ(Error("<!-- x -->\n<sweeps/>\n"),
            "2: root element is <sweeps>; a sweep file starts with <sweep>");
  EXPECT_EQ(Error("<sweep version=\"1\"/>"), "1: unknown attribute 'version' on <sweep>");
}

TEST_F(SweepParserTest, UnknownElement) {
  EXPECT_EQ(Error(Sweep("  <axsi param=\"x\" values=\"1\"/>\n")),
            "3: unknown element <axsi> in <sweep> (did you mean <axis>?)");
  EXPECT_EQ(Error(Sweep("  <frobnicate/>\n")), "3: unknown element <frobnicate> in <sweep>");
  EXPECT_EQ(Error(Sweep("  <lockstep>\n    <axes param=\"x\" values=\"1\"/>\n  </lockstep>\n")),
            "4: unknown element <axes> in <lockstep> (did you mean <axis>?)");
  EXPECT_EQ(Error(Sweep("  <lockstep>\n    <set param=\"x\" value=\"1\"/>\n  </lockstep>\n")),
            "4: unknown element <set> in <lockstep>");
}

TEST_F(SweepParserTest, CaretPointsAtTheElement) {
  Error(Sweep("  <axsi param=\"x\" values=\"1\"/>\n"));
  EXPECT_EQ(error_.Format(),
            "sweeps/demo.xml:3: unknown element <axsi> in <sweep> (did you mean <axis>?)\n"
            "  <axsi param=\"x\" values=\"1\"/>\n"
            "  ^");
}

TEST_F(SweepParserTest, UnknownAttribute) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"Iout\" from=\"0\" to=\"8\" stpe=\"1\"/>\n")),
            "3: unknown attribute 'stpe' on <axis> (did you mean 'step'?)");
  EXPECT_EQ(error_.where.column, 36);  // the caret under "stpe" (indent removed)
  EXPECT_EQ(Error(Sweep("  <set param=\"Vin\" value=\"48\" unit=\"V\"/>\n")),
            "3: unknown attribute 'unit' on <set>");
  EXPECT_EQ(Error(Sweep("  <simulation reltool=\"1e-3\"/>\n")),
            "3: unknown attribute 'reltool' on <simulation> (did you mean 'reltol'?)");
}

TEST_F(SweepParserTest, AttributeOnALaterLineOfTheElement) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"Iout\"\n        from=\"zero\" to=\"8\" step=\"1\"/>\n")),
            "4: bad number 'zero' in attribute 'from'");
}

TEST_F(SweepParserTest, DuplicateAttribute) {
  EXPECT_EQ(Error(Sweep("  <set param=\"Vin\" value=\"48\" value=\"12\"/>\n")),
            "3: attribute 'value' given twice on <set>");
}

TEST_F(SweepParserTest, MissingAttribute) {
  EXPECT_EQ(Error(Sweep("  <set value=\"1\"/>\n")), "3: missing attribute 'param' on <set>");
  EXPECT_EQ(Error(Sweep("  <set param=\"Vin\"/>\n")), "3: missing attribute 'value' on <set>");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" step=\"1\"/>\n")),
            "3: missing attribute 'to' on <axis>");
  EXPECT_EQ(Error(Sweep("  <derive param=\"D\"/>\n")), "3: missing attribute 'expr' on <derive>");
  EXPECT_EQ(Error("<sweep>\n  <template/>\n</sweep>"), "2: missing attribute 'file' on <template>");
  EXPECT_EQ(Error(Sweep("  <zvs/>\n")), "3: missing attribute 'residual' on <zvs>");
  EXPECT_EQ(Error(Sweep("  <derive param=\"D\" expr=\" \"/>\n")),
            "3: empty attribute 'expr' on <derive>");
}

TEST_F(SweepParserTest, BadNumber) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"abc\" to=\"1\" step=\"1\"/>\n")),
            "3: bad number 'abc' in attribute 'from'");
  EXPECT_EQ(Error(Sweep("  <set param=\"Vin\" value=\"1.2.3\"/>\n")),
            "3: bad number '1.2.3' in attribute 'value'");
  EXPECT_EQ(Error(Sweep("  <axis param=\"Vout\" values=\"5 x 12\"/>\n")),
            "3: bad number 'x' in attribute 'values'");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" step=\"1e\"/>\n")),
            "3: bad number '1e' in attribute 'step'");
  EXPECT_EQ(Error(Sweep("  <simulation max-step=\"fast\"/>\n")),
            "3: bad number 'fast' in attribute 'max-step'");
  EXPECT_EQ(Error(Sweep("  <zvs residual=\"ten%\"/>\n")),
            "3: bad number 'ten%' in attribute 'residual'");
}

TEST_F(SweepParserTest, EmptyAxis) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"Vout\" values=\"\"/>\n")), "3: axis 'Vout' has no values");
  EXPECT_EQ(Error(Sweep("  <axis param=\"Vout\" values=\" , \"/>\n")),
            "3: axis 'Vout' has no values");
}

TEST_F(SweepParserTest, AxisShape) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" values=\"1\" from=\"0\"/>\n")),
            "3: <axis> takes either 'values' or 'from'/'to', not both");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\"/>\n")),
            "3: <axis> needs 'values', or 'from', 'to' and 'step' or 'count'");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\"/>\n")),
            "3: <axis> with 'from'/'to' needs 'step' or 'count'");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" step=\"1\" count=\"2\"/>\n")),
            "3: <axis> takes 'step' or 'count', not both");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"1\" to=\"2\" step=\"1\" spacing=\"log\"/>\n")),
            "3: spacing=\"log\" needs 'count', not 'step'");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"1\" to=\"2\" count=\"2\" spacing=\"lin\"/>\n")),
            "3: bad spacing 'lin' (use 'linear' or 'log')");
  EXPECT_EQ(Error(Sweep("  <axis param=\"1x\" values=\"1\"/>\n")),
            "3: bad parameter name '1x' (letters, digits and '_', not starting with a digit)");
}

TEST_F(SweepParserTest, StepZeroOrWrongSign) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"8\" step=\"0\"/>\n")),
            "3: step must not be zero");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"8\" step=\"-1\"/>\n")),
            "3: step -1 has the wrong sign to go from 0 to 8");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"8\" to=\"0\" step=\"2\"/>\n")),
            "3: step 2 has the wrong sign to go from 8 to 0");
}

TEST_F(SweepParserTest, RangeNeverReachesItsEnd) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"8\" step=\"3\"/>\n")),
            "3: range never reaches its end: from 0 in steps of 3 passes 8 between 6 and 9");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" step=\"2\"/>\n")),
            "3: range never reaches its end: from 0 in steps of 2 passes 1 between 0 and 2");
}

TEST_F(SweepParserTest, AbsurdlyLongAxis) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" step=\"1n\"/>\n")),
            "3: range has 1000000001 values, more than 1000000");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" count=\"1g\"/>\n")),
            "3: range has 1000000000 values, more than 1000000");
}

TEST_F(SweepParserTest, BadCount) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" count=\"0\"/>\n")),
            "3: 'count' must be a whole number of at least 1, got '0'");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" count=\"2.5\"/>\n")),
            "3: 'count' must be a whole number of at least 1, got '2.5'");
  EXPECT_EQ(Error(Sweep("  <axis param=\"x\" from=\"0\" to=\"1\" count=\"1\"/>\n")),
            "3: count=1 needs from equal to to (got 0 and 1)");
}

TEST_F(SweepParserTest, LogSpacingNeedsPositiveBounds) {
  EXPECT_EQ(
      Error(Sweep("  <axis param=\"f\" from=\"0\" to=\"1meg\" count=\"5\" spacing=\"log\"/>\n")),
      "3: log spacing needs positive bounds, got from=0 to=1000000");
  EXPECT_EQ(
      Error(Sweep("  <axis param=\"f\" from=\"-1\" to=\"-10\" count=\"5\" spacing=\"log\"/>\n")),
      "3: log spacing needs positive bounds, got from=-1 to=-10");
}

TEST_F(SweepParserTest, LockstepLengths) {
  EXPECT_EQ(Error(Sweep("  <lockstep>\n"
                        "    <axis param=\"Vout\" values=\"5 12\"/>\n"
                        "    <axis param=\"Cout\" values=\"100u 47u 22u\"/>\n"
                        "  </lockstep>\n")),
            "5: lockstep axes differ in length: 'Vout' has 2 values, 'Cout' has 3");
  EXPECT_EQ(Error(Sweep("  <lockstep>\n  </lockstep>\n")), "3: <lockstep> has no axes");
}

TEST_F(SweepParserTest, ParameterNamedTwice) {
  // SPICE names are case-insensitive (ngspice manual, from memory): Vin == vin.
  EXPECT_EQ(Error(Sweep("  <set param=\"Vin\" value=\"48\"/>\n"
                        "  <axis param=\"vin\" values=\"36 48\"/>\n")),
            "4: parameter 'vin' is named twice (first on line 3)");
  EXPECT_EQ(Error(Sweep("  <axis param=\"Vout\" values=\"5 12\"/>\n"
                        "  <lockstep>\n"
                        "    <axis param=\"Vout\" values=\"5 12\"/>\n"
                        "    <axis param=\"Cout\" values=\"100u 47u\"/>\n"
                        "  </lockstep>\n")),
            "5: parameter 'Vout' is named twice (first on line 3)");
  EXPECT_EQ(Error(Sweep("  <set param=\"D\" value=\"0.5\"/>\n"
                        "  <derive param=\"D\" expr=\"Vout/Vin\"/>\n")),
            "4: parameter 'D' is named twice (first on line 3)");
}

TEST_F(SweepParserTest, OnceOnlyElements) {
  EXPECT_EQ(Error(Sweep("  <template file=\"b.cir\"/>\n")),
            "3: more than one <template> (first on line 2)");
  EXPECT_EQ(Error(Sweep("  <zvs residual=\"1\"/>\n  <zvs residual=\"2\"/>\n")),
            "4: more than one <zvs> (first on line 3)");
}

TEST_F(SweepParserTest, MissingTemplate) {
  EXPECT_EQ(Error("<sweep>\n  <set param=\"Vin\" value=\"48\"/>\n</sweep>\n"),
            "1: missing <template file=\"...\"/>");
}

TEST_F(SweepParserTest, BadSettings) {
  EXPECT_EQ(Error(Sweep("  <simulation settle-periods=\"2.5\"/>\n")),
            "3: 'settle-periods' must be a whole number of at least 1, got '2.5'");
  EXPECT_EQ(Error(Sweep("  <simulation measure-lead=\"0\"/>\n")),
            "3: 'measure-lead' must be positive, got '0'");
  EXPECT_EQ(Error(Sweep("  <simulation reltol=\"-1e-3\"/>\n")),
            "3: 'reltol' must be positive, got '-1e-3'");
  EXPECT_EQ(Error(Sweep("  <zvs residual=\"0%\"/>\n")), "3: 'residual' must be positive, got '0%'");
  EXPECT_EQ(Error(Sweep("  <limits max-points=\"0\"/>\n")),
            "3: 'max-points' must be a whole number of at least 1, got '0'");
}

// The ranges README "Ranges of the settings" gives each setting (common
// practice, no source; the lead's minimum is README's own rule).
TEST_F(SweepParserTest, SettingsOutsideTheirRange) {
  EXPECT_EQ(Error(Sweep("  <simulation measure-lead=\"0.01\"/>\n")),
            "3: 'measure-lead' must be at least 0.05, got '0.01' (periods; the states not set "
            "at t = 0 need time to settle before a measurement)");
  EXPECT_EQ(Error(Sweep("  <simulation measure-lead=\"101\"/>\n")),
            "3: 'measure-lead' must be at most 100, got '101' (periods; a longer lead adds run "
            "time, not accuracy)");
  EXPECT_EQ(Error(Sweep("  <simulation settle-periods=\"0\"/>\n")),
            "3: 'settle-periods' must be a whole number of at least 1, got '0'");
  EXPECT_EQ(Error(Sweep("  <simulation settle-periods=\"2000\"/>\n")),
            "3: 'settle-periods' (2000) is more than 'max-periods' (1000): settling stops after "
            "max-periods periods");
  EXPECT_EQ(Error(Sweep("  <simulation settle-periods=\"50\" max-periods=\"40\"/>\n")),
            "3: 'settle-periods' (50) is more than 'max-periods' (40): settling stops after "
            "max-periods periods");
  EXPECT_EQ(Error(Sweep("  <simulation reltol=\"0.5\"/>\n")),
            "3: 'reltol' must be at most 0.1, got '0.5' (coarser than any result worth "
            "measuring)");
  EXPECT_EQ(Error(Sweep("  <simulation reltol=\"1e-12\"/>\n")),
            "3: 'reltol' must be at least 1e-09, got '1e-12' (finer than double precision can "
            "solve)");
  EXPECT_EQ(Error(Sweep("  <simulation timeout=\"0\"/>\n")),
            "3: 'timeout' must be positive, got '0'");
  EXPECT_EQ(Error(Sweep("  <simulation timeout=\"-5\"/>\n")),
            "3: 'timeout' must be positive, got '-5'");
  EXPECT_EQ(Error(Sweep("  <simulation timeout=\"0.5\"/>\n")),
            "3: 'timeout' must be at least 1, got '0.5' (seconds; no point settles in less)");
  EXPECT_EQ(Error(Sweep("  <simulation max-step=\"0\"/>\n")),
            "3: 'max-step' must be positive, got '0'");
  EXPECT_EQ(Error(Sweep("  <simulation max-step=\"2\"/>\n")),
            "3: 'max-step' must be at most 1, got '2' (a step bound of seconds resolves no edge)");
  EXPECT_EQ(Error(Sweep("  <simulation settle-tolerance=\"0.5\"/>\n")),
            "3: 'settle-tolerance' must be at most 0.1, got '0.5' (relative to each state's "
            "ripple: above 10% a drifting state counts as settled)");
  EXPECT_EQ(Error(Sweep("  <simulation max-newton=\"500\"/>\n")),
            "3: 'max-newton' must be at most 100, got '500' (Newton converges in a few "
            "iterations or not at all)");
  EXPECT_EQ(Error(Sweep("  <simulation max-periods=\"0\"/>\n")),
            "3: 'max-periods' must be a whole number of at least 1, got '0'");
  EXPECT_EQ(Error(Sweep("  <zvs residual=\"150%\"/>\n")),
            "3: 'residual' must be below 50%, got '150%' (an edge above half the rail is hard, "
            "so no edge could be partial)");
  EXPECT_EQ(Error(Sweep("  <zvs residual=\"-2\"/>\n")), "3: 'residual' must be positive, got '-2'");
  // The edges of each range are inside it.
  SweepSpec spec = Parse(Sweep(
      "  <simulation settle-periods=\"1\" measure-lead=\"100\" reltol=\"0.1\" timeout=\"1\"\n"
      "              max-newton=\"0\" max-periods=\"1\" settle-tolerance=\"0.1\" max-step=\"1\"/>\n"
      "  <zvs residual=\"49.9%\"/>\n"));
  EXPECT_EQ(spec.simulation.settle_periods, 1);
  EXPECT_DOUBLE_EQ(spec.simulation.measure_lead, 100);
  EXPECT_DOUBLE_EQ(spec.zvs.value, 0.499);
}

// The probe runs (dead-time window): on by default, "off" skips them.
TEST_F(SweepParserTest, ProbeIsOnUnlessSwitchedOff) {
  EXPECT_TRUE(Parse(Sweep("")).simulation.probe);
  EXPECT_TRUE(Parse(Sweep("  <simulation probe=\"on\"/>\n")).simulation.probe);
  EXPECT_FALSE(Parse(Sweep("  <simulation probe=\"off\"/>\n")).simulation.probe);
  EXPECT_EQ(Error(Sweep("  <simulation probe=\"no\"/>\n")),
            "3: 'probe' must be 'on' or 'off', got 'no'");
}

// Warm starts along chains: on by default, "off" starts every point from the
// average model; any other value is refused at its line.
TEST_F(SweepParserTest, WarmStartIsOnUnlessSwitchedOff) {
  EXPECT_TRUE(Parse(Sweep("")).simulation.warm_start);  // on unless turned off
  EXPECT_TRUE(Parse(Sweep("  <simulation warm-start=\"on\"/>\n")).simulation.warm_start);
  EXPECT_FALSE(Parse(Sweep("  <simulation warm-start=\"off\"/>\n")).simulation.warm_start);
  EXPECT_EQ(Error(Sweep("  <simulation warm-start=\"yes\"/>\n")),
            "3: 'warm-start' must be 'on' or 'off', got 'yes'");
}

// Numbers that read differently in SPICE than they look (core/spice_number.h;
// ngspice source inpeval.c, INPevaluate).
TEST_F(SweepParserTest, NumbersThatReadDifferentlyThanTheyLook) {
  EXPECT_EQ(Error(Sweep("  <axis param=\"fsw\" values=\"100k 0.5MHz\"/>\n")),
            "3: in attribute 'values': '0.5MHz' is 0.5 milli (0.0005) in SPICE, which reads 'M' "
            "as milli; write '0.5meg' for mega or '0.5m' for milli");
  EXPECT_EQ(error_.Format(),
            "sweeps/demo.xml:3: in attribute 'values': '0.5MHz' is 0.5 milli (0.0005) in SPICE, "
            "which reads 'M' as milli; write '0.5meg' for mega or '0.5m' for milli\n"
            "  <axis param=\"fsw\" values=\"100k 0.5MHz\"/>\n"
            "                    ^");
  EXPECT_EQ(Error(Sweep("  <set param=\"Iout\" value=\"2A\"/>\n")),
            "3: in attribute 'value': '2A' is 2 atto (2e-18) in SPICE, which reads 'A' as atto; "
            "write '2' for 2 amperes, or '2e-18' for atto");
  EXPECT_EQ(Error(Sweep("  <set param=\"Vin\" value=\"1xyz\"/>\n")),
            "3: in attribute 'value': SPICE ignores the letters 'xyz' in '1xyz' and reads 1; "
            "write '1' (after a number and its scale factor zvsmap takes only the unit symbols "
            "V, A, H, F, Hz, s, Ohm, W, J)");
  EXPECT_EQ(Error(Sweep("  <axis param=\"R\" from=\"1M\" to=\"2meg\" count=\"3\"/>\n")),
            "3: in attribute 'from': '1M' is 1 milli (0.001) in SPICE, which reads 'M' as milli; "
            "write '1meg' for mega or '1m' for milli");
  EXPECT_EQ(Error(Sweep("  <zvs residual=\"2A\"/>\n")).substr(0, 40),
            "3: in attribute 'residual': '2A' is 2 at");
  EXPECT_EQ(
      Error(Sweep("  <require edge=\"high_on\" metric=\"t_zvs_s\" max=\"1M\"/>\n")).substr(0, 38),
      "3: in attribute 'max': '1M' is 1 milli");
  EXPECT_EQ(Error(Sweep("  <predict name=\"t\" expr=\"1\" tolerance=\"1Mxyz\"/>\n")).substr(0, 45),
            "3: in attribute 'tolerance': '1Mxyz' is 1 mil");
}

TEST_F(SweepParserTest, UnitLettersSpiceIgnoresAreWarnings) {
  SweepSpec spec =
      Parse(Sweep("  <set param=\"L\" value=\"10uH\"/>\n"
                  "  <axis param=\"Vin\" values=\"36 48V\"/>\n"
                  "  <zvs residual=\"5V\"/>\n"));
  EXPECT_DOUBLE_EQ(spec.fixed[0].value, 10e-6);
  EXPECT_DOUBLE_EQ(spec.groups[0].axes[0].values[1], 48);
  ASSERT_EQ(spec.warnings.size(), 3u);
  EXPECT_EQ(spec.warnings[0].Format(),
            "sweeps/demo.xml:3: in attribute 'value': '10uH' is read as 10u (1e-05): SPICE "
            "ignores the unit letters 'H', and zvsmap does not check them against the "
            "parameter\n"
            "  <set param=\"L\" value=\"10uH\"/>\n"
            "                 ^");
  EXPECT_EQ(spec.warnings[1].where.line, 4);
  EXPECT_EQ(spec.warnings[2].message,
            "in attribute 'residual': '5V' is read as 5: SPICE ignores the unit letters 'V', and "
            "zvsmap does not check them against the parameter");
  EXPECT_TRUE(Parse(Sweep("  <set param=\"L\" value=\"10u\"/>\n")).warnings.empty());
}

TEST_F(SweepParserTest, TextAndContentAreRefused) {
  EXPECT_EQ(Error(Sweep("  hello\n")), "3: unexpected text in <sweep>");
  EXPECT_EQ(Error(Sweep("  <set param=\"Vin\" value=\"48\">48</set>\n")),
            "3: <set> takes no content");
}

// ---- files on disk ----

class SweepFileTest : public ::testing::Test {
 protected:
  void SetUp() override {
    // One folder per test process: CTest runs these tests in parallel.
    dir_ = std::filesystem::path(::testing::TempDir()) /
           ("zvsmap_sweep_file_test_" + std::to_string(getpid()));
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_ / "sweeps");
    std::filesystem::create_directories(dir_ / "netlists");
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }
  static void Write(const std::filesystem::path& p, const std::string& text) {
    std::ofstream(p) << text;
  }
  std::filesystem::path dir_;
};

TEST_F(SweepFileTest, TemplateExists) {
  Write(dir_ / "netlists" / "buck.cir", "* invented test template\n.end\n");
  std::string sweep = (dir_ / "sweeps" / "demo.xml").string();
  Write(sweep, "<sweep>\n  <template file=\"../netlists/buck.cir\"/>\n</sweep>\n");
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(ParseSweepFile(sweep, &spec, &error)) << error.Format();
  EXPECT_EQ(spec.template_path, (dir_ / "netlists" / "buck.cir").lexically_normal().string());
  EXPECT_TRUE(std::filesystem::exists(spec.template_path));
}

TEST_F(SweepFileTest, TemplateMissing) {
  std::string sweep = (dir_ / "sweeps" / "demo.xml").string();
  Write(sweep,
        "<sweep>\n  <set param=\"Vin\" value=\"48\"/>\n"
        "  <template file=\"../netlists/nope.cir\"/>\n</sweep>\n");
  SweepSpec spec;
  Diagnostic error;
  ASSERT_FALSE(ParseSweepFile(sweep, &spec, &error));
  EXPECT_EQ(error.where.file, sweep);
  EXPECT_EQ(error.where.line, 3);
  EXPECT_EQ(error.message, "template file '../netlists/nope.cir' does not exist (looked for '" +
                               (dir_ / "netlists" / "nope.cir").lexically_normal().string() + "')");
}

TEST_F(SweepFileTest, SweepFileMissing) {
  std::string sweep = (dir_ / "sweeps" / "absent.xml").string();
  SweepSpec spec;
  Diagnostic error;
  ASSERT_FALSE(ParseSweepFile(sweep, &spec, &error));
  EXPECT_EQ(error.Format(), sweep + ": cannot read the sweep file");
}

// ---- parameters the template declares ----

TEST_F(SweepParserTest, CheckParamsKnown) {
  SweepSpec spec =
      Parse(Sweep("  <set param=\"VIN\" value=\"48\"/>\n"
                  "  <axis param=\"Lout\" values=\"1u 2u\"/>\n"
                  "  <derive param=\"Dead\" expr=\"1n\"/>\n"));
  // Template names are lower-case (SPICE is case-insensitive, ngspice manual, from memory).
  std::vector<Diagnostic> problems = CheckParamsKnown(spec, {"vin", "l_out", "fsw"});
  ASSERT_EQ(problems.size(), 2u);
  EXPECT_EQ(problems[0].Format(),
            "sweeps/demo.xml:4: unknown parameter 'Lout' (the template declares no such "
            ".param; did you mean 'l_out'?; `zvsmap params sweeps/demo.xml` lists them all)");
  // No name within the did-you-mean distance: the three nearest by edit
  // distance (Levenshtein 1966: Dead-vin 4, Dead-fsw 4, Dead-l_out 5).
  EXPECT_EQ(problems[1].Format(),
            "sweeps/demo.xml:5: unknown parameter 'Dead' (the template declares no such .param; "
            "closest: 'vin', 'fsw', 'l_out'; `zvsmap params sweeps/demo.xml` lists them all)");
  EXPECT_TRUE(CheckParamsKnown(spec, {"VIN", "LOUT", "dead"}).empty());
}

}  // namespace
}  // namespace zvsmap
