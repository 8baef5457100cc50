#include "sweep/chain_layout.h"

#include <gtest/gtest.h>

#include <set>

#include "sweep/sharding.h"
#include "sweep/sweep_expand.h"
#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

// Expected chains are written by hand from the layout's definition (points
// that differ only in the innermost axis, in axis order, at most
// kMaxChainPoints each; a variant after its nominal point), not produced by
// running the code.
std::vector<Point> Grid(const std::string& axes) {
  SweepSpec spec;
  Diagnostic error;
  std::string xml = "<sweep>\n  <template file=\"t.cir\"/>\n" + axes + "</sweep>\n";
  EXPECT_TRUE(ParseSweepText(xml, "s.xml", &spec, &error)) << error.Format();
  std::vector<Point> points;
  EXPECT_TRUE(ExpandSweep(spec, &points, &error)) << error.Format();
  return points;
}

const char* kTwoByThree =
    "  <axis param=\"L\" values=\"1u 2u\"/>\n"
    "  <axis param=\"Iout\" values=\"0 4 8\"/>\n";

TEST(ChainLayoutTest, ChainsRunAlongTheInnermostAxis) {
  std::vector<Point> points = Grid(kTwoByThree);  // L slowest: 0-2 at 1u, 3-5 at 2u
  std::vector<ChainLink> links = ChainLinks(points, 0, false);
  ASSERT_EQ(links.size(), 6u);
  const size_t none = ChainLink::kNone;
  std::vector<size_t> previous, before;
  for (const auto& l : links) {
    previous.push_back(l.previous);
    before.push_back(l.before_previous);
  }
  EXPECT_EQ(previous, (std::vector<size_t>{none, 0, 1, none, 3, 4}));
  EXPECT_EQ(before, (std::vector<size_t>{none, none, 0, none, none, 3}));
  EXPECT_DOUBLE_EQ(links[2].step_ratio, 1.0);
  EXPECT_EQ(ChainUnits(points, 0), (std::vector<std::vector<size_t>>{{0, 1, 2}, {3, 4, 5}}));
}

// The layout is a function of the points alone: the same points give the same
// layout, and a device axis as the innermost links without extrapolating.
TEST(ChainLayoutTest, TheLayoutDependsOnlyOnThePoints) {
  std::vector<Point> points = Grid(kTwoByThree);
  EXPECT_EQ(ChainUnits(points, 0), ChainUnits(Grid(kTwoByThree), 0));
  std::vector<ChainLink> links = ChainLinks(points, 0, true);
  EXPECT_EQ(links[2].previous, 1u);
  EXPECT_EQ(links[2].before_previous, ChainLink::kNone);
}

// A line of 20 is cut into ceil(20 / 8) = 3 near-equal chains: 6, 7, 7.
TEST(ChainLayoutTest, LongLinesAreCutIntoNearEqualChains) {
  std::string values;
  for (int i = 0; i < 20; ++i) values += (i ? " " : "") + std::to_string(i);
  std::vector<Point> points = Grid("  <axis param=\"Iout\" values=\"" + values + "\"/>\n");
  std::vector<std::vector<size_t>> units = ChainUnits(points, 0);
  ASSERT_EQ(units.size(), 3u);
  EXPECT_EQ(units[0].size(), 6u);
  EXPECT_EQ(units[1].size(), 7u);
  EXPECT_EQ(units[2].size(), 7u);
  EXPECT_EQ(units[1].front(), 6u);
  std::vector<ChainLink> links = ChainLinks(points, 0, false);
  EXPECT_EQ(links[6].previous, ChainLink::kNone);  // a cut starts cold
  EXPECT_EQ(links[7].previous, 6u);
}

// A tolerance variant starts from its nominal point and travels in its
// nominal point's unit, after the chain's nominal points.
TEST(ChainLayoutTest, VariantsFollowTheirNominalPoint) {
  std::vector<Point> points = Grid(kTwoByThree);
  for (size_t nominal : {1u, 4u}) {
    Point v = points[nominal];
    v.index = points.size();
    v.variant = VariantTag{nominal, VariantTag::Kind::kSample, 0};
    points.push_back(v);
  }
  std::vector<ChainLink> links = ChainLinks(points, 0, false);
  EXPECT_EQ(links[6].previous, 1u);
  EXPECT_EQ(links[6].before_previous, ChainLink::kNone);
  EXPECT_EQ(links[7].previous, 4u);
  EXPECT_EQ(ChainUnits(points, 0), (std::vector<std::vector<size_t>>{{0, 1, 2, 6}, {3, 4, 5, 7}}));
}

// A later refinement round chains only its own points: points before `begin`
// are never predecessors.
TEST(ChainLayoutTest, ARoundChainsOnlyItsOwnPoints) {
  std::vector<Point> points = Grid(kTwoByThree);
  Point added = points[1];
  added.index = 6;
  added.refine_round = 1;
  points.push_back(added);
  std::vector<ChainLink> links = ChainLinks(points, 6, false);
  EXPECT_EQ(links[6].previous, ChainLink::kNone);
  EXPECT_EQ(links[1].previous, ChainLink::kNone);  // outside the round: not laid out
  EXPECT_EQ(ChainUnits(points, 6), (std::vector<std::vector<size_t>>{{6}}));
}

// Shards take whole units: every chain lies in one shard, and the shards
// together take every point once.
TEST(ChainLayoutTest, ShardsKeepChainsWhole) {
  std::vector<Point> points = Grid(
      "  <axis param=\"L\" values=\"1u 2u 3u 4u 5u\"/>\n"
      "  <axis param=\"Iout\" values=\"0 4 8\"/>\n");
  std::vector<std::vector<size_t>> units = ChainUnits(points, 0);
  std::vector<int> shard_of(points.size(), -1);
  for (size_t s = 0; s < 2; ++s) {
    for (size_t k : ShardPointsOf(points, 0, {s, 2, "test"})) {
      EXPECT_EQ(shard_of[k], -1) << k;
      shard_of[k] = static_cast<int>(s);
    }
  }
  for (int s : shard_of) EXPECT_NE(s, -1);
  for (const auto& unit : units) {
    for (size_t k : unit) EXPECT_EQ(shard_of[k], shard_of[unit.front()]) << k;
  }
  // Neighbouring chains go to different shards (round robin over units).
  EXPECT_NE(shard_of[0], shard_of[3]);
}

}  // namespace
}  // namespace zvsmap
