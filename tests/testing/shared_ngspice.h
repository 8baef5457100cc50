// One embedded ngspice per test process (the library is not re-entrant).
#pragma once

#include <string>

#include "core/diagnostic.h"
#include "result/point_result.h"
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

/// The measurement of edge `edge` ("high_on"/"low_on") of `cell` ("" = the
/// first cell that has it); throws when the point has no such edge.
inline const EdgeMeasurement& EdgeOf(const PointResult& r, const std::string& edge,
                                     const std::string& cell = "") {
  for (const auto& e : r.edges)
    if (e.edge == edge && (cell.empty() || e.cell == cell)) return e;
  throw Error("edge " + (cell.empty() ? "" : cell + ".") + edge + " missing");
}

}  // namespace zvsmap::testing_support
