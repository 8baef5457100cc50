#include "report/dead_time_envelope.h"

#include <gtest/gtest.h>

#include <cmath>

#include "report_fixture.h"
#include "resonant_window.h"

namespace zvsmap {
namespace {

using testing_report::BuckEnvelope;
using testing_report::BuckHighOnWindow;
using testing_report::MakeGrid;
using testing_report::ProbeMetrics;
using testing_report::ResonantWindow;
using testing_report::Synthetic;

const EdgeKey kHighOn{"leg", "high_on"};

double Get(const Synthetic& s, size_t point, const char* column) {
  return FindEdge(s.results[point], kHighOn)->Get(column);
}

// The definition (netlists/references.md sec. 10): a value serves a set of
// points iff it lies in every one's window.
void ExpectInsideEveryWindow(const Synthetic& s, const ScheduleBin& bin, const EdgeEnvelope& env,
                             const Grid& grid) {
  for (size_t i = 0; i < s.results.size(); ++i) {
    if (env.BinAt(grid.coords[i]) != &bin) continue;
    double t_min = Get(s, i, "probe_t_min_s"), t_max = Get(s, i, "probe_t_max_s");
    if (std::isnan(t_min)) continue;
    EXPECT_GE(bin.window.recommended, t_min) << "point " << i;
    EXPECT_LE(bin.window.recommended, t_max) << "point " << i;
  }
}

// The reference computation itself against the check case of
// netlists/references.md sec. 8 (48 -> 12 V, 1 µH, 1 nF per switch, 5 A:
// valley -4 A): transition 24.32 ns, longest dead time 127.1 ns.
TEST(DeadTimeEnvelopeTest, ReferenceWindowReproducesTheCheckCase) {
  ResonantWindow w = BuckHighOnWindow(48, 12, 1e-6, 2e-9, 5e5, 5);
  ASSERT_TRUE(w.possible);
  EXPECT_NEAR(w.t_min, 24.32e-9, 0.01e-9);   // sec. 8
  EXPECT_NEAR(w.t_max, 127.1e-9, 0.05e-9);   // sec. 8
  EXPECT_FALSE(BuckHighOnWindow(48, 12, 1e-6, 2e-9, 5e5, 7.6).possible);  // |Iv| < 1.518 A
}

TEST(DeadTimeEnvelopeTest, OneDeadTimeServesTheWholeEnvelope) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6});
  ReportBasis basis = s.Input();
  ASSERT_TRUE(basis.envelope.available);
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  const WindowIntersection& all = env->all;
  ASSERT_TRUE(all.Holds());
  EXPECT_EQ(all.windows, 16);
  // Both sides bind at the heaviest load and highest input voltage (72 V, 6 A,
  // point 15): the smallest valley current gives the latest start and the
  // earliest ring-back. Values from the resonant arc (sec. 2).
  EXPECT_EQ(all.lo_point, 15u);
  EXPECT_EQ(all.hi_point, 15u);
  EXPECT_DOUBLE_EQ(all.lo, Get(s, 15, "probe_t_min_s"));
  EXPECT_DOUBLE_EQ(all.hi, Get(s, 15, "probe_t_max_s"));
  EXPECT_NEAR(all.lo, 38.49e-9, 0.01e-9);
  EXPECT_NEAR(all.hi, 88.73e-9, 0.01e-9);
  EXPECT_EQ(all.choice, DeadTimeChoice::kMidpoint);
  EXPECT_DOUBLE_EQ(all.recommended, (all.lo + all.hi) / 2);
  EXPECT_DOUBLE_EQ(all.margin_early, all.recommended - all.lo);
  EXPECT_DOUBLE_EQ(all.margin_late, all.hi - all.recommended);
  EXPECT_NEAR(all.margin_early, 25.12e-9, 0.01e-9);
  EXPECT_TRUE(env->conflicts.empty());
  ASSERT_EQ(env->schedule.size(), 1u);  // one bin over everything
  EXPECT_DOUBLE_EQ(env->schedule[0].window.recommended, all.recommended);
  ExpectInsideEveryWindow(s, env->schedule[0], *env, basis.grid);
  // The low-side edge carries no probe columns in this fixture.
  const EdgeEnvelope* low = basis.envelope.Find({"leg", "low_on"});
  ASSERT_NE(low, nullptr);
  EXPECT_EQ(low->unprobed, 16);
  EXPECT_EQ(low->all.windows, 0);
  EXPECT_FALSE(low->all.Holds());
}

// At 35 V and 7 A the valley current is just above the ZVS limit, so the
// window starts late (89.4 ns) while at 72 V, 7 A ring-back comes at 80.2 ns:
// no single value; the schedule splits by input voltage.
TEST(DeadTimeEnvelopeTest, EmptyIntersectionNamesThePointsAndSchedulesByInputVoltage) {
  Synthetic s = BuckEnvelope({35, 48, 60, 72}, {0, 2, 4, 6, 7});
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  EXPECT_FALSE(env->all.Holds());
  EXPECT_EQ(env->all.lo_point, 4u);   // 35 V, 7 A
  EXPECT_EQ(env->all.hi_point, 19u);  // 72 V, 7 A
  EXPECT_NEAR(env->all.lo, 89.40e-9, 0.01e-9);
  EXPECT_NEAR(env->all.hi, 80.16e-9, 0.01e-9);
  EXPECT_TRUE(std::isnan(env->all.recommended));
  // 35 V, 7 A against every point whose ring-back comes before 89.4 ns:
  // 48 V 7 A (87.7), 60 V 7 A (83.8), 72 V 6 A (88.7), 72 V 7 A (80.2).
  ASSERT_EQ(env->conflicts_total, 4);
  for (const WindowConflict& c : env->conflicts) {
    EXPECT_EQ(c.early, 4u);
    EXPECT_GT(c.t_min, c.t_max);
  }
  EXPECT_EQ(env->conflicts[0].late, 19u);  // the widest overlap first
  ASSERT_EQ(env->schedule_dims.size(), 2u);
  ASSERT_EQ(env->schedule.size(), 2u);
  const ScheduleBin& low_vin = env->schedule[0];
  const ScheduleBin& rest = env->schedule[1];
  EXPECT_EQ(low_vin.spans[0].first, 0);  // Vin 35 V
  EXPECT_EQ(low_vin.spans[0].last, 0);
  EXPECT_EQ(rest.spans[0].first, 1);  // Vin 48..72 V
  EXPECT_EQ(rest.spans[0].last, 3);
  EXPECT_EQ(low_vin.spans[1].first, 0);  // every load
  EXPECT_EQ(low_vin.spans[1].last, 4);
  EXPECT_EQ(low_vin.points, 5);
  EXPECT_EQ(rest.points, 15);
  ASSERT_TRUE(low_vin.window.Holds());
  ASSERT_TRUE(rest.window.Holds());
  EXPECT_NEAR(low_vin.window.recommended, 92.02e-9, 0.01e-9);  // [89.40, 94.63] ns
  EXPECT_NEAR(low_vin.window.margin_early, 2.62e-9, 0.01e-9);
  EXPECT_NEAR(rest.window.recommended, 68.11e-9, 0.01e-9);  // [56.07, 80.16] ns
  EXPECT_NEAR(rest.window.margin_late, 12.04e-9, 0.01e-9);
  for (const ScheduleBin& bin : env->schedule) ExpectInsideEveryWindow(s, bin, *env, basis.grid);
}

TEST(DeadTimeEnvelopeTest, SinglePointIsItsOwnWindow) {
  Synthetic s = MakeGrid(
      {{"Iout", {5}}}, [](const auto&) { return 1.0; },
      [](const auto& v) { return ProbeMetrics(BuckHighOnWindow(48, 12, 1e-6, 2e-9, 5e5, v[0])); });
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  ASSERT_TRUE(env->all.Holds());
  EXPECT_NEAR(env->all.lo, 24.32e-9, 0.01e-9);  // references sec. 8
  EXPECT_NEAR(env->all.hi, 127.1e-9, 0.05e-9);
  EXPECT_NEAR(env->all.recommended, (24.32e-9 + 127.1e-9) / 2, 0.05e-9);
  EXPECT_TRUE(env->schedule_dims.empty());  // nothing swept
  ASSERT_EQ(env->schedule.size(), 1u);
  EXPECT_TRUE(env->schedule[0].spans.empty());
  EXPECT_EQ(env->schedule[0].points, 1);
}

// Beyond the ZVS limit (|Iv| < 1.518 A at 48 V, sec. 8) the probe gives no
// t_min: listed with its valley, left out of the intersection.
TEST(DeadTimeEnvelopeTest, ImpossiblePointsAreListedAndExcluded) {
  Synthetic s = MakeGrid(
      {{"Iout", {0, 4, 8}}}, [](const auto&) { return 1.0; },
      [](const auto& v) { return ProbeMetrics(BuckHighOnWindow(48, 12, 1e-6, 2e-9, 5e5, v[0])); });
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  ASSERT_EQ(env->impossible.size(), 1u);
  EXPECT_EQ(env->impossible[0].point, 2u);
  // Valley Vin - (Vo + sqrt(Vo^2 + (I0·Z)^2)) with I0 = 1 A, Z = 22.36 ohm (sec. 2).
  EXPECT_NEAR(env->impossible[0].v_valley, 48 - (12 + std::hypot(12, 22.36)), 0.01);
  EXPECT_EQ(env->all.windows, 2);
  ASSERT_TRUE(env->all.Holds());
  EXPECT_EQ(env->all.lo_point, 1u);  // 4 A binds; 8 A is not in the intersection
  ASSERT_EQ(env->schedule.size(), 1u);
  EXPECT_EQ(env->schedule[0].points, 3);
  EXPECT_EQ(env->schedule[0].impossible, 1);
}

TEST(DeadTimeEnvelopeTest, AllImpossibleGivesNoValueAndNoConflicts) {
  Synthetic s = MakeGrid(
      {{"Iout", {8, 9}}}, [](const auto&) { return -1.0; },
      [](const auto& v) { return ProbeMetrics(BuckHighOnWindow(48, 12, 1e-6, 2e-9, 5e5, v[0])); });
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  EXPECT_EQ(env->impossible.size(), 2u);
  EXPECT_EQ(env->all.windows, 0);
  EXPECT_FALSE(env->all.Holds());
  EXPECT_EQ(env->all.choice, DeadTimeChoice::kNone);
  EXPECT_TRUE(env->conflicts.empty());
  ASSERT_EQ(env->schedule.size(), 1u);
  EXPECT_FALSE(env->schedule[0].window.Holds());
  EXPECT_EQ(env->schedule[0].impossible, 2);
}

TEST(DeadTimeEnvelopeTest, FailedPointsAndMissingColumnsStayOut) {
  Synthetic s = BuckEnvelope({48}, {0, 2, 4});
  s.results[1].status = PointStatus::kFailed;
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  EXPECT_EQ(env->measured, 2);
  EXPECT_EQ(env->all.windows, 2);
  Synthetic plain = MakeGrid({{"Iout", {0, 2}}}, [](const auto&) { return 1.0; });
  EXPECT_FALSE(plain.Input().envelope.available);
  EXPECT_TRUE(plain.Input().envelope.edges.empty());
}

// No ring-back before the probe's bound (a low-side turn-on of a buck, sec.
// 2: a long dead time only costs diode conduction): the latest loss-optimal
// dead time, not the middle of [t_min, bound].
TEST(DeadTimeEnvelopeTest, OpenLateEndTakesTheLatestLossOptimalDeadTime) {
  Synthetic s = MakeGrid(
      {{"Iout", {2, 4, 6}}}, [](const auto&) { return 1.0; },
      [](const auto& v) {
        double t_min = 4e-9 + 1e-9 * v[0];  // invented
        return std::vector<Metric>{{"probe_t_min_s", t_min},
                                   {"probe_t_max_s", 200e-9},
                                   {"probe_bound_s", 200e-9},
                                   {"probe_max_at_bound", 1},
                                   {"t_dead_optimal_s", t_min + 2e-9}};
      });
  const EdgeEnvelope* env = s.Input().envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  ASSERT_TRUE(env->all.Holds());
  EXPECT_TRUE(env->all.hi_at_bound);
  EXPECT_EQ(env->all.choice, DeadTimeChoice::kLossOptimal);
  EXPECT_DOUBLE_EQ(env->all.recommended, 12e-9);  // 6 A: 10 ns + 2 ns
  EXPECT_DOUBLE_EQ(env->all.margin_early, 2e-9);
  EXPECT_DOUBLE_EQ(env->all.margin_late, 188e-9);
}

// Schedules on one, two and three axes (invented windows): each bin's value
// lies in each of its points' windows.
std::vector<Metric> Window(double t_min, double t_max) {
  return {{"probe_t_min_s", t_min}, {"probe_t_max_s", t_max}, {"probe_max_at_bound", 0}};
}

TEST(DeadTimeEnvelopeTest, ScheduleOnOneAxis) {
  // Window [10 + 10k, 30 + 10k] ns at the k-th load: slides up by 10 ns per step.
  Synthetic s = MakeGrid(
      {{"Iout", {0, 1, 2, 3, 4, 5}}}, [](const auto&) { return 1.0; },
      [](const auto& v) { return Window((10 + 10 * v[0]) * 1e-9, (30 + 10 * v[0]) * 1e-9); });
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  EXPECT_FALSE(env->all.Holds());
  ASSERT_EQ(env->schedule.size(), 2u);
  EXPECT_EQ(env->schedule[0].spans[0].first, 0);
  EXPECT_EQ(env->schedule[0].spans[0].last, 2);
  EXPECT_EQ(env->schedule[1].spans[0].first, 3);
  EXPECT_EQ(env->schedule[1].spans[0].last, 5);
  EXPECT_NEAR(env->schedule[0].window.recommended, 30e-9, 1e-15);  // [30, 30] ns
  EXPECT_NEAR(env->schedule[1].window.recommended, 60e-9, 1e-15);  // [60, 60] ns
  for (const ScheduleBin& bin : env->schedule) ExpectInsideEveryWindow(s, bin, *env, basis.grid);
}

TEST(DeadTimeEnvelopeTest, ScheduleOnTwoAxesCutsBoth) {
  // [20(a + b), 20(a + b) + 10] ns: the corners (0,0) and (1,1) never share.
  Synthetic s = MakeGrid(
      {{"Vin", {0, 1}}, {"Iout", {0, 1}}}, [](const auto&) { return 1.0; },
      [](const auto& v) {
        double t = 20e-9 * (v[0] + v[1]);
        return Window(t, t + 10e-9);
      });
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  ASSERT_EQ(env->schedule.size(), 4u);
  for (const ScheduleBin& bin : env->schedule) {
    EXPECT_TRUE(bin.window.Holds());
    EXPECT_EQ(bin.points, 1);
    ExpectInsideEveryWindow(s, bin, *env, basis.grid);
  }
}

TEST(DeadTimeEnvelopeTest, ScheduleOnThreeAxesCutsOnlyTheAxisThatMatters) {
  // The window depends on the third axis only: [10, 20] ns or [30, 40] ns.
  Synthetic s = MakeGrid(
      {{"Vin", {36, 48, 60}}, {"Iout", {0, 4}}, {"fsw", {200e3, 400e3}}},
      [](const auto&) { return 1.0; },
      [](const auto& v) { return v[2] < 300e3 ? Window(10e-9, 20e-9) : Window(30e-9, 40e-9); });
  ReportBasis basis = s.Input();
  const EdgeEnvelope* env = basis.envelope.Find(kHighOn);
  ASSERT_NE(env, nullptr);
  ASSERT_EQ(env->schedule_dims.size(), 3u);
  ASSERT_EQ(env->schedule.size(), 2u);
  for (const ScheduleBin& bin : env->schedule) {
    EXPECT_EQ(bin.spans[0].first, 0);  // every Vin
    EXPECT_EQ(bin.spans[0].last, 2);
    EXPECT_EQ(bin.spans[1].first, 0);  // every Iout
    EXPECT_EQ(bin.spans[1].last, 1);
    EXPECT_EQ(bin.points, 6);
    EXPECT_TRUE(bin.window.Holds());
    ExpectInsideEveryWindow(s, bin, *env, basis.grid);
  }
  EXPECT_DOUBLE_EQ(env->schedule[0].window.recommended, 15e-9);
  EXPECT_DOUBLE_EQ(env->schedule[1].window.recommended, 35e-9);
}

}  // namespace
}  // namespace zvsmap
