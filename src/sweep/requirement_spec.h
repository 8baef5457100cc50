// Requirements a sweep file declares: what must hold where, checked by the
// reports against every point a requirement covers (see README "Requirements").
#pragma once

#include <limits>
#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {

/// One `<require .../>` element. It names an edge ("cell.edge", or just
/// "edge" for that edge of every cell), optionally restricts itself to the
/// points where `where_expression` is non-zero, and asks exactly one thing:
///   kClass          the edge's ZVS class is at least `min_class`
///                   ("full", or "partial" meaning full or partial);
///   kMetric         the metric column `metric` lies within [min, max]
///                   (either bound may be absent, i.e. NaN); the name
///                   "zvs_margin" means the margin the summary uses;
///   kDeadTimeWindow the edge's dead time (t_dead_s) lies inside the measured
///                   dead-time window (the probe's [probe_t_min_s,
///                   probe_t_max_s] when the results carry it);
///   kGivenDeadTime  the dead time `dead_time_s` (not the one set) lies inside
///                   the probe's window at every point covered.
struct RequirementSpec {
  ///   kYield          (<tolerances>) the edge's ZVS yield over each nominal
  ///                   point's samples is at least `min` (a fraction);
  ///   kWorstMargin    (<tolerances>) the edge's worst-case energy margin
  ///                   over each nominal point's corners is at least `min`.
  enum class Kind { kClass, kMetric, kDeadTimeWindow, kGivenDeadTime, kYield, kWorstMargin };
  Kind kind = Kind::kClass;
  std::string name;       ///< optional label from the file; else "" (see Describe)
  std::string cell;       ///< "" = every cell
  std::string edge;       ///< e.g. "high_on"
  std::string min_class;  ///< kClass: "full" or "partial"
  std::string metric;     ///< kMetric: column name or "zvs_margin"
  double min = std::numeric_limits<double>::quiet_NaN();  ///< kMetric lower bound, NaN = none
  double max = std::numeric_limits<double>::quiet_NaN();  ///< kMetric upper bound, NaN = none
  double dead_time_s = std::numeric_limits<double>::quiet_NaN();  ///< kGivenDeadTime, > 0
  std::string where_expression;                           ///< "" = the whole grid
  std::vector<std::string> where_names;                   ///< the names the expression uses
  SourceLocation where;                                   ///< the <require> element

  /// One line saying what is required, e.g.
  /// "leg.high_on class full where Iout >= 2".
  std::string Describe() const;
};

}  // namespace zvsmap
