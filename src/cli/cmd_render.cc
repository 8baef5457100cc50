// `zvsmap render SWEEP --point N`: print the netlist of one point, runnable
// in plain ngspice.
#include <cstdio>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "run/point_evaluator.h"
#include "run/sweep_setup.h"

namespace zvsmap::cli {

void AddRenderCommand(CLI::App& app, int* exit_code) {
  struct Options {
    std::string sweep;
    size_t point = 0;
    size_t max_points = 0;
  };
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand(
      "render", "Print the rendered netlist of one point (runs in plain ngspice as is)");
  cmd->add_option("sweep", opts->sweep, "Sweep file (XML)")->required();
  cmd->add_option("--point,-p", opts->point, "Point index (see `zvsmap points`)");
  cmd->add_option("--max-points", opts->max_points, "Override the sweep's point limit");
  cmd->callback([opts, exit_code] {
    PreparedSweep sweep;
    std::vector<Diagnostic> errors;
    if (!PrepareSweep(opts->sweep, opts->max_points, &sweep, &errors)) {
      PrintErrors(errors);
      *exit_code = kExitBadInput;
      return;
    }
    PrintWarnings(sweep.warnings);
    if (opts->point >= sweep.points.size()) {
      std::fprintf(stderr, "zvsmap: error: point %zu does not exist (the sweep has %zu points)\n",
                   opts->point, sweep.points.size());
      *exit_code = kExitBadInput;
      return;
    }
    PointEvaluator evaluator(sweep);
    std::string netlist;
    Diagnostic error;
    if (!evaluator.Render(sweep.points[opts->point], &netlist, &error)) {
      PrintErrors({error});
      *exit_code = kExitBadInput;
      return;
    }
    std::fputs(netlist.c_str(), stdout);
    *exit_code = kExitOk;
  });
}

}  // namespace zvsmap::cli
