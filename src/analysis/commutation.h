// Measuring one commutation edge: current, turn-on voltage, transition, ZVS class.
#pragma once

#include "analysis/edge_finder.h"
#include "analysis/edge_metrics.h"
#include "netlist/template.h"
#include "sim/waveforms.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Measures an edge found by FindEdges. Metrics, in this column order:
///   rail_v              rail voltage (rail_high - rail_low) at the turn-off command
///   i_commutated_a      i(current) at the turn-off command, > 0 out of the node
///   t_dead_s            turn-on command time minus turn-off command time
///   v_turn_on_v         incoming switch's drain-source voltage at its turn-on command
///   v_residual_limit_v  the criterion's limit for this rail
///   t_transition_s      node 10 % -> 90 % of the rail swing (toward the incoming
///                       switch's rail) after the turn-off command; NaN if not
///                       reached before the incoming switch turns off again
/// ZVS class: full when v_turn_on_v <= the limit; partial when above it but
/// below half the rail; hard otherwise.
EdgeMeasurement MeasureEdge(const CellSpec& cell, const Waveforms& waves, const EdgeTiming& timing,
                            const ZvsCriterion& criterion);

/// The drain-source voltage of the incoming switch over the whole data.
std::vector<double> IncomingSwitchVoltage(const CellSpec& cell, const Waveforms& waves,
                                          bool incoming_high);

}  // namespace zvsmap
