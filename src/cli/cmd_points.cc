// `zvsmap points SWEEP`: list the expanded operating points.
#include <cstdio>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "run/sweep_setup.h"

namespace zvsmap::cli {

void PrintErrors(const std::vector<Diagnostic>& errors) {
  for (const auto& e : errors) std::fprintf(stderr, "zvsmap: error: %s\n", e.Format().c_str());
}

void PrintWarnings(const std::vector<Diagnostic>& warnings) {
  for (const auto& w : warnings) std::fprintf(stderr, "zvsmap: warning: %s\n", w.Format().c_str());
}

void AddPointsCommand(CLI::App& app, int* exit_code) {
  struct Options {
    std::string sweep;
    size_t max_points = 0;
  };
  auto opts = std::make_shared<Options>();
  CLI::App* cmd = app.add_subcommand("points", "List the operating points a sweep file expands to");
  cmd->add_option("sweep", opts->sweep, "Sweep file (XML)")->required();
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
    for (const auto& p : sweep.points) {
      if (std::ferror(stdout)) break;  // the reader went away (EPIPE): stop printing
      std::printf("%zu  %s\n", p.index, p.Describe().c_str());
    }
    *exit_code = kExitOk;
  });
}

}  // namespace zvsmap::cli
