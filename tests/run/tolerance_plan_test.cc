// Tolerance variants as the run plans them: expanded by PrepareSweep around
// each point's resolved nominal value, and hashed so that a changed block
// reruns the variants but not the nominal points. The expectations follow
// from the block's specification (README "Tolerances and yield").
#include <gtest/gtest.h>

#include "check_fixture.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "run/point_evaluator.h"
#include "run/run_plan.h"
#include "run/sweep_setup.h"

namespace zvsmap {
namespace {

class TolerancePlanTest : public CheckFixture {
 protected:
  static std::string Buck() {
    return std::string(ZVSMAP_SOURCE_DIR) + "/netlists/buck_halfbridge.cir";
  }
  PreparedSweep Prepare(const std::string& block) {
    std::ofstream(SweepPath()) << "<sweep>\n  <template file=\"" << Buck() << "\"/>\n"
                               << "  <axis param=\"Iout\" values=\"2 4\"/>\n"
                               << "  <set param=\"td_lh\" value=\"30n\"/>\n"
                               << block << "</sweep>\n";
    PreparedSweep sweep;
    std::vector<Diagnostic> errors;
    EXPECT_TRUE(PrepareSweep(SweepPath(), 0, &sweep, &errors))
        << (errors.empty() ? "" : errors.front().Format());
    return sweep;
  }
  static std::string Block(const std::string& seed, const std::string& confidence) {
    return "  <tolerances seed=\"" + seed + "\" samples=\"3\" confidence=\"" + confidence +
           "\">\n    <vary param=\"L\" within=\"10%\"/>\n"
           "    <vary param=\"td_lh\" within=\"5n\" spread=\"normal\" sigma=\"2n\"/>\n"
           "  </tolerances>\n";
  }
};

TEST_F(TolerancePlanTest, VariantsMoveTheResolvedNominalValue) {
  PreparedSweep sweep = Prepare(Block("9", "95%"));
  // 2 nominal points, each with 4 corners and 3 samples.
  ASSERT_EQ(sweep.points.size(), 2u + 2 * 7);
  const Point& corner = sweep.points[2 + 3];  // nominal 0, L+ td_lh+
  ASSERT_TRUE(corner.variant);
  // L is the template's default 1u; td_lh the <set> value 30n.
  EXPECT_DOUBLE_EQ(*corner.Get("L"), 1.1e-6);
  EXPECT_DOUBLE_EQ(*corner.Get("td_lh"), 35e-9);
  EXPECT_DOUBLE_EQ(*corner.Get("Iout"), 2);
  // The same file prepared again gives the same points, value for value.
  PreparedSweep again = Prepare(Block("9", "95%"));
  ASSERT_EQ(again.points.size(), sweep.points.size());
  for (size_t i = 0; i < sweep.points.size(); ++i) {
    ASSERT_EQ(again.points[i].values.size(), sweep.points[i].values.size());
    for (size_t k = 0; k < sweep.points[i].values.size(); ++k) {
      EXPECT_EQ(again.points[i].values[k].value, sweep.points[i].values[k].value);
    }
  }
}

TEST_F(TolerancePlanTest, AChangedBlockRehashesTheVariantsOnly) {
  PreparedSweep a = Prepare(Block("9", "95%"));
  PreparedSweep b = Prepare(Block("10", "95%"));
  PreparedSweep c = Prepare(Block("9", "99%"));
  std::vector<std::string> ha = PointContentHashes(a, PointEvaluator(a));
  std::vector<std::string> hb = PointContentHashes(b, PointEvaluator(b));
  std::vector<std::string> hc = PointContentHashes(c, PointEvaluator(c));
  ASSERT_EQ(ha.size(), 16u);
  for (size_t i = 0; i < ha.size(); ++i) {
    bool variant = a.points[i].variant.has_value();
    // Another seed: the samples (and, through the block, every variant) rerun.
    if (variant) {
      EXPECT_NE(ha[i], hb[i]) << "point " << i;
    } else {
      EXPECT_EQ(ha[i], hb[i]) << "point " << i;
    }
    // The confidence level changes the report, not a point's result.
    EXPECT_EQ(ha[i], hc[i]) << "point " << i;
  }
  // A sweep without the block keeps the nominal points' hashes.
  PreparedSweep plain = Prepare("");
  std::vector<std::string> hp = PointContentHashes(plain, PointEvaluator(plain));
  ASSERT_EQ(hp.size(), 2u);
  EXPECT_EQ(hp[0], ha[0]);
  EXPECT_EQ(hp[1], ha[1]);
}

// A tolerance on a device's subcircuit parameter: the generic zsw_linear
// (netlists/switches.lib) on both switches with its output capacitance
// coss_f set to 2n, varied by 10 % at the two corners.
std::string DeviceBlock(const std::string& params, const std::string& vary) {
  return "  <device name=\"lin\" model=\"zsw_linear\"" + params +
         "/>\n  <axis device=\"leg.high leg.low\" values=\"lin\"/>\n"
         "  <tolerances corners=\"all\">\n    " +
         vary + "\n  </tolerances>\n";
}

// The `instance` line of `deck` (its first token, case-insensitive).
std::string InstanceLine(const Deck& deck, const std::string& instance) {
  for (const DeckLine& l : deck.lines) {
    if (Lower(l.text.substr(0, instance.size() + 1)) == instance + " ") return l.text;
  }
  return "";
}

TEST_F(TolerancePlanTest, DeviceParameterVariantsRenderTheirValueOnEverySwitch) {
  PreparedSweep sweep = Prepare(DeviceBlock(
      " params=\"coss_f=2n\"", "<vary device=\"lin\" param=\"coss_f\" within=\"10%\"/>"));
  ASSERT_EQ(sweep.points.size(), 2u + 2 * 2);  // 2 nominal points, 2 corners each
  const Point& low = sweep.points[2];          // nominal 0, lin.coss_f-
  const Point& high = sweep.points[3];         // nominal 0, lin.coss_f+
  ASSERT_EQ(high.device_params.size(), 1u);
  EXPECT_EQ(high.device_params[0].device, "lin");
  EXPECT_EQ(high.device_params[0].param, "coss_f");
  EXPECT_DOUBLE_EQ(high.device_params[0].value, 2.2e-9);
  EXPECT_DOUBLE_EQ(low.device_params[0].value, 1.8e-9);
  EXPECT_TRUE(sweep.points[0].device_params.empty());  // the nominal point keeps the device's own
  PointEvaluator evaluator(sweep);
  Deck nominal_deck, high_deck;
  Diagnostic error;
  ASSERT_TRUE(evaluator.RenderPointDeck(sweep.points[0], &nominal_deck, &error)) << error.Format();
  ASSERT_TRUE(evaluator.RenderPointDeck(high, &high_deck, &error)) << error.Format();
  // Both switches use the device, so both instance lines carry the drawn
  // value, once, formatted as a number (FormatNumber), the device's own 2n gone.
  for (const char* instance : {"xhs", "xls"}) {
    std::string line = InstanceLine(high_deck, instance);
    std::string drawn = " coss_f=" + FormatNumber(high.device_params[0].value);
    EXPECT_NE(line.find(drawn), std::string::npos) << line;
    EXPECT_EQ(line.find(drawn), line.rfind(drawn)) << line;  // once
    EXPECT_EQ(line.substr(line.size() - drawn.size()), drawn) << line;
    EXPECT_EQ(line.find("coss_f=2n"), std::string::npos) << line;
    EXPECT_NE(InstanceLine(nominal_deck, instance).find("coss_f=2n"), std::string::npos);
  }
  // Each corner's deck differs, so its content hash does: a rerun never
  // takes a stale result.
  std::vector<std::string> hashes = PointContentHashes(sweep, evaluator);
  EXPECT_NE(hashes[2], hashes[3]);
  EXPECT_NE(hashes[0], hashes[2]);
  // Without params the subcircuit's default (1n in netlists/switches.lib) is nominal.
  PreparedSweep plain =
      Prepare(DeviceBlock("", "<vary device=\"lin\" param=\"coss_f\" within=\"10%\"/>"));
  ASSERT_EQ(plain.points.size(), 6u);
  EXPECT_DOUBLE_EQ(plain.points[3].device_params[0].value, 1.1e-9);
  // Another width rehashes the variants.
  PreparedSweep wider = Prepare(DeviceBlock(
      " params=\"coss_f=2n\"", "<vary device=\"lin\" param=\"coss_f\" within=\"20%\"/>"));
  EXPECT_NE(PointContentHashes(wider, PointEvaluator(wider))[3], hashes[3]);
}

TEST_F(TolerancePlanTest, BadDeviceParameterIsRefusedWithItsLine) {
  auto refused = [&](const std::string& params, const std::string& vary) {
    std::ofstream(SweepPath()) << "<sweep>\n  <template file=\"" << Buck() << "\"/>\n"
                               << "  <axis param=\"Iout\" values=\"2 4\"/>\n"
                               << DeviceBlock(params, vary) << "</sweep>\n";
    PreparedSweep sweep;
    std::vector<Diagnostic> errors;
    EXPECT_FALSE(PrepareSweep(SweepPath(), 0, &sweep, &errors));
    if (errors.empty()) return std::string("no error");
    return std::to_string(errors[0].where.line) + ": " + errors[0].message;
  };
  // Lines: device 4, axis 5, <tolerances> 6, <vary> 7.
  std::string m = refused("", "<vary device=\"lin\" param=\"cos_f\" within=\"10%\"/>");
  EXPECT_EQ(m.rfind("7: device 'lin': subcircuit 'zsw_linear' (", 0), 0u) << m;
  EXPECT_NE(m.find("declares no parameter 'cos_f'"), std::string::npos) << m;
  EXPECT_NE(m.find("did you mean 'coss_f'?"), std::string::npos) << m;
  EXPECT_EQ(refused("", "<vary device=\"lin\" param=\"vds0_v\" within=\"1\"/>"),
            "7: device 'lin': vds0_v is the circuit's initial drain-source voltage, not a model "
            "parameter");
  m = refused(" params=\"coss_f={2n}\"", "<vary device=\"lin\" param=\"coss_f\" within=\"10%\"/>");
  EXPECT_EQ(m,
            "7: device 'lin': the nominal value of 'coss_f' (its params=\"...\") is '{2n}', not a "
            "plain number; set a number with <device params=\"coss_f=...\">");
  EXPECT_EQ(
      refused(" params=\"coss_f=0\"", "<vary device=\"lin\" param=\"coss_f\" within=\"10%\"/>"),
      "7: device 'lin': 'coss_f' is 0, so a relative 'within' moves it nowhere; give an "
      "amount (within=\"50n\") instead of a percentage");
}

TEST_F(TolerancePlanTest, UnknownVariedParameterIsRefusedWithItsLine) {
  std::ofstream(SweepPath()) << "<sweep>\n  <template file=\"" << Buck() << "\"/>\n"
                             << "  <tolerances corners=\"all\">\n"
                             << "    <vary param=\"Cosss\" within=\"10%\"/>\n"
                             << "  </tolerances>\n</sweep>\n";
  PreparedSweep sweep;
  std::vector<Diagnostic> errors;
  ASSERT_FALSE(PrepareSweep(SweepPath(), 0, &sweep, &errors));
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0].where.line, 4);
  EXPECT_NE(errors[0].message.find("unknown parameter 'Cosss'"), std::string::npos);
  EXPECT_NE(errors[0].message.find("did you mean 'coss'?"), std::string::npos) << errors[0].message;
}

}  // namespace
}  // namespace zvsmap
