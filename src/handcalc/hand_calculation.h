// The hand calculation of one point: the template's built-in model and the
// sweep file's own <predict> formulas, and how they are set beside the
// simulated edge metrics.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "core/expression.h"
#include "handcalc/topology_model.h"
#include "netlist/template.h"
#include "result/edge_metrics.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// The predictions for one commutation cell, built-in first, then the sweep
/// file's in file order.
struct CellCalculation {
  std::string cell;
  std::vector<Prediction> predictions;
  /// The prediction called `name`, or nullptr.
  const Prediction* Find(const std::string& name) const;
};

/// Everything predicted for one point.
struct HandCalculation {
  std::string model;                   ///< the template's `*@ model`, or "" (sweep formulas only)
  std::string assumptions;             ///< the model's assumptions, one line
  std::vector<CellCalculation> cells;  ///< one per template cell, in template order
};

/// Computes the hand calculation of one point from its resolved template
/// parameters (lower-case keys, see ResolveParams). Names in <predict>
/// expressions match parameters and predictions case-insensitively, as SPICE
/// names do. A value the model cannot give (NaN) makes every expression that
/// uses it NaN, without an error. Fails on an unknown model, a missing model
/// input, an unknown name in an expression (file:line, column, did-you-mean)
/// or a non-finite result (division by zero); `out` then still holds every
/// prediction that could be computed (the failed ones NaN).
bool ComputeHandCalculation(const SweepSpec& spec, const Template& tmpl, const Variables& resolved,
                            HandCalculation* out, Diagnostic* error);

/// Appends, to each measured edge, its predictions as typed comparisons
/// (EdgeMeasurement::comparisons; the CSV shows them as the columns of
/// FlatColumns). A prediction paired with metric M gets tag "pred" (the
/// built-in model's; a model may give its own tag, a <predict> uses its own
/// name), the difference simulated - predicted, the relative difference
/// diff / |predicted| (NaN when the prediction is 0) and whether it is beyond
/// its tolerance (empty when nothing was predicted). The metric "zvs_full" is
/// the simulated ZVS class as a number (1 full, 0 partial or hard); the
/// built-in model pairs its charge-based ZVS verdict with it as tag "pred" and
/// its energy-based one as "pred_energy". A <predict> without `compare` is an
/// unpaired comparison under its own name (on its edge, or every edge of its
/// cell without `edge`). Returns false with the first problem of
/// ComputeHandCalculation (the comparisons are still added, NaN where the
/// calculation failed).
bool AddPredictionMetrics(const SweepSpec& spec, const Template& tmpl, const Variables& resolved,
                          std::vector<EdgeMeasurement>* edges, Diagnostic* error);

/// The comparisons AddPredictionMetrics adds, from a hand calculation already
/// computed for the point (ComputeHandCalculation), appended to each edge.
void AddComparisons(const HandCalculation& calc, std::vector<EdgeMeasurement>* edges);

/// The simulated value a prediction pairs with: the edge's metric `metric`,
/// or for "zvs_full" 1 when the edge's ZVS class is full, else 0.
double SimulatedValue(const EdgeMeasurement& edge, const std::string& metric);

/// Checks before any simulation that the template's model exists and gets its
/// inputs, and that every <predict> expression can be evaluated at the first
/// point (unknown names, division by zero there). Returns the problems found.
std::vector<Diagnostic> CheckPredictions(const SweepSpec& spec, const Template& tmpl,
                                         const std::vector<Point>& points);

}  // namespace zvsmap
