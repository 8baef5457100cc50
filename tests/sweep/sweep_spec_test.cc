#include "sweep/sweep_spec.h"

#include <gtest/gtest.h>

#include <limits>

namespace zvsmap {
namespace {

class SweepSpecTest : public ::testing::Test {
 protected:
  static AxisGroup Group(size_t n) {
    AxisGroup g;
    g.axes.push_back({"x", std::vector<double>(n, 1.0), {}});
    return g;
  }
};

TEST_F(SweepSpecTest, GridSizeIsTheProduct) {
  // Size of a Cartesian product (from memory).
  SweepSpec spec;
  EXPECT_EQ(spec.GridSize(), 1u);
  spec.groups = {Group(3), Group(4), Group(5)};
  EXPECT_EQ(spec.GridSize(), 60u);
}

TEST_F(SweepSpecTest, GridSizeSaturates) {
  // common practice, no source: an overflowing product must not wrap to a small number.
  SweepSpec spec;
  for (int i = 0; i < 8; ++i) spec.groups.push_back(Group(1000));  // 1e24 > 2^64
  EXPECT_EQ(spec.GridSize(), std::numeric_limits<size_t>::max());
}

TEST_F(SweepSpecTest, ZvsDescribe) {
  // The "10 % of the rail" convention, netlists/references.md section 6 [common].
  ZvsCriterion fraction;
  EXPECT_EQ(fraction.Describe(), "v_turn_on <= 10% of rail");
  EXPECT_DOUBLE_EQ(fraction.Limit(400), 40);
  ZvsCriterion absolute{ZvsCriterion::Kind::kAbsolute, 2.5};
  EXPECT_EQ(absolute.Describe(), "v_turn_on <= 2.5 V");
  EXPECT_DOUBLE_EQ(absolute.Limit(400), 2.5);
}

}  // namespace
}  // namespace zvsmap
