// Unit tests of the results stage's names: status, settle method, edge and
// switch identity, and the CSV columns of a comparison.
#include <gtest/gtest.h>

#include <cmath>

#include "result/comparison.h"
#include "result/edge_identity.h"
#include "result/point_status.h"
#include "result/settle_record.h"

namespace zvsmap {
namespace {

TEST(PointStatusTest, EveryNameReadsBackAsItsStatus) {
  for (PointStatus s :
       {PointStatus::kOk, PointStatus::kFailed, PointStatus::kUnsettled, PointStatus::kNotRun}) {
    PointStatus back = PointStatus::kOk;
    ASSERT_TRUE(PointStatusFromName(PointStatusName(s), &back)) << PointStatusName(s);
    EXPECT_EQ(back, s);
  }
  EXPECT_STREQ(PointStatusName(PointStatus::kNotRun), "not-run");
  PointStatus untouched = PointStatus::kUnsettled;
  EXPECT_FALSE(PointStatusFromName("not run", &untouched));
  EXPECT_EQ(untouched, PointStatus::kUnsettled);
}

TEST(SettleMethodTest, EveryNameReadsBackAsItsMethod) {
  for (SettleMethod m : {SettleMethod::kNotAttempted, SettleMethod::kNone, SettleMethod::kShooting,
                         SettleMethod::kPeriods}) {
    SettleMethod back = SettleMethod::kPeriods;
    ASSERT_TRUE(SettleMethodFromName(SettleMethodName(m), &back));
    EXPECT_EQ(back, m);
  }
  SettleMethod m = SettleMethod::kNone;
  EXPECT_FALSE(SettleMethodFromName("newton", &m));
  EXPECT_EQ(m, SettleMethod::kNone);
}

TEST(EdgeIdentityTest, EdgeKindsAndLabels) {
  EdgeKind k = EdgeKind::kHighOn;
  ASSERT_TRUE(ParseEdgeKind("low_on", &k));
  EXPECT_EQ(k, EdgeKind::kLowOn);
  EXPECT_FALSE(ParseEdgeKind("LOW_ON", &k));
  EXPECT_EQ((EdgeId{"leg", EdgeKind::kHighOn}.Label()), "leg.high_on");
}

TEST(EdgeIdentityTest, SwitchRolesParseWithTheCellAsWritten) {
  SwitchRole r;
  ASSERT_TRUE(ParseSwitchRole("bridge.a.HIGH", &r));
  EXPECT_EQ(r.cell, "bridge.a");
  EXPECT_EQ(r.side, SwitchSide::kHigh);
  EXPECT_EQ(r.Name(), "bridge.a.high");
  for (const char* bad : {"leg", ".low", "leg.middle", "leg."}) {
    EXPECT_FALSE(ParseSwitchRole(bad, &r)) << bad;
  }
}

TEST(ComparisonTest, PairedFlattensToFourColumnsUnpairedToOne) {
  Comparison paired{"i_commutated_a", "pred", -4.0, 0.2, 0.05, true};
  auto cols = FlatColumns(paired);
  ASSERT_EQ(cols.size(), 4u);
  EXPECT_EQ(cols[0].name, "i_commutated_a__pred");
  EXPECT_EQ(cols[1].name, "i_commutated_a__pred__diff");
  EXPECT_EQ(cols[2].name, "i_commutated_a__pred__rel_diff");
  EXPECT_EQ(cols[3].name, "i_commutated_a__pred__beyond_tol");
  EXPECT_EQ(cols[3].value, 1.0);
  paired.beyond_tolerance.reset();
  EXPECT_TRUE(std::isnan(FlatColumns(paired)[3].value));
  Comparison unpaired{"", "my_guess", 2.0, NAN, NAN, std::nullopt};
  cols = FlatColumns(unpaired);
  ASSERT_EQ(cols.size(), 1u);
  EXPECT_EQ(cols[0].name, "my_guess");
  EXPECT_EQ(cols[0].value, 2.0);
}

}  // namespace
}  // namespace zvsmap
