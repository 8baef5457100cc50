#include "report/requirements.h"

#include <gtest/gtest.h>

#include "report_fixture.h"

namespace zvsmap {
namespace {

using testing_report::AddRequirement;
using testing_report::MakeGrid;

// Requirements are checked against margins the tests set by hand; each
// expectation follows from the requirement's definition. // common practice, no source
class RequirementsTest : public ::testing::Test {
 protected:
  // Iout 0..4 A; the high-side margin is Iout - 2.5 V: full ZVS from 3 A up.
  testing_report::Synthetic s_ =
      MakeGrid({{"Iout", {0, 1, 2, 3, 4}}}, [](const auto& v) { return v[0] - 2.5; });
  std::vector<RequirementVerdict> Run() { return EvaluateRequirements(s_.Input()); }
};

TEST_F(RequirementsTest, ClassHeldWhereExpressionHolds) {
  AddRequirement(&s_, R"(<require edge="leg.high_on" class="full" where="Iout >= 3"/>)", 7);
  auto v = Run();
  ASSERT_EQ(v.size(), 1u);
  EXPECT_TRUE(v[0].held) << v[0].message;
  EXPECT_EQ(v[0].covered, 2);
  EXPECT_EQ(v[0].checked, 2);
  EXPECT_EQ(v[0].title, "sweeps/synthetic.xml:7: leg.high_on full ZVS where Iout >= 3");
}

TEST_F(RequirementsTest, ClassFailedListsPointsAndValues) {
  AddRequirement(&s_, R"(<require edge="leg.high_on" class="full" where="Iout >= 2"/>)", 8);
  auto v = Run();
  ASSERT_EQ(v.size(), 1u);
  EXPECT_FALSE(v[0].held);
  EXPECT_EQ(v[0].failing, 1);
  EXPECT_EQ(v[0].message, "1 of 3 checked points break it");
  ASSERT_EQ(v[0].details.size(), 1u);
  // Iout = 2: v_turn_on = 4.8 - (2 - 2.5) = 5.3 V, above 4.8 V, below 24 V: partial.
  EXPECT_EQ(v[0].details[0],
            "point 2 (Iout=2): leg.high_on class partial (v_turn_on_v=5.3, limit 4.8)");
}

TEST_F(RequirementsTest, PartialClassAcceptsPartial) {
  AddRequirement(&s_, R"(<require edge="high_on" class="partial" where="Iout >= 2"/>)", 9);
  EXPECT_TRUE(Run()[0].held);
}

TEST_F(RequirementsTest, MetricMinOverWholeGrid) {
  AddRequirement(&s_, R"(<require edge="leg.low_on" metric="zvs_margin" min="0.2"/>)", 10);
  AddRequirement(&s_, R"(<require edge="leg.high_on" metric="zvs_margin" min="0.2"/>)", 11);
  auto v = Run();
  ASSERT_EQ(v.size(), 2u);
  EXPECT_TRUE(v[0].held) << v[0].message;  // +4 V everywhere
  EXPECT_FALSE(v[1].held);                 // margins -2.5 .. 1.5 V
  EXPECT_EQ(v[1].failing, 3);              // Iout = 0, 1, 2
}

TEST_F(RequirementsTest, MetricColumnWithMax) {
  AddRequirement(&s_, R"(<require edge="leg.high_on" metric="t_transition_s" max="25n"/>)", 12);
  AddRequirement(&s_, R"(<require edge="leg.high_on" metric="t_transition_s" max="10n"/>)", 13);
  auto v = Run();
  EXPECT_TRUE(v[0].held);  // every point has 20 ns
  EXPECT_FALSE(v[1].held);
  EXPECT_EQ(v[1].failing, 5);
}

TEST_F(RequirementsTest, DeadTimeWindowWithoutColumnsFailsAndSaysWhy) {
  AddRequirement(&s_, R"(<require edge="leg.high_on" dead-time-within-window="true"/>)", 14);
  auto v = Run();
  EXPECT_FALSE(v[0].held);
  EXPECT_NE(v[0].message.find("sweeps/synthetic.xml:14: the results have no dead-time window"),
            std::string::npos)
      << v[0].message;
}

TEST(RequirementsWindowTest, DeadTimeWindowHeldAndFailed) {
  // Window [t_zvs_s, t_ring_back_s] = [30 ns, 30 ns + 10 ns * Iout]; dead time 40 ns
  // lies inside from Iout = 1 up.
  auto s = MakeGrid(
      {{"Iout", {0, 1, 2}}}, [](const auto&) { return 1.0; },
      [](const auto& v) {
        return std::vector<Metric>{{"t_zvs_s", 30e-9}, {"t_ring_back_s", 30e-9 + 10e-9 * v[0]}};
      });
  AddRequirement(
      &s, R"(<require edge="leg.high_on" dead-time-within-window="true" where="Iout &gt; 0.5"/>)",
      3);
  AddRequirement(&s, R"(<require edge="leg.high_on" dead-time-within-window="true"/>)", 4);
  auto v = EvaluateRequirements(s.Input());
  EXPECT_TRUE(v[0].held) << v[0].message;
  EXPECT_FALSE(v[1].held);
  EXPECT_EQ(v[1].failing, 1);
}

TEST_F(RequirementsTest, FailedPointsAreUncheckedNotFailing) {
  s_.results[4].status = PointStatus::kFailed;
  s_.results[4].edges.clear();
  AddRequirement(&s_, R"(<require edge="leg.high_on" class="full" where="Iout >= 3"/>)", 7);
  auto v = Run();
  EXPECT_TRUE(v[0].held);
  EXPECT_EQ(v[0].unchecked, 1);
  EXPECT_EQ(v[0].message, "held at all 1 checked points; 1 covered points did not run");
}

TEST_F(RequirementsTest, NothingCoveredFails) {
  AddRequirement(&s_, R"(<require edge="leg.high_on" class="full" where="Iout > 100"/>)", 5);
  AddRequirement(&s_, R"(<require edge="other.high_on" class="full"/>)", 6);
  auto v = Run();
  EXPECT_FALSE(v[0].held);
  EXPECT_EQ(v[0].message,
            "sweeps/synthetic.xml:5: covers no point that ran (0 covered, 0 did not run)");
  EXPECT_FALSE(v[1].held);
  EXPECT_EQ(v[1].details[0], "point 0 (Iout=0): edge other.high_on not measured");
}

}  // namespace
}  // namespace zvsmap
