// The simulator vectors that carry a commutation cell's signals: the one
// place their names are spelled (SPICE's v(node) and i(source), ground, and
// the channel-current probe `vch` inside each switch subcircuit). The
// renderer saves them, the analysis measures them, export and plots draw them.
#pragma once

#include <string>
#include <vector>

#include "netlist/template.h"

namespace zvsmap {

/// True for SPICE's ground node, "0" or "gnd" (names are lower-case).
bool IsGroundNode(const std::string& node);

/// The vector of a node's voltage, "v(node)"; "" for an empty name or for
/// ground (which has no vector and reads 0 V).
std::string NodeVoltageVector(const std::string& node);

/// The vector of a voltage source's current, "i(source)"; "" for no source.
std::string SourceCurrentVector(const std::string& source);

/// The channel current (drain -> source) of switch instance `instance`: the
/// current of the zero-volt `vch` inside its subcircuit, "i(v.<instance>.vch)";
/// "" for no instance.
std::string ChannelCurrentVector(const std::string& instance);

/// The vectors of one cell (see CellSpec). A node entry is "" when the cell
/// names no such node or names ground (read it as 0 V).
struct CellVectors {
  std::string node;                    ///< switch node voltage
  std::string rail_high, rail_low;     ///< rail voltages
  std::string current;                 ///< commutated current, > 0 out of the node
  std::string high_cmd, low_cmd;       ///< logic command voltages
  std::string high_gate, high_source;  ///< gate and source voltages
  std::string low_gate, low_source;
  std::string high_channel, low_channel;  ///< channel currents of the two switches

  /// Every non-empty entry, in the order declared above.
  std::vector<std::string> All() const;
};

/// The vectors of `cell`.
CellVectors CellVectorsFor(const CellSpec& cell);

}  // namespace zvsmap
