// The front end: parses arguments and wires library calls (one file per subcommand).
#include "cli/run_cli.h"

#include <CLI/App.hpp>
#include <CLI/Config.hpp>
#include <CLI/Formatter.hpp>
#include <csignal>
#include <cstdio>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "core/diagnostic.h"

namespace zvsmap::cli {

int RunCli(int argc, char** argv, const CliSeams& seams) {
  // A closed stdout or stderr (`zvsmap run ... 2>&1 | head -1`) must not kill
  // the run before it writes its reports: writes to it then fail with EPIPE,
  // which stdio keeps as the stream's error, and the run goes on.
  std::signal(SIGPIPE, SIG_IGN);
  CLI::App app{"zvsmap " ZVSMAP_VERSION
               ": sweep a SPICE converter template in embedded ngspice and map where each "
               "commutation is zero-voltage switched"};
  app.set_version_flag("--version", std::string(ZVSMAP_VERSION));
  app.require_subcommand(1);
  int exit_code = kExitOk;
  AddRunCommand(app, &exit_code, seams);
  AddMergeCommand(app, &exit_code);
  AddWaveformsCommand(app, &exit_code);
  AddRenderCommand(app, &exit_code);
  AddPointsCommand(app, &exit_code);
  AddExplainCommand(app, &exit_code);
  AddParamsCommand(app, &exit_code);
  AddCalibrateCommand(app, &exit_code);
  AddCharacterizeCommand(app, &exit_code);
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int rc = app.exit(e);
    return rc == 0 ? kExitOk : kExitBadInput;
  } catch (const Error& e) {
    std::fprintf(stderr, "zvsmap: error: %s\n", e.what());
    return kExitInternal;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "zvsmap: internal error: %s\n", e.what());
    return kExitInternal;
  }
  return exit_code;
}

}  // namespace zvsmap::cli
