// Finding commutation edges from the logic command signals.
#pragma once

#include <limits>
#include <string>
#include <vector>

#include "netlist/template.h"
#include "sim/waveforms.h"

namespace zvsmap {

/// The timing of one edge: the outgoing switch's turn-off command, the
/// incoming switch's turn-on command, and the incoming switch's next
/// turn-off command (the end of the window in which the edge is observed).
struct EdgeTiming {
  std::string edge;        ///< "high_on" or "low_on"
  bool incoming_high = false;
  double t_off_s = 0;      ///< outgoing switch's command falls through 0.5
  double t_on_s = 0;       ///< incoming switch's command rises through 0.5
  double t_end_s = 0;      ///< incoming switch's command falls again (or data end)
  /// How long the incoming switch's command stays on after t_on, from the
  /// data or, when its turn-off lies past the data's end, from the previous
  /// period's (the commands repeat every period); NaN when neither is there.
  double conduction_s = std::numeric_limits<double>::quiet_NaN();
};

/// The guard FindEdgesFrom keeps between an edge's turn-on command and the
/// data's end, in periods.
constexpr double kEdgeGuardPeriods = 0.02;

/// Times at which `v` crosses `level` in the given direction, linearly
/// interpolated, within [t0, t1].
std::vector<double> Crossings(const std::vector<double>& t, const std::vector<double>& v,
                              double level, bool rising, double t0, double t1);

/// For each of the two edges of `cell`, its latest complete occurrence in the
/// data (turn-on command at least `guard_s` before the end of the data).
/// An edge that never occurs is missing from the result.
std::vector<EdgeTiming> FindEdges(const CellSpec& cell, const Waveforms& waves, double guard_s);

/// For each of the two edges of `cell`, its first occurrence whose turn-off
/// command is at or after `from_s` and whose turn-on command lies at least
/// kEdgeGuardPeriods periods before the end of the data (the measured period
/// of a measured run, run/point_evaluator.h MeasuredRun).
std::vector<EdgeTiming> FindEdgesFrom(const CellSpec& cell, const Waveforms& waves,
                                      double period_s, double from_s);

}  // namespace zvsmap
