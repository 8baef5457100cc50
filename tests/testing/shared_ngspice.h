// One embedded ngspice per test process (the library is not re-entrant).
#pragma once

#include <string>

#include "sim/ngspice_simulator.h"

namespace zvsmap::testing_support {

/// The process's simulator, created on first use.
inline NgspiceSimulator& SharedNgspice() {
  static NgspiceSimulator* simulator = new NgspiceSimulator();  // never destroyed: ngspice
  return *simulator;                                             // keeps global state
}

/// Absolute path of a file in the source tree (netlists/, sweeps/, tests/).
inline std::string SourcePath(const std::string& relative) {
  return std::string(ZVSMAP_SOURCE_DIR) + "/" + relative;
}

}  // namespace zvsmap::testing_support
