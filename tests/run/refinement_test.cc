#include "run/refinement.h"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>

#include "report/report_fixture.h"
#include "report/zvs_boundary.h"
#include "sweep/sweep_expand.h"
#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

using testing_report::MakeEdge;

// The synthetic ZVS margin of "leg.high_on" in volts over (L in µH, Iout in A),
// linear in each direction so that linear interpolation between two
// neighbouring points finds its zero exactly (definition of linear
// interpolation; // common practice, no source): the boundary is the straight
// line Iout = 2 * L - 0.9.
double Margin(double l_uh, double iout) { return 2 * l_uh - 0.9 - iout; }

struct Refined {
  SweepSpec spec;
  RefinementPlan plan;
  std::vector<Point> points;
  std::vector<PointResult> results;
  int rounds = 0;
};

PointResult ResultAt(const Point& p, const std::function<double(double, double)>& margin) {
  PointResult r;
  r.index = p.index;
  r.status = PointStatus::kOk;
  r.edges.push_back(MakeEdge("leg", "high_on", margin(*p.Get("L") * 1e6, *p.Get("Iout"))));
  r.edges.push_back(MakeEdge("leg", "low_on", 4));
  return r;
}

// Parses `xml`, expands it and runs every round with the synthetic margin.
Refined RunAll(const std::string& xml, const std::function<double(double, double)>& margin) {
  Refined out;
  Diagnostic error;
  EXPECT_TRUE(ParseSweepText(xml, "sweeps/refine.xml", &out.spec, &error)) << error.Format();
  EXPECT_TRUE(ExpandSweep(out.spec, &out.points, &error)) << error.Format();
  out.plan = StartRefinement(&out.spec, &out.points);
  for (const Point& p : out.points) out.results.push_back(ResultAt(p, margin));
  for (int round = 1;; ++round) {
    RoundPlan next;
    EXPECT_TRUE(PlanRound(out.spec, out.plan, round, out.points, out.results, &next, &error))
        << error.Format();
    EXPECT_FALSE(next.waiting);
    if (next.added.empty()) break;
    for (Point& p : next.added) {
      EXPECT_EQ(p.index, out.points.size());
      EXPECT_EQ(p.refine_round, round);
      out.results.push_back(ResultAt(p, margin));
      out.points.push_back(std::move(p));
    }
    out.rounds = round;
  }
  return out;
}

const char* kSweep =
    "<sweep>\n  <template file=\"x.cir\"/>\n"
    "  <axis param=\"L\" from=\"0.6u\" to=\"3u\" step=\"0.6u\"/>\n"
    "  <axis param=\"Iout\" from=\"0\" to=\"8\" step=\"2\"/>\n"
    "  <refine param=\"L\" resolution=\"0.075u\"/>\n"
    "  <refine param=\"Iout\" resolution=\"0.25\"/>\n</sweep>\n";

TEST(RefinementTest, StartMovesTheCoarseGridOntoTheFineLattice) {
  SweepSpec spec;
  Diagnostic error;
  ASSERT_TRUE(ParseSweepText(kSweep, "sweeps/refine.xml", &spec, &error)) << error.Format();
  std::vector<Point> points;
  ASSERT_TRUE(ExpandSweep(spec, &points, &error));
  RefinementPlan plan = StartRefinement(&spec, &points);
  ASSERT_TRUE(plan.active);
  EXPECT_EQ(plan.rounds, 3);
  // 4 coarse intervals of 8 fine ones each: 33 values per axis.
  EXPECT_EQ(spec.groups[0].size(), 33u);
  EXPECT_EQ(spec.groups[1].size(), 33u);
  EXPECT_EQ(plan.fine_grid_points, 33u * 33u);
  EXPECT_DOUBLE_EQ(spec.groups[1].axes[0].values[1], 0.25);
  EXPECT_DOUBLE_EQ(spec.groups[1].axes[0].values[32], 8);
  // Point 6 is (L index 1, Iout index 1) on the coarse grid: (8, 8) on the lattice.
  EXPECT_EQ(points[6].grid, (std::vector<int>{8, 8}));
  EXPECT_EQ(points[6].refine_round, 0);
  EXPECT_DOUBLE_EQ(spec.groups[0].axes[0].values[8], *points[6].Get("L"));
}

// Refinement finds the same boundary crossings as the full fine grid: on
// every line of the lattice the full grid crosses, the refined set has both
// neighbours and so the same interpolated value, and no other crossing. For
// the straight boundary it samples well under 30 % of the fine grid (the
// target of issue 16).
TEST(RefinementTest, BoundariesMatchTheFullFineGrid) {
  Refined r = RunAll(kSweep, Margin);
  EXPECT_EQ(r.rounds, 3);
  EXPECT_LT(r.points.size(), r.plan.fine_grid_points * 30 / 100);

  // The full fine grid of the same lattice, with the same margins.
  std::vector<Point> fine;
  Diagnostic error;
  ASSERT_TRUE(ExpandSweep(r.spec, &fine, &error));
  std::vector<PointResult> fine_results;
  for (const Point& p : fine) fine_results.push_back(ResultAt(p, Margin));

  EdgeKey key{"leg", "high_on"};
  MarginSource margin = ChooseMargin(r.results);
  auto refined = FindBoundaries(BuildGrid(r.spec, r.points), r.results, key, margin);
  auto full = FindBoundaries(BuildGrid(r.spec, fine), fine_results, key, margin);
  ASSERT_FALSE(full.empty());
  for (const Boundary& f : full) {
    bool matched = false;
    for (const Boundary& b : refined) {
      matched = matched || (b.dim == f.dim && b.at == f.at && std::fabs(b.value - f.value) < 1e-12);
    }
    EXPECT_TRUE(matched) << "fine-grid boundary along " << f.dim << " at " << f.value;
  }
  // Each refined crossing lies within one fine spacing of the analytic line.
  for (const Boundary& b : refined) {
    double spacing = b.dim == 0 ? 0.075e-6 : 0.25;
    EXPECT_LE(b.upper - b.lower, spacing * (1 + 1e-9));
    ASSERT_EQ(b.at.size(), 2u);
    double l_uh = b.dim == 0 ? b.value * 1e6 : r.spec.groups[0].axes[0].values[b.at[0]] * 1e6;
    double iout = b.dim == 1 ? b.value : r.spec.groups[1].axes[0].values[b.at[1]];
    EXPECT_NEAR(Margin(l_uh, iout), 0, 1e-9);
  }
  EXPECT_EQ(refined.size(), full.size());
}

// Round k depends only on the results of rounds < k: planning again from the
// same results gives the same points, and a corner without a result makes the
// round wait instead of guessing.
TEST(RefinementTest, RoundsAreDeterministicAndWaitForMissingResults) {
  Refined r = RunAll(kSweep, Margin);
  Refined again = RunAll(kSweep, Margin);
  ASSERT_EQ(r.points.size(), again.points.size());
  for (size_t i = 0; i < r.points.size(); ++i) EXPECT_EQ(r.points[i].grid, again.points[i].grid);

  std::vector<PointResult> partial(r.results.begin(), r.results.begin() + 25);
  partial[12] = NotRunResult(12);
  std::vector<Point> coarse(r.points.begin(), r.points.begin() + 25);
  RoundPlan next;
  Diagnostic error;
  ASSERT_TRUE(PlanRound(r.spec, r.plan, 1, coarse, partial, &next, &error));
  EXPECT_TRUE(next.waiting);
  EXPECT_TRUE(next.added.empty());
  EXPECT_NE(next.why_waiting.find("round 1 needs the results of round 0"), std::string::npos);
}

// Without a class change or a margin sign change nothing is refined.
TEST(RefinementTest, UniformRegionAddsNoPoints) {
  Refined r = RunAll(kSweep, [](double, double) { return 3.0; });
  EXPECT_EQ(r.points.size(), 25u);
  EXPECT_EQ(r.rounds, 0);
}

TEST(RefinementTest, RoundBeyondThePointLimitIsAnError) {
  std::string xml = kSweep;
  xml.insert(xml.find("</sweep>"), "  <limits max-points=\"30\"/>\n");
  Refined r;
  Diagnostic error;
  ASSERT_TRUE(ParseSweepText(xml, "sweeps/refine.xml", &r.spec, &error)) << error.Format();
  ASSERT_TRUE(ExpandSweep(r.spec, &r.points, &error));
  r.plan = StartRefinement(&r.spec, &r.points);
  for (const Point& p : r.points) r.results.push_back(ResultAt(p, Margin));
  RoundPlan next;
  EXPECT_FALSE(PlanRound(r.spec, r.plan, 1, r.points, r.results, &next, &error));
  EXPECT_EQ(error.where.line, 7);
  EXPECT_NE(error.message.find("more than the limit of 30"), std::string::npos) << error.message;
}

}  // namespace
}  // namespace zvsmap
