// What the commutation analysis reports for one edge.
#pragma once

#include <string>
#include <vector>

#include "result/comparison.h"
#include "result/dead_time_curve.h"

namespace zvsmap {

/// The metric columns MeasureEdge gives every edge, in output order (defined
/// in commutation.h). The up-front checks of <require metric=...> and
/// <predict compare=...> use this list; a unit test holds MeasureEdge to it.
const std::vector<std::string>& EdgeMetricNames();

/// One named measurement; the name is the CSV column and carries its unit
/// (e.g. "t_transition_s"). NaN means "not reached / not applicable".
struct Metric {
  std::string column;
  double value = 0;
};

/// The measurements of one commutation edge (a turn-off command of one switch
/// followed by the turn-on command of the other).
struct EdgeMeasurement {
  std::string cell;  ///< cell name from the template
  std::string edge;  ///< "high_on" (node rises) or "low_on" (node falls)
  ZvsClass zvs = ZvsClass::kUnknown;
  std::string
      criterion;  ///< the ZVS criterion the class was judged by, e.g. "v_turn_on <= 10% of rail"
  std::vector<Metric> metrics;  ///< in a fixed order (see commutation.h)
  /// The hand calculation beside the metrics (src/handcalc), in prediction order.
  std::vector<Comparison> comparisons = {};
  /// The incoming v_ds against dead time from the edge's probe run (empty
  /// when none ran); the class at any dead time reads off it (ClassAtDeadTime).
  DeadTimeCurve probe_curve = {};

  /// The value of a metric by column name, else of a comparison's CSV column
  /// (see FlatColumns), else NaN.
  double Get(const std::string& column) const;
  /// The comparison of `metric` tagged `tag`, or nullptr.
  const Comparison* FindComparison(const std::string& metric, const std::string& tag) const;
};

}  // namespace zvsmap
