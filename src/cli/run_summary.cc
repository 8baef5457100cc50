#include "cli/run_summary.h"

#include <algorithm>
#include <cstdio>

#include "cli/exit_codes.h"
#include "report/disagreement_summary.h"
#include "report/report_set.h"
#include "run/progress.h"
#include "run/run_plan.h"
#include "report/solver_aid_use.h"

namespace zvsmap::cli {

int WriteReportsAndSummarize(const RunSummaryInput& in) {
  std::vector<Point> points;
  std::vector<PointResult> results;
  for (size_t i : in.indices) {
    points.push_back(in.sweep.points[i]);
    results.push_back(in.results[i]);
  }
  ReportOutcome report;
  std::string error;
  if (!WriteReports({in.sweep.spec, in.sweep.tmpl, points, results, in.refinement}, in.out_dir,
                    &report, &error)) {
    std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
    return kExitInternal;
  }
  ResultCounts c = CountResults(results);
  std::fprintf(stderr, "zvsmap: %zu points%s: %zu ok, %zu failed, %zu unsettled", results.size(),
               in.shard.empty() ? "" : (" in shard " + in.shard).c_str(), c.ok, c.failed,
               c.unsettled);
  if (c.not_run > 0) std::fprintf(stderr, ", %zu not run", c.not_run);
  std::fprintf(stderr, " (%zu kept from the stored run); wall time %s\n", in.kept,
               FormatDuration(in.wall_s).c_str());
  std::fprintf(stderr, "zvsmap: %s\n", DescribeSolverAidUse(results).c_str());
  if (in.refinement.used) {
    const RefinementOutcome& o = in.refinement;
    std::fprintf(stderr,
                 "zvsmap: refinement: %zu points of the %zu-point fine grid (%.0f %%), %d of %d "
                 "rounds after the coarse grid%s%s\n",
                 in.sweep.points.size(), o.fine_grid_points,
                 o.fine_grid_points ? 100.0 * in.sweep.points.size() / o.fine_grid_points : 0.0,
                 std::max(0, o.rounds_run - 1), o.rounds_planned,
                 o.complete ? ", complete" : "; ",
                 o.complete ? "" : o.pending.c_str());
  }
  if (report.requirements_total > 0) {
    std::fprintf(stderr, "zvsmap: requirements: %d of %d held\n",
                 report.requirements_total - report.requirements_failed,
                 report.requirements_total);
  }
  std::vector<std::string> disagreements = DisagreementSummary(points, results, 5);
  if (!disagreements.empty()) {
    std::fprintf(stderr, "zvsmap: largest disagreements with the hand calculation:\n");
    for (const auto& line : disagreements) std::fprintf(stderr, "  %s\n", line.c_str());
  }
  for (const auto& f : report.files) std::fprintf(stderr, "zvsmap: wrote %s\n", f.c_str());
  std::fprintf(stderr, "zvsmap: run store %s\n", in.store_path.c_str());
  if (in.interrupted) {
    std::fprintf(stderr, "zvsmap: interrupted; run the same command again to resume\n");
    return kExitInterrupted;
  }
  if (c.failed + c.unsettled + c.not_run > 0) return kExitPointsFailed;
  if (report.requirements_failed > 0) return kExitRequirementFailed;
  return kExitOk;
}

}  // namespace zvsmap::cli
