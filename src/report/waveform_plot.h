// A plot of one commutation edge of one point: switch node, gate drives and
// the commutated current around the edge, from the settled waveforms.
#pragma once

#include <string>

#include "analysis/edge_finder.h"
#include "netlist/template.h"
#include "report/plots.h"
#include "sim/waveforms.h"

namespace zvsmap {

/// The time window plotted for an edge: from one dead time (t_on - t_off)
/// before the turn-off command to two dead times after the turn-on command
/// (at least 0.2 % and 0.4 % of the data's span, for a dead time near zero),
/// clipped to the data and to the incoming switch's next turn-off command.
void EdgePlotWindow(const Waveforms& waves, const EdgeTiming& timing, double* t0_s, double* t1_s);

/// Three panels sharing a time axis in ns from the turn-off command: the
/// switch node voltage (with the rails dashed), the gate-source voltages of
/// both switches (or, when the cell names no gates, their logic commands),
/// and the commutated current (> 0 out of the node); the turn-off and turn-on
/// commands are marked in each panel. Vectors the data lack are skipped; a
/// ground node ("0", "gnd") reads 0 V. `file` and `title` go into the Plot.
Plot EdgeWaveformPlot(const Waveforms& waves, const CellSpec& cell, const EdgeTiming& timing,
                      const std::string& title, const std::string& file);

}  // namespace zvsmap
