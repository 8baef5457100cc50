// Wiring checks before a sweep runs: mistakes in how the template and the
// switch models are tied together that ngspice would run (with wrong signs)
// or fail on at every point. Structural checks on the netlist text; nothing is
// simulated. README "Wiring checks" lists them.
#pragma once

#include <vector>

#include "core/diagnostic.h"
#include "netlist/device_models.h"
#include "netlist/template.h"

namespace zvsmap {

/// Checks each cell of `tmpl`:
///  - the sense source (`current=`) is a top-level voltage source with the
///    switch node as its first (+) terminal; with the node as its second
///    terminal it is reversed and every commutated current and margin would
///    change sign;
///  - each switch instance's gate pin is not the switch node or a rail, and
///    its drain pin is not a gate or command node of the cell;
/// and each of `devices` (the sweep's switch models, with their pin maps):
///  - no transistor (`m`) inside the subcircuit has its gate reached from a
///    pin mapped to drain or source, or its drain from a pin mapped to gate
///    (directly or through one series resistor, e.g. an internal gate
///    resistance): a pin map with gate and drain swapped; nor its drain on
///    the pin mapped to source and its source on the pin mapped to drain
///    (its body diode would conduct at the rail);
///  - no diode inside has its anode on the pin mapped to drain and its
///    cathode on the pin mapped to source: that switch would conduct at the
///    rail instead of blocking.
/// Returns every problem found, each naming the file and line and what was seen.
std::vector<Diagnostic> CheckWiring(const Template& tmpl,
                                    const std::vector<ResolvedDevice>& devices);

}  // namespace zvsmap
