#include "sweep/axis_values.h"

#include <gtest/gtest.h>

#include <cmath>

namespace zvsmap {
namespace {

// Expected values are arithmetic sequences and geometric sequences written out
// by hand or with std::pow (from memory); messages are the format's own text.
class AxisValuesTest : public ::testing::Test {
 protected:
  std::vector<double> values_;
  std::string message_;
};

TEST_F(AxisValuesTest, StepAcrossZero) {
  ASSERT_TRUE(StepValues(-1, 1, 0.5, &values_, &message_)) << message_;
  EXPECT_EQ(values_, (std::vector<double>{-1, -0.5, 0, 0.5, 1}));
}

TEST_F(AxisValuesTest, StepToleranceIsRelative) {
  // 1e-10 short of the end over a span of 1: inside 1e-9 relative, accepted.
  ASSERT_TRUE(StepValues(0, 1, 0.1 - 1e-11, &values_, &message_)) << message_;
  EXPECT_EQ(values_.size(), 11u);
  EXPECT_EQ(values_.back(), 1.0);
  // 1e-8 short of the end: refused.
  EXPECT_FALSE(StepValues(0, 1, 0.1 - 1e-9, &values_, &message_));
  EXPECT_EQ(message_.rfind("range never reaches its end", 0), 0u);
  EXPECT_TRUE(values_.empty());
}

TEST_F(AxisValuesTest, SmallValuesStepExactly) {
  // 10n..100n by 10n: ten values whose ratios to 10n are 1..10.
  ASSERT_TRUE(StepValues(10e-9, 100e-9, 10e-9, &values_, &message_)) << message_;
  ASSERT_EQ(values_.size(), 10u);
  for (int i = 0; i < 10; ++i) EXPECT_NEAR(values_[i] / 10e-9, i + 1, 1e-12);
}

TEST_F(AxisValuesTest, LogSpacingDecades) {
  // 1, 10, 100, 1000: one value per decade.
  ASSERT_TRUE(CountValues(1, 1000, 4, true, &values_, &message_)) << message_;
  ASSERT_EQ(values_.size(), 4u);
  for (int i = 0; i < 4; ++i) EXPECT_NEAR(values_[i], std::pow(10.0, i), 1e-12 * std::pow(10.0, i));
}

TEST_F(AxisValuesTest, LogSpacingDownwards) {
  ASSERT_TRUE(CountValues(1e6, 1e3, 4, true, &values_, &message_)) << message_;
  for (int i = 0; i < 4; ++i) {
    double expected = std::pow(10.0, 6 - i);
    EXPECT_NEAR(values_[i], expected, 1e-12 * expected);
  }
}

TEST_F(AxisValuesTest, CountLimits) {
  EXPECT_FALSE(CountValues(0, 1, 0, false, &values_, &message_));
  EXPECT_EQ(message_, "count must be at least 1");
  EXPECT_FALSE(CountValues(0, 1, 2000000, false, &values_, &message_));
  EXPECT_EQ(message_, "range has 2000000 values, more than 1000000");
}

TEST_F(AxisValuesTest, SplitValueList) {
  EXPECT_EQ(SplitValueList("5 12,24\t,\n3.3k"),
            (std::vector<std::string>{"5", "12", "24", "3.3k"}));
  EXPECT_TRUE(SplitValueList(" ,, ").empty());
}

}  // namespace
}  // namespace zvsmap
