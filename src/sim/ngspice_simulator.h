// Simulator over the embedded ngspice shared library (sharedspice.h).
#pragma once

#include <memory>

#include "sim/simulator.h"

namespace zvsmap {

/// Where the engine's time went, summed over this simulator's runs (seconds of
/// wall clock; a clock read around each stage, nothing else). Benchmarks read
/// it (tools/bench_stages.cc); zvsmap's own output does not show it.
struct EngineTimings {
  int runs = 0;         ///< Run calls that reached the engine
  long samples = 0;     ///< time points the engine stored, over all runs
  double load_s = 0;    ///< ngSpice_Circ: parsing, subcircuit and parameter expansion
  double run_s = 0;     ///< the "run" command: setup before the first step and time stepping
  double copy_s = 0;    ///< copying the asked-for vectors out of the plot
  double unload_s = 0;  ///< remcirc and destroy all
};

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

  /// The stage times of every run since construction (or the last ResetTimings).
  const EngineTimings& timings() const;
  void ResetTimings();

 private:
  struct State;
  std::unique_ptr<State> state_;
};

}  // namespace zvsmap
