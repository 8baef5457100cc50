#include "sim/waveforms.h"

#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {
namespace {

class WaveformsTest : public ::testing::Test {
 protected:
  // y = 3 t + 2 sampled on an uneven grid.
  void SetUp() override {
    waves_.SetTime({0.0, 1.0, 1.5, 4.0, 10.0});
    std::vector<double> y;
    for (double t : waves_.time()) y.push_back(3.0 * t + 2.0);
    waves_.Set("V(Out)", y);
  }
  Waveforms waves_;
};

TEST_F(WaveformsTest, InterpolationIsExactOnAStraightLine) {
  // Linear interpolation reproduces a straight line exactly (definition of
  // linear interpolation; common practice, no source).
  for (double t : {0.0, 0.25, 1.0, 1.2, 3.999, 7.5, 10.0}) {
    EXPECT_DOUBLE_EQ(waves_.At("v(out)", t), 3.0 * t + 2.0) << "t=" << t;
  }
}

TEST_F(WaveformsTest, InterpolationOfAParabolaLiesOnTheChord) {
  // Between samples the interpolant is the chord: for y = t^2 on [1, 3] the
  // chord at t = 2 is (1 + 9) / 2 = 5 (elementary geometry, no source).
  std::vector<double> t = {1.0, 3.0};
  std::vector<double> y = {1.0, 9.0};
  EXPECT_DOUBLE_EQ(Interpolate(t, y, 2.0), 5.0);
  EXPECT_DOUBLE_EQ(Interpolate(t, y, 1.5), 3.0);
}

TEST_F(WaveformsTest, ClampsOutsideTheTimeAxis) {
  // Contract of Interpolate: hold the end values (common practice, no source).
  EXPECT_DOUBLE_EQ(waves_.At("v(out)", -5.0), 2.0);
  EXPECT_DOUBLE_EQ(waves_.At("v(out)", 11.0), 32.0);
}

TEST_F(WaveformsTest, RepeatedTimePointIsRightContinuous) {
  // A step at t = 1 stored as two samples at the same time (ngspice repeats a
  // time point at a breakpoint). Before it: the ramp 0..1; after it: 5..5.
  std::vector<double> t = {0.0, 1.0, 1.0, 2.0};
  std::vector<double> y = {0.0, 1.0, 5.0, 5.0};
  EXPECT_DOUBLE_EQ(Interpolate(t, y, 0.5), 0.5);
  EXPECT_DOUBLE_EQ(Interpolate(t, y, 1.0), 5.0);  // the last repeated sample
  EXPECT_DOUBLE_EQ(Interpolate(t, y, 1.5), 5.0);
  EXPECT_FALSE(std::isnan(Interpolate(t, y, 1.0)));
}

TEST_F(WaveformsTest, SingleSampleIsConstant) {
  EXPECT_DOUBLE_EQ(Interpolate({2.0}, {7.0}, -1.0), 7.0);
  EXPECT_DOUBLE_EQ(Interpolate({2.0}, {7.0}, 2.0), 7.0);
  EXPECT_DOUBLE_EQ(Interpolate({2.0}, {7.0}, 9.0), 7.0);
}

TEST_F(WaveformsTest, NamesAreCaseInsensitiveAndStoredLowerCase) {
  EXPECT_TRUE(waves_.Has("v(out)"));
  EXPECT_TRUE(waves_.Has("V(OUT)"));
  EXPECT_TRUE(waves_.Has("time"));
  EXPECT_FALSE(waves_.Has("v(in)"));
  EXPECT_EQ(waves_.Names(), std::vector<std::string>({"v(out)"}));
  EXPECT_EQ(waves_.Get("TIME").size(), 5u);
  EXPECT_DOUBLE_EQ(waves_.Get("v(OUT)")[4], 32.0);
}

TEST_F(WaveformsTest, MissingVectorThrows) {
  try {
    waves_.Get("v(missing)");
    FAIL() << "expected Error";
  } catch (const Error& e) {
    EXPECT_STREQ(e.what(), "no vector 'v(missing)' in the waveforms");
  }
  EXPECT_THROW(waves_.At("i(l1)", 1.0), Error);
}

TEST_F(WaveformsTest, SetRejectsWrongLength) {
  try {
    waves_.Set("v(x)", {1.0, 2.0});
    FAIL() << "expected Error";
  } catch (const Error& e) {
    EXPECT_STREQ(e.what(), "vector 'v(x)' has 2 samples but the time axis has 5");
  }
}

TEST_F(WaveformsTest, WindowKeepsOneSampleEitherSide) {
  // Samples at 0, 1, 1.5, 4, 10; window [1.2, 5] holds 1.5 and 4, plus 1 and 10.
  Waveforms w = waves_.Window(1.2, 5.0);
  EXPECT_EQ(w.time(), std::vector<double>({1.0, 1.5, 4.0, 10.0}));
  EXPECT_EQ(w.Get("v(out)"), std::vector<double>({5.0, 6.5, 14.0, 32.0}));
  // Interpolation at the window's edges equals the full waveform's.
  EXPECT_DOUBLE_EQ(w.At("v(out)", 1.2), waves_.At("v(out)", 1.2));
  EXPECT_DOUBLE_EQ(w.At("v(out)", 5.0), waves_.At("v(out)", 5.0));
}

TEST_F(WaveformsTest, WindowOnSampleBoundaries) {
  // Window edges exactly on samples 1 and 4: one more either side (0 and 10).
  Waveforms w = waves_.Window(1.0, 4.0);
  EXPECT_EQ(w.time(), std::vector<double>({0.0, 1.0, 1.5, 4.0, 10.0}));
  // At the ends of the axis there is nothing more to keep.
  Waveforms head = waves_.Window(0.0, 0.5);
  EXPECT_EQ(head.time(), std::vector<double>({0.0, 1.0}));
  Waveforms tail = waves_.Window(9.0, 20.0);
  EXPECT_EQ(tail.time(), std::vector<double>({4.0, 10.0}));
}

TEST_F(WaveformsTest, WindowRejectsReversedBounds) { EXPECT_THROW(waves_.Window(2.0, 1.0), Error); }

TEST_F(WaveformsTest, InterpolateRejectsBadInput) {
  EXPECT_THROW(Interpolate({}, {}, 0.0), Error);
  EXPECT_THROW(Interpolate({0.0, 1.0}, {1.0}, 0.0), Error);
}

}  // namespace
}  // namespace zvsmap
