// The zvsmap front end as a function, so a test-only binary can run the real
// command line with its own worker seams.
#pragma once

#include <functional>

#include "run/worker_pool.h"

namespace zvsmap::cli {

/// What the front end takes from its caller rather than building itself.
struct CliSeams {
  /// Given the job and simulator factory `zvsmap run` built for its workers,
  /// returns those the pool uses. Empty (the program's own main): unchanged.
  std::function<WorkerSetup(WorkerSetup)> workers;
};

/// Parses `argv`, runs the chosen subcommand and returns the exit status
/// (cli/exit_codes.h). Prints errors on stderr; never exits.
int RunCli(int argc, char** argv, const CliSeams& seams);

}  // namespace zvsmap::cli
