#include "sweep/sweep_expand.h"

#include <gtest/gtest.h>

#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

// Expected orders and values are written by hand from the sweep-file format
// (nested loops, first group slowest), not produced by running the code.
class SweepExpandTest : public ::testing::Test {
 protected:
  static constexpr const char* kPath = "sweeps/demo.xml";
  // A sweep with a template on line 2; `body` starts on line 3.
  static SweepSpec Spec(const std::string& body) {
    SweepSpec spec;
    Diagnostic error;
    std::string xml = "<sweep>\n  <template file=\"t.cir\"/>\n" + body + "</sweep>\n";
    EXPECT_TRUE(ParseSweepText(xml, kPath, &spec, &error)) << error.Format();
    return spec;
  }
  static std::vector<Point> Expand(const SweepSpec& spec) {
    std::vector<Point> points;
    Diagnostic error;
    EXPECT_TRUE(ExpandSweep(spec, &points, &error)) << error.Format();
    return points;
  }
  static std::vector<std::string> Describe(const std::vector<Point>& points) {
    std::vector<std::string> out;
    for (const Point& p : points) out.push_back(p.Describe());
    return out;
  }
};

TEST_F(SweepExpandTest, NoAxesIsOnePoint) {
  std::vector<Point> points = Expand(Spec("  <set param=\"Vin\" value=\"48\"/>\n"));
  ASSERT_EQ(points.size(), 1u);
  EXPECT_EQ(points[0].index, 0u);
  EXPECT_EQ(points[0].Describe(), "Vin=48");
}

TEST_F(SweepExpandTest, FirstAxisSlowest) {
  std::vector<Point> points =
      Expand(Spec("  <axis param=\"a\" values=\"1 2\"/>\n"
                  "  <axis param=\"b\" values=\"10 20 30\"/>\n"));
  EXPECT_EQ(Describe(points), (std::vector<std::string>{"a=1 b=10", "a=1 b=20", "a=1 b=30",
                                                        "a=2 b=10", "a=2 b=20", "a=2 b=30"}));
  for (size_t i = 0; i < points.size(); ++i) EXPECT_EQ(points[i].index, i);
}

TEST_F(SweepExpandTest, LockstepAdvancesTogether) {
  std::vector<Point> points =
      Expand(Spec("  <axis param=\"Iout\" values=\"1 2\"/>\n"
                  "  <lockstep>\n"
                  "    <axis param=\"Vout\" values=\"5 12\"/>\n"
                  "    <axis param=\"Cout\" values=\"100u 47u\"/>\n"
                  "  </lockstep>\n"));
  EXPECT_EQ(Describe(points),
            (std::vector<std::string>{"Iout=1 Vout=5 Cout=100u", "Iout=1 Vout=12 Cout=47u",
                                      "Iout=2 Vout=5 Cout=100u", "Iout=2 Vout=12 Cout=47u"}));
}

TEST_F(SweepExpandTest, ValueOrderFixedAxesDerived) {
  // Whatever order the file uses: fixed values, then axes, then derived.
  std::vector<Point> points =
      Expand(Spec("  <derive param=\"D\" expr=\"Vout/Vin\"/>\n"
                  "  <axis param=\"Vout\" values=\"12 24\"/>\n"
                  "  <set param=\"Vin\" value=\"48\"/>\n"));
  ASSERT_EQ(points.size(), 2u);
  ASSERT_EQ(points[0].values.size(), 3u);
  EXPECT_EQ(points[0].values[0].name, "Vin");
  EXPECT_EQ(points[0].values[1].name, "Vout");
  EXPECT_EQ(points[0].values[2].name, "D");
  // Buck duty cycle D = Vo/Vin, Erickson & Maksimovic 2001, ch. 2.
  EXPECT_DOUBLE_EQ(points[0].values[2].value, 0.25);
  EXPECT_DOUBLE_EQ(*points[1].Get("D"), 0.5);
}

TEST_F(SweepExpandTest, DerivedUsesEarlierDerived) {
  // Ripple dI = (Vin - Vo) D / (L fs); netlists/references.md section 8 check case:
  // 48 V -> 12 V, 1 uH, 500 kHz gives dI = 18 A and Iv = Io - dI/2 = -4 A at 5 A
  // (Erickson & Maksimovic 2001, ch. 2).
  std::vector<Point> points =
      Expand(Spec("  <set param=\"Vin\" value=\"48\"/>\n"
                  "  <set param=\"Vout\" value=\"12\"/>\n"
                  "  <set param=\"L\" value=\"1u\"/>\n"
                  "  <set param=\"fsw\" value=\"500k\"/>\n"
                  "  <axis param=\"Iout\" values=\"5\"/>\n"
                  "  <derive param=\"D\" expr=\"Vout/Vin\"/>\n"
                  "  <derive param=\"dI\" expr=\"(Vin - Vout)*D/(L*fsw)\"/>\n"
                  "  <derive param=\"Iv\" expr=\"Iout - dI/2\"/>\n"));
  ASSERT_EQ(points.size(), 1u);
  EXPECT_NEAR(*points[0].Get("dI"), 18.0, 1e-9);
  EXPECT_NEAR(*points[0].Get("Iv"), -4.0, 1e-9);
}

TEST_F(SweepExpandTest, DerivedFailureNamesThePoint) {
  SweepSpec spec = Spec(
      "  <axis param=\"Vin\" values=\"48 0\"/>\n"
      "  <set param=\"Vout\" value=\"12\"/>\n"
      "  <derive param=\"D\" expr=\"Vout/Vin\"/>\n");
  std::vector<Point> points;
  Diagnostic error;
  ASSERT_FALSE(ExpandSweep(spec, &points, &error));
  EXPECT_TRUE(points.empty());
  EXPECT_EQ(error.Format(),
            "sweeps/demo.xml:5: cannot evaluate 'Vout/Vin' for 'D' at point 1 (Vout=12 Vin=0): "
            "expression does not give a finite number (division by zero?)");
}

TEST_F(SweepExpandTest, DerivedUnknownName) {
  SweepSpec spec = Spec(
      "  <set param=\"Vin\" value=\"48\"/>\n"
      "  <derive param=\"D\" expr=\"Vo/Vin\"/>\n");
  std::vector<Point> points;
  Diagnostic error;
  ASSERT_FALSE(ExpandSweep(spec, &points, &error));
  EXPECT_EQ(error.where.line, 4);
  EXPECT_EQ(error.message,
            "cannot evaluate 'Vo/Vin' for 'D' at point 0 (Vin=48): unknown name 'Vo'");
}

TEST_F(SweepExpandTest, GridLargerThanTheLimit) {
  SweepSpec spec = Spec(
      "  <axis param=\"a\" from=\"1\" to=\"100\" step=\"1\"/>\n"
      "  <axis param=\"b\" from=\"1\" to=\"100\" step=\"1\"/>\n"
      "  <limits max-points=\"9999\"/>\n");
  std::vector<Point> points;
  Diagnostic error;
  ASSERT_FALSE(ExpandSweep(spec, &points, &error));
  EXPECT_EQ(error.Format(),
            "sweeps/demo.xml:5: sweep has 10000 points, more than the limit of 9999 "
            "(raise <limits max-points> or use --max-points)");
  spec.max_points = 10000;  // as the command line's override would
  EXPECT_EQ(Expand(spec).size(), 10000u);
}

TEST_F(SweepExpandTest, GridLimitWithoutLimitsElementPointsAtTheRoot) {
  SweepSpec spec = Spec("  <axis param=\"a\" values=\"1 2 3\"/>\n");
  spec.max_points = 2;
  std::vector<Point> points;
  Diagnostic error;
  ASSERT_FALSE(ExpandSweep(spec, &points, &error));
  EXPECT_EQ(error.where.line, 1);
  EXPECT_EQ(error.message,
            "sweep has 3 points, more than the limit of 2 (raise <limits max-points> or use "
            "--max-points)");
}

TEST_F(SweepExpandTest, HugeGridIsRefusedBeforeAllocating) {
  // Six axes of 1000 values each: 1e18 points, checked before any allocation.
  std::string body;
  for (int i = 0; i < 6; ++i) {
    body += "  <axis param=\"p" + std::to_string(i) + "\" from=\"1\" to=\"1000\" step=\"1\"/>\n";
  }
  SweepSpec spec = Spec(body);
  std::vector<Point> points;
  Diagnostic error;
  ASSERT_FALSE(ExpandSweep(spec, &points, &error));
  EXPECT_EQ(error.message,
            "sweep has 1000000000000000000 points, more than the limit of 10000 (raise <limits "
            "max-points> or use --max-points)");
}

}  // namespace
}  // namespace zvsmap
