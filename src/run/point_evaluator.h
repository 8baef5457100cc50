// The per-point pipeline: render -> simulate -> find and measure edges.
#pragma once

#include <string>

#include "analysis/edge_finder.h"
#include "core/diagnostic.h"
#include "handcalc/hand_calculation.h"
#include "netlist/device_models.h"
#include "netlist/render.h"
#include "netlist/template.h"
#include "result/point_result.h"
#include "run/sweep_setup.h"
#include "sim/simulator.h"
#include "sim/steady_state.h"
#include "sim/solver_aids.h"
#include "sim/waveforms.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// One measured edge as the evaluator found it in the settled periods.
struct FoundEdge {
  size_t cell = 0;    ///< index into Template::cells
  EdgeTiming timing;  ///< the commutation instants the edge was measured at
};

/// Everything one evaluation of a point knows, for the callers that need more
/// than the result (waveform export, `zvsmap explain`): nothing here has to be
/// computed again.
struct PointEvaluation {
  PointResult result;
  bool resolved = false;  ///< parameters and period resolved (else `error` says why)
  Diagnostic error;       ///< why the point could not be resolved
  Variables params;       ///< every template parameter resolved (see ResolveParams)
  double period_s = 0;    ///< the switching period
  bool hand_ok = false;   ///< the hand calculation succeeded (else `hand_error`)
  HandCalculation hand;   ///< the point's hand calculation (NaN where it failed)
  Diagnostic hand_error;
  std::vector<FoundEdge> edges;  ///< one per result.edges entry, same order (ok points)
  Waveforms settled;             ///< the measured periods, when asked for and ok
  /// Input to Simulate: the warm start from the chain predecessor
  /// (run/chain_memory.h), or null for a cold start. Used only when the
  /// sweep's <simulation warm-start> is on.
  const WarmStart* warm_start = nullptr;
};

/// The run a point is measured in, from its settled state: `lead` periods,
/// the measured period (its edges are those whose turn-off command falls in
/// [lead, lead + 1) periods), then the longest declared dead time and two
/// edge guards, so that the period's last edge is complete.
struct MeasuredRun {
  double periods = 0;  ///< the run's length in periods (kPeriodOverrun added on top)
  double lead = 0;     ///< the measured period starts at lead periods
};

/// The measured run of a resolved point with period `period_s` (its lead:
/// MeasureLead, netlist/template.h).
MeasuredRun MeasuredRunFor(const SweepSpec& spec, const Template& tmpl,
                           const Variables& resolved, double period_s);

/// Evaluates points of one sweep. Holds no simulator: the caller passes the
/// one its process owns (a worker's ngspice, or a fake in tests).
class PointEvaluator {
 public:
  /// Reads the sweep's <device> model files (PrepareSweep has checked them;
  /// a device that fails here makes each point using it fail with the reason).
  PointEvaluator(const SweepSpec& spec, const Template& tmpl);

  /// Evaluates the points of a prepared sweep with the device models
  /// PrepareSweep resolved and checked (nothing is read again). `sweep` must
  /// outlive the evaluator.
  explicit PointEvaluator(const PreparedSweep& sweep);

  /// Renders the point's netlist as it will be simulated (also for the user
  /// to run in plain ngspice). Fails when a parameter cannot be evaluated.
  bool Render(const Point& point, std::string* netlist, Diagnostic* error) const;

  /// The point's assembled deck (Render's text, each line with its origin).
  bool RenderPointDeck(const Point& point, Deck* deck, Diagnostic* error) const;

  /// Runs the whole per-point pipeline. Never throws for bad circuits: the
  /// result's status and reason say what went wrong. When `settled` is not
  /// null it receives the measured periods' waveforms (for plots and checks).
  PointResult Evaluate(const Point& point, Simulator& simulator,
                       Waveforms* settled = nullptr) const;

  /// Evaluate from `warm` (null: cold, as Evaluate). The result's
  /// SettleRecord holds what the chain successor's warm start needs (the
  /// settled unknowns and, shooting, the Jacobian; ChainMemory reads it).
  PointResult EvaluateWarm(const Point& point, Simulator& simulator,
                           const WarmStart* warm) const;

  /// Resolves the point's parameters and period and computes its hand
  /// calculation, without simulating. False when the point cannot be
  /// resolved (`out->error`); a failed hand calculation only clears hand_ok.
  bool Prepare(const Point& point, PointEvaluation* out) const;

  /// Simulates and measures a point Prepare has filled (`ev`), reusing its
  /// resolution and hand calculation: fills result and edges, and `settled`
  /// when `keep_waveforms`. A point Prepare failed on gets a failed result.
  void Simulate(const Point& point, Simulator& simulator, bool keep_waveforms,
                PointEvaluation* ev) const;

  /// Prepare + Simulate.
  PointEvaluation EvaluateFully(const Point& point, Simulator& simulator,
                                bool keep_waveforms) const;

  /// The transient settings used for a resolved point with period `period_s`.
  TranSettings TranFor(const Variables& resolved, double period_s) const;

 private:
  /// One attempt at the whole pipeline with `simulator`'s solver aid (the
  /// ladder in Evaluate calls it once per rung).
  PointResult EvaluateOnce(const Point& point, AidedSimulator& simulator, PointEvaluation* ev,
                           bool keep_waveforms) const;
  /// Finds and measures every cell's edges in the measured run `out`, each in
  /// its first occurrence from `from_s` on, and adds the hand calculation;
  /// false (with the reason in `result`) on a missing edge.
  bool MeasureCells(const SimulationOutput& out, double from_s, PointEvaluation* ev,
                    PointResult* result) const;
  /// The probe runs of every measured edge (run/edge_probe.cc), from the
  /// settled start-of-period state `values_at_x` (the point's values with the
  /// slow states' init parameters set): fills each edge's window metrics and
  /// curve; a probe that fails leaves them NaN and adds its reason to
  /// `result->reason` (the point stays ok).
  void ProbeEdges(const Point& point, const std::vector<ParamValue>& values_at_x,
                  Simulator& simulator, const PointEvaluation& ev, PointResult* result) const;
  /// One edge's probe run and analysis; false with `why` when it could not run.
  bool ProbeEdge(const Point& point, const std::vector<ParamValue>& values_at_x,
                 Simulator& simulator, const FoundEdge& found, const PointEvaluation& ev,
                 EdgeMeasurement* edge, std::string* why) const;
  /// RenderDeck plus the point's switch models (ApplyDevicesToDeck).
  bool RenderFor(const Point& point, const Variables& resolved, const TranSettings& tran,
                 Deck* deck, std::string* why) const;

  const SweepSpec& spec_;
  const Template& tmpl_;
  std::vector<ResolvedDevice> devices_;
  std::string devices_error_;
};

}  // namespace zvsmap
