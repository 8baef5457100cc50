// What the point content hash covers (README "What the content hash covers"):
// the canonical deck, not comments, titles or paths; the annotations; the
// <predict> elements. Common practice for cache keys, no outside source.
#include "store/content_hash.h"

#include <gtest/gtest.h>

#include "netlist/deck.h"

namespace zvsmap {
namespace {

const char* kTemplate = R"(title
.param fsw=500k
*@ period 1/fsw
*@ cell leg node=sw rail_high=in rail_low=0 current=vs high_cmd=ch low_cmd=cl
r1 sw 0 1
)";

Template Parse(const std::string& text) {
  Template t;
  Diagnostic error;
  EXPECT_TRUE(ParseTemplateText(text, "t.cir", &t, &error)) << error.Format();
  return t;
}

TEST(PointContentHashTest, CanonicalDeckDropsTitleCommentsAndBlanks) {
  Deck a, b;
  a.lines = {{"title one", {"t.cir", 1, 0}}, {"r1 a 0 1", {"t.cir", 2, 0}}};
  b.lines = {{"another title", {"/abs/t.cir", 1, 0}},
             {"* a comment", {"/abs/t.cir", 2, 0}},
             {"", {"/abs/t.cir", 3, 0}},
             {"r1 a 0 1   ", {"/abs/inc.cir", 9, 0}}};
  EXPECT_EQ(a.Canonical(), "r1 a 0 1\n");
  EXPECT_EQ(a.Canonical(), b.Canonical());
}

TEST(PointContentHashTest, AnnotationsCountButNotTheirSpacing) {
  SweepSpec spec;
  Template t = Parse(kTemplate);
  std::string base = PointContentHash("r1 a 0 1\n", spec, t);
  std::string text = kTemplate;
  EXPECT_EQ(base, PointContentHash("r1 a 0 1\n", spec,
                                   Parse(text.replace(text.find("period 1"), 8, "period   1"))));
  text = kTemplate;
  EXPECT_NE(base, PointContentHash("r1 a 0 1\n", spec,
                                   Parse(text.replace(text.find("1/fsw"), 5, "1/(fsw)"))));
}

TEST(PointContentHashTest, PredictionsCount) {
  SweepSpec spec;
  Template t = Parse(kTemplate);
  std::string base = PointContentHash("r1 a 0 1\n", spec, t);
  PredictionSpec p;
  p.name = "t_x_s";
  p.expression = "1/fsw";
  spec.predictions.push_back(p);
  std::string with = PointContentHash("r1 a 0 1\n", spec, t);
  EXPECT_NE(base, with);
  spec.predictions[0].expression = "2/fsw";
  EXPECT_NE(with, PointContentHash("r1 a 0 1\n", spec, t));
}

TEST(PointContentHashTest, ProbeSettingCounts) {
  SweepSpec spec;
  Template t = Parse(kTemplate);
  std::string on = PointContentHash("r1 a 0 1\n", spec, t);
  spec.simulation.probe = false;
  EXPECT_NE(on, PointContentHash("r1 a 0 1\n", spec, t));
}

// Warm-started results differ from cold ones within the settling tolerance,
// so the switch is part of a point's content.
TEST(PointContentHashTest, WarmStartSettingCounts) {
  SweepSpec spec;
  Template t = Parse(kTemplate);
  std::string on = PointContentHash("r1 a 0 1\n", spec, t);  // the default
  spec.simulation.warm_start = false;
  EXPECT_NE(on, PointContentHash("r1 a 0 1\n", spec, t));
}

}  // namespace
}  // namespace zvsmap
