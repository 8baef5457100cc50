// zvsmap's exit statuses (documented in README "Exit status").
#pragma once

namespace zvsmap {

enum ExitCode : int {
  kExitOk = 0,                ///< every point ran (and every requirement held)
  kExitInternal = 1,          ///< a bug or an unexpected system failure
  kExitBadInput = 2,          ///< bad command line, sweep file or template: nothing ran
  kExitRequirementFailed = 3, ///< all points ran, a declared requirement did not hold
  kExitPointsFailed = 4,      ///< some points failed or did not settle
  kExitInterrupted = 130,     ///< stopped by SIGINT/SIGTERM; rerun to resume
};

}  // namespace zvsmap
