// zvsmap: map where a converter's switches turn on at zero voltage.
// The front end only parses arguments and wires library calls.
#include <CLI/App.hpp>
#include <CLI/Config.hpp>
#include <CLI/Formatter.hpp>
#include <csignal>
#include <cstdio>

#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "core/diagnostic.h"

int main(int argc, char** argv) {
  // A closed stdout or stderr (`zvsmap run ... 2>&1 | head -1`) must not kill
  // the run before it writes its reports: writes to it then fail with EPIPE,
  // which stdio keeps as the stream's error, and the run goes on.
  std::signal(SIGPIPE, SIG_IGN);
  CLI::App app{"zvsmap " ZVSMAP_VERSION
               ": sweep a SPICE converter template in embedded ngspice and map where each "
               "commutation is zero-voltage switched"};
  app.set_version_flag("--version", std::string(ZVSMAP_VERSION));
  app.require_subcommand(1);
  int exit_code = zvsmap::kExitOk;
  zvsmap::cli::AddRunCommand(app, &exit_code);
  zvsmap::cli::AddMergeCommand(app, &exit_code);
  zvsmap::cli::AddWaveformsCommand(app, &exit_code);
  zvsmap::cli::AddRenderCommand(app, &exit_code);
  zvsmap::cli::AddPointsCommand(app, &exit_code);
  zvsmap::cli::AddExplainCommand(app, &exit_code);
  zvsmap::cli::AddParamsCommand(app, &exit_code);
  zvsmap::cli::AddCalibrateCommand(app, &exit_code);
  zvsmap::cli::AddCharacterizeCommand(app, &exit_code);
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int rc = app.exit(e);
    return rc == 0 ? zvsmap::kExitOk : zvsmap::kExitBadInput;
  } catch (const zvsmap::Error& e) {
    std::fprintf(stderr, "zvsmap: error: %s\n", e.what());
    return zvsmap::kExitInternal;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "zvsmap: internal error: %s\n", e.what());
    return zvsmap::kExitInternal;
  }
  return exit_code;
}
