#include "run/chain_memory.h"

#include <gtest/gtest.h>

#include <string>

namespace zvsmap {
namespace {

// A settled result of point `index` with unknowns `z` and, when given, a
// flattened (row-major) Jacobian.
PointResult Settled(size_t index, std::vector<double> z, std::vector<double> jacobian = {}) {
  PointResult r;
  r.index = index;
  r.status = PointStatus::kOk;
  for (size_t i = 0; i < z.size(); ++i) {
    r.settle.initial_state.push_back({"p" + std::to_string(i), z[i]});
  }
  r.settle.jacobian = std::move(jacobian);
  return r;
}

// Three points on one line of the innermost axis, 0 -> 1 -> 2; the third is
// extrapolated from the first two, `ratio` grid steps beyond the second.
std::vector<ChainLink> Line(double ratio = 1) {
  ChainLink second, third;
  second.previous = 0;
  third.previous = 1;
  third.before_previous = 0;
  third.step_ratio = ratio;
  return {ChainLink(), second, third};
}

// The second point starts from its predecessor's settled unknowns and
// Jacobian (unflattened row by row); the third from the straight line
// through the first two, the secant predictor of continuation methods
// (Allgower & Georg, "Numerical Continuation Methods", 1990): plain
// arithmetic on invented numbers.
TEST(ChainMemoryTest, UnknownsAreHandedOnAndExtrapolatedAlongTheLine) {
  ChainMemory memory(Line());
  memory.Remember(Settled(0, {11.0, 4.0}, {1, 2, 3, 4}));
  std::optional<WarmStart> second = memory.For(1);
  ASSERT_TRUE(second.has_value());
  EXPECT_EQ(second->unknowns, (std::vector<double>{11.0, 4.0}));
  EXPECT_EQ(second->jacobian, (std::vector<std::vector<double>>{{1, 2}, {3, 4}}));
  memory.Remember(Settled(1, {13.5, 4.25}, {5, 6, 7, 8}));
  std::optional<WarmStart> third = memory.For(2);
  ASSERT_TRUE(third.has_value());
  EXPECT_DOUBLE_EQ(third->unknowns[0], 16.0);  // 13.5 + (13.5 - 11)
  EXPECT_DOUBLE_EQ(third->unknowns[1], 4.5);   // 4.25 + (4.25 - 4)
  EXPECT_EQ(third->jacobian, (std::vector<std::vector<double>>{{5, 6}, {7, 8}}));
}

// A point two grid steps beyond its predecessor (a line with a gap, as a
// refined round leaves) is extrapolated twice as far.
TEST(ChainMemoryTest, TheStepRatioScalesTheExtrapolation) {
  ChainMemory memory(Line(2));
  memory.Remember(Settled(0, {1.0}));
  memory.Remember(Settled(1, {1.5}));
  EXPECT_DOUBLE_EQ(memory.For(2)->unknowns[0], 2.5);
}

// A Jacobian whose size does not fit the unknowns is not handed on; a failed
// predecessor gives no warm start at all, and a chain's first point has none.
TEST(ChainMemoryTest, OnlyUsableSettledResultsAreHandedOn) {
  ChainMemory memory(Line());
  memory.Remember(Settled(0, {11.0, 4.0}, {1, 2, 3}));
  ASSERT_TRUE(memory.For(1).has_value());
  EXPECT_TRUE(memory.For(1)->jacobian.empty());
  EXPECT_FALSE(memory.For(0).has_value());
  PointResult failed = Settled(0, {11.0, 4.0});
  failed.status = PointStatus::kFailed;
  memory.Remember(failed);
  EXPECT_FALSE(memory.For(1).has_value());
}

}  // namespace
}  // namespace zvsmap
