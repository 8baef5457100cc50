// Unit tests of the worker -> parent result encoding.
#include "result/result_codec.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstring>
#include <limits>

namespace zvsmap {
namespace {

bool SameBits(double a, double b) { return std::memcmp(&a, &b, sizeof a) == 0; }

PointResult Sample() {
  PointResult r;
  r.index = 123456;
  r.status = PointStatus::kOk;
  r.reason = "";
  r.log = std::string("binary\0log\n", 11);
  r.settle = {SettleMethod::kPeriods,
              0,
              62,
              std::numeric_limits<double>::quiet_NaN(),
              {{"il0", -4.25}, {"vc0", 11.9}},
              {-0.5, 1.0 / 3.0, 2e-300, -7.25}};
  r.wall_s = 0.1;
  r.solver_aid = "settle-reltol";
  r.edges.push_back({"leg",
                     "high_on",
                     ZvsClass::kHard,
                     "v_turn_on <= 10% of rail",
                     {{"rail_v", 47.999999999999993}, {"z", -0.0}, {"inf", -HUGE_VAL}}});
  r.edges.push_back({"leg", "low_on", ZvsClass::kFull, "", {}});
  Comparison paired{"t_transition_s", "pred", 2.5e-9, -0.0, NAN, true};
  Comparison unpaired{"", "my_guess", 1.0 / 3.0, NAN, NAN, std::nullopt};
  r.edges[0].comparisons = {paired, unpaired};
  r.edges[0].probe_curve.t_dead_s = {0, 1.25e-8, 2e-7};
  r.edges[0].probe_curve.v_ds_v = {48, -0.7, NAN};
  return r;
}

TEST(ResultCodecTest, EveryFieldRoundTripsBitForBit) {
  PointResult in = Sample();
  PointResult out;
  ASSERT_TRUE(DecodeResult(EncodeResult(in), &out));
  EXPECT_EQ(out.index, in.index);
  EXPECT_EQ(out.status, in.status);
  EXPECT_EQ(out.reason, in.reason);
  EXPECT_EQ(out.log, in.log);
  EXPECT_EQ(out.settle.method, in.settle.method);
  EXPECT_EQ(out.settle.periods, 62);
  EXPECT_TRUE(std::isnan(out.settle.residual));
  EXPECT_TRUE(SameBits(out.wall_s, 0.1));
  EXPECT_EQ(out.solver_aid, "settle-reltol");
  EXPECT_EQ(out.settle.initial_state, in.settle.initial_state);
  ASSERT_EQ(out.settle.jacobian.size(), 4u);
  for (size_t k = 0; k < 4; ++k) EXPECT_TRUE(SameBits(out.settle.jacobian[k], in.settle.jacobian[k]));
  EXPECT_EQ(out.edges[0].criterion, "v_turn_on <= 10% of rail");
  ASSERT_EQ(out.edges.size(), 2u);
  EXPECT_EQ(out.edges[0].zvs, ZvsClass::kHard);
  ASSERT_EQ(out.edges[0].probe_curve.t_dead_s.size(), 3u);
  for (size_t k = 0; k < 3; ++k) {
    EXPECT_TRUE(SameBits(out.edges[0].probe_curve.t_dead_s[k], in.edges[0].probe_curve.t_dead_s[k]));
    EXPECT_TRUE(SameBits(out.edges[0].probe_curve.v_ds_v[k], in.edges[0].probe_curve.v_ds_v[k]));
  }
  EXPECT_TRUE(out.edges[1].probe_curve.empty());
  ASSERT_EQ(out.edges[0].metrics.size(), 3u);
  for (size_t k = 0; k < 3; ++k) {
    EXPECT_EQ(out.edges[0].metrics[k].column, in.edges[0].metrics[k].column);
    EXPECT_TRUE(SameBits(out.edges[0].metrics[k].value, in.edges[0].metrics[k].value));
  }
  ASSERT_EQ(out.edges[0].comparisons.size(), 2u);
  for (size_t k = 0; k < 2; ++k) {
    const Comparison &a = out.edges[0].comparisons[k], &b = in.edges[0].comparisons[k];
    EXPECT_EQ(a.metric, b.metric);
    EXPECT_EQ(a.tag, b.tag);
    EXPECT_TRUE(SameBits(a.predicted, b.predicted));
    EXPECT_TRUE(SameBits(a.difference, b.difference));
    EXPECT_EQ(std::isnan(a.relative_difference), std::isnan(b.relative_difference));
    EXPECT_EQ(a.beyond_tolerance, b.beyond_tolerance);
  }
  EXPECT_EQ(out.edges[1].edge, "low_on");
}

TEST(ResultCodecTest, EveryTruncationIsRejected) {
  std::string bytes = EncodeResult(Sample());
  for (size_t n = 0; n < bytes.size(); ++n) {
    PointResult out;
    EXPECT_FALSE(DecodeResult(bytes.substr(0, n), &out)) << "length " << n;
  }
}

TEST(ResultCodecTest, TrailingBytesAndBadEnumsAreRejected) {
  std::string bytes = EncodeResult(Sample());
  PointResult out;
  EXPECT_FALSE(DecodeResult(bytes + "x", &out));
  std::string bad_status = bytes;
  bad_status[9] = 9;  // after format byte and 8-byte index
  EXPECT_FALSE(DecodeResult(bad_status, &out));
  std::string bad_format = bytes;
  bad_format[0] = 99;
  EXPECT_FALSE(DecodeResult(bad_format, &out));
}

}  // namespace
}  // namespace zvsmap
