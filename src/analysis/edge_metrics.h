// What the commutation analysis reports for one edge.
#pragma once

#include <string>
#include <vector>

namespace zvsmap {

/// ZVS class of a turn-on, by the sweep's criterion (see README "ZVS class").
enum class ZvsClass { kFull, kPartial, kHard, kUnknown };

/// "full", "partial", "hard", "unknown".
const char* ZvsClassName(ZvsClass c);

/// One named measurement; the name is the CSV column and carries its unit
/// (e.g. "t_transition_s"). NaN means "not reached / not applicable".
struct Metric {
  std::string column;
  double value = 0;
};

/// The metric columns MeasureEdge writes for every edge, in output order
/// (definitions in analysis/commutation.h). Requirements and predictions may
/// name these, plus "zvs_margin" and "zvs_full" and the hand calculation's
/// paired columns.
const std::vector<std::string>& EdgeMetricColumns();

/// The measurements of one commutation edge (a turn-off command of one switch
/// followed by the turn-on command of the other).
struct EdgeMeasurement {
  std::string cell;   ///< cell name from the template
  std::string edge;   ///< "high_on" (node rises) or "low_on" (node falls)
  ZvsClass zvs = ZvsClass::kUnknown;
  std::string criterion;  ///< the ZVS criterion the class was judged by, e.g. "v_turn_on <= 10% of rail"
  std::vector<Metric> metrics;  ///< in a fixed order (see commutation.h)

  /// The value of a metric by column name, or NaN.
  double Get(const std::string& column) const;
};

}  // namespace zvsmap
