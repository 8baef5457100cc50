// `zvsmap explain SWEEP --point N`: one point's hand calculation step by
// step, then the point simulated in ngspice and its values beside the
// predictions.
#include <cstdio>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "handcalc/explanation.h"
#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "sim/ngspice_simulator.h"

namespace zvsmap::cli {

void AddExplainCommand(CLI::App& app, int* exit_code) {
  struct Options {
    std::string sweep;
    size_t point = 0;
    bool hand_only = false;
  };
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand(
      "explain", "Show one point's hand calculation step by step beside its simulation");
  cmd->add_option("sweep", opts->sweep, "Sweep file (XML)")->required();
  cmd->add_option("--point,-p", opts->point, "Point index (see `zvsmap points`)")->required();
  cmd->add_flag("--hand-only", opts->hand_only, "Do not simulate; print the hand calculation only");
  cmd->callback([opts, exit_code] {
    PreparedSweep sweep;
    std::vector<Diagnostic> errors;
    if (!PrepareSweep(opts->sweep, 0, &sweep, &errors)) {
      PrintErrors(errors);
      *exit_code = kExitBadInput;
      return;
    }
    PrintWarnings(sweep.warnings);
    if (opts->point >= sweep.points.size()) {
      std::fprintf(stderr, "zvsmap: error: %s has %zu points (0 to %zu); no point %zu\n",
                   opts->sweep.c_str(), sweep.points.size(), sweep.points.size() - 1, opts->point);
      *exit_code = kExitBadInput;
      return;
    }
    const Point& point = sweep.points[opts->point];
    // One evaluation: its hand calculation is printed now and compared with
    // the simulated edges below, computed once.
    PointEvaluator evaluator(sweep);
    PointEvaluation ev;
    if (!evaluator.Prepare(point, &ev)) {
      PrintErrors({ev.error});
      *exit_code = kExitBadInput;
      return;
    }
    std::printf("point %zu: %s\n\n", point.index, point.Describe().c_str());
    for (const std::string& line : ExplainHandCalculation(ev.hand, sweep.tmpl, ev.params)) {
      std::printf("%s\n", line.c_str());
    }
    if (!ev.hand_ok) {
      PrintErrors({ev.hand_error});
      *exit_code = kExitBadInput;
      return;
    }
    if (opts->hand_only) {
      *exit_code = kExitOk;
      return;
    }
    std::printf("\nsimulating point %zu in ngspice...\n", point.index);
    std::fflush(stdout);
    NgspiceSimulator simulator;
    evaluator.Simulate(point, simulator, false, &ev);
    const PointResult& result = ev.result;
    if (result.status != PointStatus::kOk) {
      std::fprintf(stderr, "zvsmap: point %zu %s: %s\n", point.index,
                   PointStatusName(result.status), result.reason.c_str());
      *exit_code = kExitPointsFailed;
      return;
    }
    std::printf("settled by %s in %.3g periods (%.2f s)\n\n", SettleMethodName(result.settle.method),
                result.settle.periods, result.wall_s);
    for (const std::string& line : ExplainComparison(ev.hand, result.edges)) {
      std::printf("%s\n", line.c_str());
    }
    *exit_code = kExitOk;
  });
}

}  // namespace zvsmap::cli
