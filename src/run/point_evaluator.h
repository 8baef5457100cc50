// The per-point pipeline: render -> simulate -> find and measure edges.
#pragma once

#include <string>

#include "core/diagnostic.h"
#include "netlist/device_models.h"
#include "netlist/render.h"
#include "netlist/template.h"
#include "result/point_result.h"
#include "run/sweep_setup.h"
#include "sim/simulator.h"
#include "sim/solver_aids.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

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

  /// The transient settings used for a resolved point with period `period_s`.
  TranSettings TranFor(const Variables& resolved, double period_s) const;

 private:
  /// One attempt at the whole pipeline with `simulator`'s solver aid (the
  /// ladder in Evaluate calls it once per rung).
  PointResult EvaluateOnce(const Point& point, AidedSimulator& simulator, Waveforms* settled) const;
  /// RenderDeck plus the point's switch models (ApplyDevicesToDeck).
  bool RenderFor(const Point& point, const Variables& resolved, const TranSettings& tran,
                 Deck* deck, std::string* why) const;

  const SweepSpec& spec_;
  const Template& tmpl_;
  std::vector<ResolvedDevice> devices_;
  std::string devices_error_;
};

}  // namespace zvsmap
