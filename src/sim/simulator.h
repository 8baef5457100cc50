// The seam between zvsmap and a circuit simulator.
#pragma once

#include <string>
#include <vector>

#include "sim/waveforms.h"

namespace zvsmap {

/// The outcome of one transient simulation.
struct SimulationOutput {
  bool ok = false;
  /// Why it failed, one line, with the simulator's own message when it gave
  /// one (e.g. "engine error: Timestep too small ...").
  std::string error;
  /// Everything the simulator printed during this run (kept per point, shown
  /// only when the point fails).
  std::string log;
  /// The vectors asked for, plus "time".
  Waveforms waves;
  /// True when the simulator can no longer be trusted for further runs in
  /// this process (ngspice's exit callback fired); the caller must discard it.
  bool poisoned = false;
};

/// Runs one netlist (complete, with .tran and .end) and returns the named
/// vectors. Implementations never print and never throw for a netlist the
/// simulator rejects; that is `ok == false`.
class Simulator {
 public:
  virtual ~Simulator() = default;
  /// Simulates `netlist` and copies out `vectors` (names as in .save, e.g.
  /// "v(sw)", "i(vsense)"). `tstop_s` is the expected end time; a run that
  /// ends early is a failure.
  virtual SimulationOutput Run(const std::string& netlist,
                               const std::vector<std::string>& vectors, double tstop_s) = 0;
};

}  // namespace zvsmap
