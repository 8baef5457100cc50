// The dead-time window of one edge, from a probe run in which the incoming
// switch's turn-on is withheld (netlists/references.md sec. 2, 3 and 10).
#pragma once

#include <limits>
#include <string>

#include "netlist/template.h"
#include "result/edge_metrics.h"
#include "sim/waveforms.h"

namespace zvsmap {

// ---------------------------------------------------------------------------
// Probe metrics: definitions (README "Metrics" copies this block).
//
// The probe run starts from the point's settled start-of-period state and runs
// the same circuit, except that the incoming switch's command is held off from
// the outgoing switch's turn-off command t_off on, until t_off + bound. So its
// incoming v_ds(t) is what a turn-on at dead time t - t_off would meet (the
// run is causal: up to the turn-on, a run with that dead time is the same
// run). Times are measured from t_off, like t_dead_s, so each is a dead time.
// The limit is the edge's v_residual_limit_v. NaN = not applicable.
//   probe_t_min_s       first time v_ds <= limit: the shortest dead time that
//                       meets the ZVS criterion; NaN when the node never meets
//                       it (ZVS impossible at any dead time)
//   probe_t_rail_s      first time v_ds <= 0 (the node reaches the rail)
//   probe_t_max_s       end of the first criterion stretch: the longest dead
//                       time before ring-back lifts v_ds above the limit again;
//                       probe_bound_s when v_ds is still within it at the bound
//   probe_bound_s       where the probe stopped: the incoming command's interval
//                       (t_off to its next turn-off command, the longest dead
//                       time the command waveform holds) less 2 % of the period
//   probe_max_at_bound  1 when probe_t_max_s is the bound (no ring-back seen),
//                       0 when ring-back ended the stretch; NaN without t_min
//   probe_t_diode_s     time with v_ds < -0.1 V between probe_t_rail_s and
//                       probe_t_max_s (body diode conducting); 0 when the node
//                       meets the criterion without reaching the rail
//   probe_e_diode_j     integral of -v_ds * |i_commutated| over the same time
//                       (body-diode conduction energy, Vf*|i|*t, sec. 10)
//   probe_t_valley_s    time of the lowest v_ds in the probe (the best instant
//                       for a turn-on when ZVS is impossible)
//   probe_v_valley_v    that lowest v_ds
//   t_dead_optimal_s    the dead time in [0, bound] that minimises
//                       E(td) = Ecap(v_ds(td)) + Ediode(td): Ecap(v) = C*max(v,0)^2
//                       (equal linear switches: V*Qoss(V) hard, Coss*Vr^2
//                       partial, sec. 3), C = the cell's `coss`, else a
//                       charge-equivalent estimate from the probe (half the
//                       charge the commutated current moved into the node
//                       until the rail or the valley over the voltage swing);
//                       Ediode(td) = integral of max(0, -v_ds)*|i_commutated|
//                       from t_off to td. No reverse-recovery term (the
//                       bundled switch models have none)
//   e_dead_optimal_j    E(t_dead_optimal_s)
// With a probe, zvs_timing_margin_early_s/late_s are the set dead time
// against the probe's criterion stretch (CriterionTiming over [t_off,
// t_off + bound]); the late margin is probe_t_max_s - t_dead_s when the
// stretch is open at the bound.
// ---------------------------------------------------------------------------

/// What the probe analysis needs besides the run's waveforms.
struct ProbeInput {
  bool incoming_high = false;  ///< the edge turns the high switch on (node rises)
  double t_off_hint_s = 0;     ///< the outgoing turn-off command in the probe's time base
  double bound_s = 0;          ///< how long after t_off the probe ran
  double limit_v = 0;          ///< the ZVS criterion's limit (v_residual_limit_v)
  double rail_v = 0;           ///< the rail (rail_v of the measured edge)
  double t_dead_s = 0;         ///< the set dead time (for the timing margins)
  double coss_f = std::numeric_limits<double>::quiet_NaN();  ///< the cell's linear Coss, or NaN
};

/// The window and loss-optimal dead time of one edge (see the block above).
struct DeadTimeWindow {
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  double t_min_s = kNaN, t_rail_s = kNaN, t_max_s = kNaN, bound_s = kNaN;
  double max_at_bound = kNaN, t_diode_s = kNaN, e_diode_j = kNaN;
  double t_valley_s = kNaN, v_valley_v = kNaN;
  double t_dead_optimal_s = kNaN, e_dead_optimal_j = kNaN;
  double margin_early_s = kNaN, margin_late_s = kNaN;
  DeadTimeCurve curve;
};

/// Analyses the probe run `waves` of an edge of `cell`. The outgoing turn-off
/// command is taken from the run's own command signal (its falling 0.5 V
/// crossing nearest the hint). False with `why` when the run does not cover
/// the probe (no samples after t_off).
bool AnalyseProbe(const CellSpec& cell, const Waveforms& waves, const ProbeInput& in,
                  DeadTimeWindow* out, std::string* why);

/// Writes the window into `edge`: the probe_* metrics, t_dead_optimal_s,
/// e_dead_optimal_j, the timing margins (replaced) and the curve.
void ApplyDeadTimeWindow(const DeadTimeWindow& window, EdgeMeasurement* edge);

/// At most `max_samples` of the piecewise-linear (t, v) kept so that linear
/// interpolation between them follows the data closely: the ends, each
/// crossing of a level in `levels` (exact, interpolated), and greedily the
/// sample furthest from the interpolation of those kept so far.
DeadTimeCurve CompactCurve(const std::vector<double>& t, const std::vector<double>& v,
                           const std::vector<double>& levels, size_t max_samples);

}  // namespace zvsmap
