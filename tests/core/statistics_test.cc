#include "core/statistics.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

// z of a two-sided 95 % interval: 1.959964 (Abramowitz & Stegun, "Handbook of
// Mathematical Functions", 1964, table 26.5, cited from memory); Phi(1) =
// 0.8413447 (same table).
TEST(StatisticsTest, NormalQuantilesMatchTheTables) {
  EXPECT_NEAR(NormalQuantile(0.975), 1.959964, 1e-6);
  EXPECT_NEAR(NormalCdf(1), 0.8413447, 1e-7);
  EXPECT_NEAR(NormalQuantile(NormalCdf(-2.3)), -2.3, 1e-12);
}

// Wilson score interval (E. B. Wilson, JASA 22, 1927), worked from
//   (p + z²/2n ± z·sqrt(p(1-p)/n + z²/4n²)) / (1 + z²/n), z = 1.9599640
// (by hand, the last digits checked with a separate Python evaluation):
// 8 of 10: p = 0.8, z²/n = 0.3841459; centre 0.99207/1.3841459 = 0.716740,
//   half 1.959964·sqrt(0.016 + 0.0096036)/1.3841459 = 0.226578 -> [0.490162, 0.943318];
// 1 of 29: centre 0.088934, half 0.082821 -> [0.006113, 0.171755];
// 0 of 20: [0, z²/(n + z²)] = [0, 0.161125]; 20 of 20: [0.838875, 1].
// Newcombe, "Two-sided confidence intervals for the single proportion:
// comparison of seven methods", Stat. Med. 17, 1998, table II lists
// 0.0061-0.1718 for 1/29 and 0-0.1611 for 0/20 (cited from memory).
TEST(StatisticsTest, WilsonIntervalMatchesTheFormulaByHand) {
  ProportionInterval a = WilsonInterval(8, 10, 0.95);
  EXPECT_NEAR(a.low, 0.490162, 1e-6);
  EXPECT_NEAR(a.high, 0.943318, 1e-6);
  ProportionInterval b = WilsonInterval(1, 29, 0.95);
  EXPECT_NEAR(b.low, 0.006113, 1e-6);
  EXPECT_NEAR(b.high, 0.171755, 1e-6);
  ProportionInterval c = WilsonInterval(0, 20, 0.95);
  EXPECT_NEAR(c.low, 0, 1e-12);
  EXPECT_NEAR(c.high, 0.161125, 1e-6);
  ProportionInterval d = WilsonInterval(20, 20, 0.95);
  EXPECT_NEAR(d.low, 0.838875, 1e-6);
  EXPECT_NEAR(d.high, 1, 1e-12);
  // 99 %: z = 2.575829; 8 of 10: z²/n = 0.663490, centre 1.131745/1.663490
  // = 0.680344, half 2.575829·sqrt(0.016 + 0.016587)/1.663490 = 0.279525.
  ProportionInterval e = WilsonInterval(8, 10, 0.99);
  EXPECT_NEAR(e.low, 0.680344 - 0.279525, 2e-6);
  EXPECT_NEAR(e.high, 0.680344 + 0.279525, 2e-6);
  ProportionInterval none = WilsonInterval(0, 0, 0.95);
  EXPECT_EQ(none.low, 0);
  EXPECT_EQ(none.high, 1);
}

}  // namespace
}  // namespace zvsmap
