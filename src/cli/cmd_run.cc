// `zvsmap run SWEEP --out DIR`: simulate every point and write the reports.
#include <cstdio>
#include <filesystem>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "report/report_set.h"
#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "sim/ngspice_simulator.h"

namespace zvsmap::cli {

void AddRunCommand(CLI::App& app, int* exit_code) {
  struct Options {
    std::string sweep;
    std::string out_dir;
    size_t max_points = 0;
    bool quiet = false;
  };
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand("run", "Simulate every point of a sweep and write the reports");
  cmd->add_option("sweep", opts->sweep, "Sweep file (XML)")->required();
  cmd->add_option("--out,-o", opts->out_dir, "Output directory (created if missing)")->required();
  cmd->add_option("--max-points", opts->max_points, "Override the sweep's point limit");
  cmd->add_flag("--quiet,-q", opts->quiet, "Print only errors and the final summary");
  cmd->callback([opts, exit_code] {
    PreparedSweep sweep;
    std::vector<Diagnostic> errors;
    if (!PrepareSweep(opts->sweep, opts->max_points, &sweep, &errors)) {
      PrintErrors(errors);
      *exit_code = kExitBadInput;
      return;
    }
    std::error_code ec;
    std::filesystem::create_directories(opts->out_dir, ec);
    if (ec) {
      std::fprintf(stderr, "zvsmap: error: %s: cannot create output directory: %s\n",
                   opts->out_dir.c_str(), ec.message().c_str());
      *exit_code = kExitBadInput;
      return;
    }

    PointEvaluator evaluator(sweep.spec, sweep.tmpl);
    NgspiceSimulator simulator;
    std::vector<PointResult> results;
    size_t failed = 0;
    for (const auto& point : sweep.points) {
      results.push_back(evaluator.Evaluate(point, simulator));
      const PointResult& r = results.back();
      if (r.status != PointStatus::kOk) {
        ++failed;
        std::fprintf(stderr, "zvsmap: point %zu (%s) %s: %s\n", point.index,
                     point.Describe().c_str(), PointStatusName(r.status), r.reason.c_str());
      }
      if (!opts->quiet) {
        std::fprintf(stderr, "[%zu/%zu] point %zu %s (%.2f s)\n", results.size(),
                     sweep.points.size(), point.index, PointStatusName(r.status), r.wall_s);
      }
    }

    ReportOutcome outcome;
    std::string error;
    if (!WriteReports({sweep.spec, sweep.tmpl, sweep.points, results}, opts->out_dir, &outcome,
                      &error)) {
      std::fprintf(stderr, "zvsmap: error: %s\n", error.c_str());
      *exit_code = kExitInternal;
      return;
    }
    std::fprintf(stderr, "zvsmap: %zu points, %zu ok, %zu failed\n", sweep.points.size(),
                 sweep.points.size() - failed, failed);
    for (const auto& f : outcome.files) std::fprintf(stderr, "zvsmap: wrote %s\n", f.c_str());
    if (failed) {
      *exit_code = kExitPointsFailed;
      return;
    }
    if (outcome.requirements_failed > 0) {
      *exit_code = kExitRequirementFailed;
      return;
    }
    *exit_code = failed ? kExitPointsFailed : kExitOk;
  });
}

}  // namespace zvsmap::cli
