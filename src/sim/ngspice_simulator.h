// Simulator over the embedded ngspice shared library (sharedspice.h).
#pragma once

#include <memory>

#include "sim/simulator.h"

namespace zvsmap {

/// The ngspice library keeps global state and is not re-entrant: create at
/// most one NgspiceSimulator per process (worker processes each own one).
/// Messages are captured through the printf callback; nothing reaches the
/// process's stdout/stderr.
class NgspiceSimulator : public Simulator {
 public:
  NgspiceSimulator();
  ~NgspiceSimulator() override;
  NgspiceSimulator(const NgspiceSimulator&) = delete;
  NgspiceSimulator& operator=(const NgspiceSimulator&) = delete;

  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>& vectors,
                       double tstop_s) override;

 private:
  struct State;
  std::unique_ptr<State> state_;
};

}  // namespace zvsmap
