// Probe runs: for each measured edge, one more run from the settled
// start-of-period state with the incoming switch's turn-on withheld, giving
// the edge's dead-time window (analysis/dead_time_window.h). A probe never
// changes the settled state or the measured run; one that fails leaves its
// metrics NaN and says why on the point, which stays ok.
#include <cmath>

#include "analysis/commutation.h"
#include "analysis/dead_time_window.h"
#include "netlist/cell_vectors.h"
#include "netlist/command_hold.h"
#include "run/point_evaluator.h"
#include "sim/engine_messages.h"

namespace zvsmap {

namespace {

// The probe's bound stays this far (in periods) short of the incoming command's
// own turn-off, and the run goes this far past the bound (tstop off any edge).
constexpr double kBoundMarginPeriods = 0.02;
constexpr double kProbeOverrunPeriods = 0.005;

}  // namespace

bool PointEvaluator::ProbeEdge(const Point& point, const std::vector<ParamValue>& values_at_x,
                               Simulator& simulator, const FoundEdge& found, const PointEvaluation& ev,
                               EdgeMeasurement* edge, std::string* why) const {
  const CellSpec& cell = tmpl_.cells[found.cell];
  const EdgeTiming& e = found.timing;
  const double period = ev.period_s;
  const double t_dead = e.t_on_s - e.t_off_s;
  if (!(t_dead > 0)) {
    *why = "no dead time before the turn-on (nothing to withhold)";
    return false;
  }
  // The edge's place in the period (the measured run starts at a period start).
  const double t_off = e.t_off_s - std::floor(e.t_off_s / period) * period;
  // The incoming command's own turn-off: from the measured run, or from the
  // period before when the run ends first (the run's last edge).
  const double until = std::isnan(e.conduction_s) ? e.t_end_s : e.t_on_s + e.conduction_s;
  const double bound = std::min(until - e.t_off_s, period) - kBoundMarginPeriods * period;
  if (!(bound > 0)) {
    *why = "the incoming command's interval is too short to probe";
    return false;
  }
  Variables resolved;
  Diagnostic d;
  if (!ResolveParams(tmpl_, values_at_x, &resolved, &d)) {
    *why = d.Format();
    return false;
  }
  TranSettings tran = TranFor(resolved, period);
  tran.tstart_s = 0;
  tran.tstop_s = t_off + bound + kProbeOverrunPeriods * period;
  Deck deck;
  if (!RenderFor(point, resolved, tran, &deck, why) ||
      !HoldCommandOff(&deck, e.incoming_high ? cell.high_cmd : cell.low_cmd, t_off, why)) {
    return false;
  }
  SimulationOutput out = simulator.Run(deck.Text(), VectorsToSave(tmpl_), tran.tstop_s);
  if (!out.ok) {
    *why = MapEngineLines(out.error, deck);
    return false;
  }
  ProbeInput in;
  in.incoming_high = e.incoming_high;
  in.t_off_hint_s = t_off;
  in.bound_s = bound;
  in.limit_v = edge->Get("v_residual_limit_v");
  in.rail_v = edge->Get("rail_v");
  in.t_dead_s = t_dead;
  in.coss_f = EdgeParamsFor(cell, ev.params).coss_f;
  DeadTimeWindow window;
  if (!AnalyseProbe(cell, out.waves, in, &window, why)) return false;
  ApplyDeadTimeWindow(window, edge);
  return true;
}

void PointEvaluator::ProbeEdges(const Point& point, const std::vector<ParamValue>& values_at_x,
                                Simulator& simulator, const PointEvaluation& ev,
                                PointResult* result) const {
  for (size_t i = 0; i < ev.edges.size() && i < result->edges.size(); ++i) {
    std::string why;
    EdgeMeasurement* edge = &result->edges[i];
    if (ProbeEdge(point, values_at_x, simulator, ev.edges[i], ev, edge, &why)) continue;
    std::string note = "probe " + edge->cell + "." + edge->edge + ": " + why;
    result->reason = result->reason.empty() ? note : result->reason + "; " + note;
  }
}

}  // namespace zvsmap
