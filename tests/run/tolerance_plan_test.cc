// Tolerance variants as the run plans them: expanded by PrepareSweep around
// each point's resolved nominal value, and hashed so that a changed block
// reruns the variants but not the nominal points. The expectations follow
// from the block's specification (README "Tolerances and yield").
#include <gtest/gtest.h>

#include "check_fixture.h"
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
