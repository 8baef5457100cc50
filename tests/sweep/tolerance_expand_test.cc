#include "sweep/tolerance_expand.h"

#include <gtest/gtest.h>

#include <cmath>
#include <set>

#include "sweep/sharding.h"

namespace zvsmap {
namespace {

ToleranceSpec TwoParams(int samples) {
  ToleranceSpec t;
  t.used = true;
  t.seed = 42;
  t.samples = samples;
  VarySpec l;
  l.param = "L";
  l.relative = true;
  l.within = 0.2;
  l.spread = VarySpec::Spread::kNormal;
  l.sigma = 0.1;
  VarySpec c;
  c.param = "Cext";
  c.relative = false;
  c.within = 50e-12;
  c.spread = VarySpec::Spread::kUniform;
  t.vary = {l, c};
  return t;
}

std::vector<Point> Nominals(size_t n) {
  std::vector<Point> points;
  for (size_t i = 0; i < n; ++i) {
    Point p;
    p.index = i;
    p.values = {{"Iout", static_cast<double>(i)}, {"L", 1e-6}};
    p.grid = {static_cast<int>(i)};
    points.push_back(p);
  }
  return points;
}

// The generator the samples use is the one the C++ standard fixes bit for bit:
// [rand.predef] says the 10000th output of a default-constructed mt19937_64 is
// 9981545732273789042 (ISO/IEC 14882:2017, 29.6.5). A library that met it
// gives the same samples.
TEST(ToleranceExpandTest, GeneratorIsTheStandardOne) {
  std::mt19937_64 gen;
  gen.discard(9999);
  EXPECT_EQ(gen(), 9981545732273789042ull);
}

// Box-Muller (Box & Muller, Ann. Math. Stat. 29, 1958) gives a standard
// normal: over 40000 draws the mean is 0 within 4 standard errors (4/200) and
// the variance 1 within 4 standard errors (4·sqrt(2/40000)); the uniform
// draws lie in (0, 1) with mean 1/2 within 4·sqrt(1/12/40000).
TEST(ToleranceExpandTest, DrawsHaveTheirDistributionsMoments) {
  std::mt19937_64 gen(SampleStreamSeed(1, 2, 3));
  const int n = 40000;
  double sum = 0, sum2 = 0, usum = 0;
  for (int i = 0; i < n; ++i) {
    double z = StandardNormal(gen);
    sum += z;
    sum2 += z * z;
    double u = UnitUniform(gen);
    ASSERT_GT(u, 0);
    ASSERT_LT(u, 1);
    usum += u;
  }
  double mean = sum / n;
  EXPECT_NEAR(mean, 0, 4.0 / std::sqrt(n));
  EXPECT_NEAR(sum2 / n - mean * mean, 1, 4 * std::sqrt(2.0 / n));
  EXPECT_NEAR(usum / n, 0.5, 4 * std::sqrt(1.0 / 12 / n));
}

TEST(ToleranceExpandTest, SamplesDependOnSeedPointAndNumberOnly) {
  ToleranceSpec t = TwoParams(8);
  // Drawn in another order (as another -j or shard would): the same numbers.
  std::vector<double> late = SampleOffsets(t, 3, 5);
  std::vector<double> first = SampleOffsets(t, 0, 0);
  EXPECT_EQ(SampleOffsets(t, 0, 0), first);
  EXPECT_EQ(SampleOffsets(t, 3, 5), late);
  EXPECT_NE(SampleOffsets(t, 3, 6), late);
  EXPECT_NE(SampleOffsets(t, 2, 5), late);
  ToleranceSpec other = t;
  other.seed = 43;
  EXPECT_NE(SampleOffsets(other, 3, 5), late);
  // A uniform offset stays inside its band.
  for (unsigned s = 0; s < 200; ++s) EXPECT_LE(std::fabs(SampleOffsets(t, 1, s)[1]), 50e-12);
}

TEST(ToleranceExpandTest, VariantsFollowTheirNominalPoints) {
  ToleranceSpec t = TwoParams(3);
  std::vector<Point> points = Nominals(2);
  std::vector<std::vector<double>> nominal = {{1e-6, 10e-12}, {1e-6, 10e-12}};
  Diagnostic error;
  ASSERT_TRUE(ExpandTolerances(t, nominal, 10000, &points, &error)) << error.message;
  // 2 nominal points + 2 · (4 corners + 3 samples).
  ASSERT_EQ(points.size(), 16u);
  for (size_t k = 0; k < points.size(); ++k) EXPECT_EQ(points[k].index, k);
  const Point& corner = points[2 + 3];  // nominal 0, corner mask 3: L high, Cext high
  ASSERT_TRUE(corner.variant);
  EXPECT_EQ(corner.variant->nominal, 0u);
  EXPECT_EQ(corner.variant->kind, VariantTag::Kind::kCorner);
  EXPECT_EQ(corner.variant->number, 3u);
  EXPECT_DOUBLE_EQ(*corner.Get("L"), 1.2e-6);
  EXPECT_DOUBLE_EQ(*corner.Get("Cext"), 60e-12);  // appended: the nominal did not set it
  EXPECT_DOUBLE_EQ(*corner.Get("Iout"), 0);
  EXPECT_EQ(DescribeCorner(t, 3), "L+ Cext+");
  EXPECT_EQ(DescribeCorner(t, 0), "L- Cext-");
  const Point& sample = points[2 + 7 + 4 + 2];  // nominal 1, sample 2
  ASSERT_TRUE(sample.variant);
  EXPECT_EQ(sample.variant->nominal, 1u);
  EXPECT_EQ(sample.variant->kind, VariantTag::Kind::kSample);
  EXPECT_EQ(sample.variant->number, 2u);
  std::vector<double> off = SampleOffsets(t, 1, 2);
  EXPECT_DOUBLE_EQ(*sample.Get("L"), 1e-6 * (1 + off[0]));
  EXPECT_DOUBLE_EQ(*sample.Get("Cext"), 10e-12 + off[1]);
  EXPECT_EQ(sample.grid, points[1].grid);
  // The limit counts the variants.
  std::vector<Point> again = Nominals(2);
  EXPECT_FALSE(ExpandTolerances(t, nominal, 15, &again, &error));
}

// Every shard takes whole nominal points with all their variants; the shards
// together take each point once.
TEST(ToleranceExpandTest, ShardsKeepAPointWithItsVariants) {
  ToleranceSpec t = TwoParams(5);
  std::vector<Point> points = Nominals(7);
  std::vector<std::vector<double>> nominal(7, std::vector<double>{1e-6, 0});
  Diagnostic error;
  ASSERT_TRUE(ExpandTolerances(t, nominal, 10000, &points, &error));
  std::multiset<size_t> seen;
  for (size_t s = 0; s < 3; ++s) {
    ShardSpec shard{s, 3, "test"};
    std::set<size_t> mine;
    for (size_t k : ShardPointsOf(points, 0, shard)) {
      seen.insert(k);
      mine.insert(k);
    }
    // A variant is in the shard of its nominal point (which, with the warm
    // starts' chains, sweep/chain_layout.h, keeps whole chains together).
    for (size_t k : mine) {
      const Point& p = points[k];
      if (p.variant) {
        EXPECT_EQ(mine.count(p.variant->nominal), 1u) << k;
      }
    }
  }
  EXPECT_EQ(seen.size(), points.size());
  EXPECT_EQ(std::set<size_t>(seen.begin(), seen.end()).size(), points.size());
}

// The reduced corner set for k > 6 (a 2^(k-p) fractional factorial from
// generators; Box, Hunter & Hunter, "Statistics for Experimenters", 2nd ed.
// 2005, ch. 6, cited from memory): each column balanced (as many runs high as
// low), any two columns orthogonal (the ±1 products sum to 0), the all-low
// and all-high corners present.
TEST(ToleranceExpandTest, ReducedCornersAreABalancedOrthogonalDesign) {
  EXPECT_EQ(CornerMasks(6, ToleranceSpec::Corners::kAuto).size(), 64u);
  EXPECT_EQ(CornerMasks(3, ToleranceSpec::Corners::kAuto).size(), 8u);
  EXPECT_EQ(CornerMasks(8, ToleranceSpec::Corners::kAll).size(), 256u);
  EXPECT_TRUE(CornerMasks(3, ToleranceSpec::Corners::kNone).empty());
  const int k = 10;
  std::vector<uint32_t> masks = CornerMasks(k, ToleranceSpec::Corners::kAuto);
  // The all-low corner is a run of the design (three lows multiply to low);
  // the all-high one too: no corner added, 64 runs.
  ASSERT_EQ(masks.size(), 64u);
  EXPECT_EQ(masks.front(), 0u);
  EXPECT_EQ(masks.back(), (1u << k) - 1);
  auto sign = [](uint32_t m, int j) { return (m >> j) & 1u ? 1 : -1; };
  for (int a = 0; a < k; ++a) {
    int sum = 0;
    for (uint32_t m : masks) sum += sign(m, a);
    EXPECT_EQ(sum, 0) << "column " << a;
    for (int b = a + 1; b < k; ++b) {
      int dot = 0;
      for (uint32_t m : masks) dot += sign(m, a) * sign(m, b);
      EXPECT_EQ(dot, 0) << "columns " << a << ", " << b;
    }
  }
}

}  // namespace
}  // namespace zvsmap
