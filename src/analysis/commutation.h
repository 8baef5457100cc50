// Measuring one commutation edge: currents, voltages, timing, energies, ZVS.
#pragma once

#include <limits>
#include <vector>

#include "analysis/edge_finder.h"
#include "core/expression.h"
#include "netlist/template.h"
#include "result/edge_metrics.h"
#include "sim/waveforms.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Resolved parameter values the measurement uses when the cell names them
/// (`*@ cell ... high_vth=P low_vth=P inductance=P coss=P`); NaN = not named.
struct EdgeParams {
  double high_vth_v = std::numeric_limits<double>::quiet_NaN();    ///< high switch gate threshold
  double low_vth_v = std::numeric_limits<double>::quiet_NaN();     ///< low switch gate threshold
  double inductance_h = std::numeric_limits<double>::quiet_NaN();  ///< commutating inductance
  double coss_f = std::numeric_limits<double>::quiet_NaN();        ///< linear Coss of each switch
  /// The switching period: the node's average (for the energy needed) is
  /// taken over the data's last whole period; NaN: over all of the data.
  double period_s = std::numeric_limits<double>::quiet_NaN();
};

/// The parameters `cell` names, looked up in a point's resolved values.
EdgeParams EdgeParamsFor(const CellSpec& cell, const Variables& resolved);

// ---------------------------------------------------------------------------
// Per-edge metrics: definitions (README "Metrics" copies this block).
//
// Words. An edge is one commutation: the OUTGOING switch's turn-off command at
// t_off, then the INCOMING switch's turn-on command at t_on (commands are
// logic signals, the instant is their 0.5 V crossing). "high_on" = low switch
// off, high switch on, node rises; "low_on" = the reverse. v_ds of a switch is
// its drain-source voltage: high switch rail_high - node, low switch
// node - rail_low. The rail is rail_high - rail_low at t_off. The incoming
// channel turns on at t_ch: its gate-source voltage's rising crossing of its
// threshold (cell keys high_vth/low_vth with high_gate/high_source etc.), or
// t_on when the threshold is not known. The dead-time window is [t_off, t_ch].
// The clamp band is max(1 % of the rail, 0.1 V). Times t_*_s are measured from
// t_off. Values are linearly interpolated between simulator time points.
// NaN = not reached / not applicable / parameter not named.
//
// Column, in output order:
//   rail_v               rail voltage at t_off
//   i_commutated_a       i(cell current) at t_off, > 0 flowing OUT of the node
//   t_dead_s             t_on - t_off
//   v_turn_on_v          incoming v_ds at t_on (the residual voltage)
//   v_at_vth_v           incoming v_ds at t_ch (gate threshold crossing)
//   v_residual_limit_v   the ZVS criterion's limit for this rail (criterion text
//                        in EdgeMeasurement::criterion)
//   t_transition_s       node 10 % -> 90 % of the rail swing toward the incoming
//                        rail, first crossings after t_off, before the incoming
//                        switch's next turn-off command
//   t_clamp_s            t_off -> incoming v_ds first <= v_residual_limit_v,
//                        within the dead-time window (minimum dead time for ZVS
//                        by the criterion)
//   t_zvs_s              t_off -> incoming v_ds first <= 0 (node reaches the
//                        opposite rail), within the dead-time window
//   dvdt_peak_v_per_s    largest |d v(node)/dt| between t_off and the end of the
//                        turn-on (see e_on_j), sample-to-sample differences
//   t_reverse_s          time within the dead-time window with incoming
//                        v_ds < -0.1 V (body diode / reverse conduction before
//                        the channel turns on)
//   v_ds_min_v           lowest incoming v_ds within the dead-time window
//   ringback             1 when the node reverses during the dead-time window,
//                        else 0: after reaching the rail (t_zvs) incoming v_ds
//                        rises above the clamp band again, or, not reaching it,
//                        it first falls by more than the band below its value
//                        at t_off and then rises by more than the band
//   t_ringback_s         t_off -> the reversal. After reaching the rail: the
//                        commutated current's zero crossing after t_zvs (it
//                        reverses while the node is clamped: the longest dead
//                        time before ring-back); if it has none, the last
//                        rising crossing of v_ds = 0. Not reaching the rail:
//                        the instant of v_ds_min_v
//   v_ringback_v         highest incoming v_ds after the reversal, before t_ch
//   e_on_j               integral of v_ds * i_channel of the incoming switch
//                        from the start of its command edge (command rising
//                        through 0.05) until its v_ds first falls within the
//                        clamp band at or after t_on (before its next turn-off)
//   e_off_j              integral of v_ds * i_channel of the outgoing switch
//                        from the start of its command edge (falling through
//                        0.95) until t_on. i_channel = i(v.<switch>.vch),
//                        drain -> source: the capacitor's charge is not counted
//                        (netlists/references.md sec. 3)
//   e_cap_est_j          capacitive turn-on loss estimate for equal linear
//                        switches, coss * v_turn_on_v^2 (= V*Qoss(V) hard,
//                        Coss*Vr^2 partial; netlists/references.md sec. 3); needs `coss`
//   e_available_j        1/2 * L * I * |I|, I = the commutated current in the
//                        direction that drives the node toward the incoming
//                        rail (-i_commutated_a for high_on); needs `inductance`
//   e_needed_j           charge-based need (netlists/references.md sec. 2, Costinett et
//                        al. 2015): Qoss(V) * (V - 2*Vo) for high_on,
//                        Qoss(V) * (2*Vo - V) for low_on; V = rail,
//                        Vo = average of node - rail_low over the data,
//                        Qoss(V) = coss * V; <= 0 means the resonance alone
//                        reaches the rail
//   zvs_energy_margin    energy margin: (e_available_j - e_needed_j) /
//                        (Qoss(V) * V), signed, dimensionless. >= 0: the
//                        commutated current's energy can carry the node to the
//                        incoming rail at all, at SOME dead time. It does not
//                        see the set dead time: a cell can show >= 0 and be
//                        partial (dead time too short or past the ring-back);
//                        the timing margins below see that
//   zvs_timing_margin_early_s
//                        timing margin, early side: t_on - t_a, where [t_a, t_b]
//                        is the criterion stretch of the window: a maximal
//                        interval of [t_off, max(t_ch, t_on)] with incoming
//                        v_ds <= v_residual_limit_v; the one holding t_on, else
//                        the last that ends before t_on, else the first after
//                        it. >= 0: the node met the criterion before turn-on.
//                        Equals t_dead_s - t_clamp_s when the node enters the
//                        criterion once. NaN: it never meets it in the window
//                        (the run cannot see when it would)
//   zvs_timing_margin_late_s
//                        timing margin, late side: t_b - t_on, >= 0: turn-on
//                        came before v_ds rose out of the criterion again
//                        (ring-back), < 0: it came that much too late. NaN: the
//                        node was still within the criterion at the window's
//                        end (the run cannot see the end) or never met it
// ZVS class: full when v_turn_on_v <= v_residual_limit_v; partial when above
// the limit but below half the rail; hard otherwise (unknown when NaN).
// The class and the timing margins agree by construction: full <=>
// zvs_timing_margin_early_s >= 0 and zvs_timing_margin_late_s is not < 0
// (both read the same interpolated v_ds; equality within the interpolation).
// ---------------------------------------------------------------------------

/// The probe metrics MeasureEdge appends as NaN after the timing margins, in
/// output order; a probe run fills them (analysis/dead_time_window.h).
inline constexpr const char* kProbeMetricNames[] = {
    "probe_t_min_s",   "probe_t_rail_s",   "probe_t_max_s",    "probe_bound_s",
    "probe_max_at_bound", "probe_t_diode_s", "probe_e_diode_j", "probe_t_valley_s",
    "probe_v_valley_v", "t_dead_optimal_s", "e_dead_optimal_j"};

/// The set dead time against the criterion stretch of a window (see
/// zvs_timing_margin_* above): `early` = t_on - t_a, `late` = t_b - t_on.
struct TimingMargins {
  double early = std::numeric_limits<double>::quiet_NaN();
  double late = std::numeric_limits<double>::quiet_NaN();
};

/// The timing margins of a turn-on at `t_on` against the stretches of
/// [t_off, t_end] in which `vds` (sampled at `t`) is at most `limit`: the
/// stretch holding t_on, else the last one that ends before it, else the
/// first after it; `late` NaN when that stretch is still open at t_end.
TimingMargins CriterionTiming(const std::vector<double>& t, const std::vector<double>& vds,
                              double limit, double t_off, double t_on, double t_end);

/// Measures an edge found by FindEdges (see the definitions above).
EdgeMeasurement MeasureEdge(const CellSpec& cell, const Waveforms& waves, const EdgeTiming& timing,
                            const ZvsCriterion& criterion, const EdgeParams& params = EdgeParams());

/// The drain-source voltage of the incoming switch over the whole data.
std::vector<double> IncomingSwitchVoltage(const CellSpec& cell, const Waveforms& waves,
                                          bool incoming_high);

}  // namespace zvsmap
