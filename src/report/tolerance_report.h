// What the tolerance variants of each nominal point say (README "Tolerances
// and yield"): per edge the worst-case margins over the corners and which
// corner gives each, and the ZVS yield over the Monte Carlo samples with its
// Wilson score interval and the worst sample.
#pragma once

#include <cstddef>
#include <limits>
#include <ostream>
#include <string>
#include <vector>

#include "core/statistics.h"
#include "report/zvs_boundary.h"
#include "result/point_result.h"
#include "sweep/point.h"
#include "sweep/tolerance_spec.h"

namespace zvsmap {

/// One edge of one nominal point over its variants.
struct EdgeTolerance {
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  EdgeKey key;
  int corners = 0;                    ///< corners that measured the edge
  double worst_energy_margin = kNaN;  ///< least zvs_energy_margin over the corners
  std::string worst_energy_corner;    ///< e.g. "L+ Coss-" (DescribeCorner)
  /// Least of zvs_timing_margin_early_s and _late_s over the corners.
  double worst_timing_margin_s = kNaN;
  std::string worst_timing_corner;
  int samples = 0;              ///< samples that measured the edge
  int passes = 0;               ///< of those, passing (ToleranceSpec::pass)
  int unmeasured = 0;           ///< samples that failed, did not run or lack the edge
  double yield = kNaN;          ///< passes / samples
  ProportionInterval interval;  ///< Wilson score interval at the block's confidence
  int worst_sample = -1;        ///< the sample with the least margin (MarginOf), -1 if none
  double worst_sample_margin = kNaN;
};

/// One nominal point and its edges.
struct PointTolerance {
  size_t nominal = 0;  ///< the nominal point's index
  const Point* point = nullptr;
  std::vector<EdgeTolerance> edges;
  const EdgeTolerance* Find(const std::string& cell, const std::string& edge) const;
};

/// Every nominal point that has variants among the input, in index order.
struct ToleranceSummary {
  bool used = false;
  double confidence = 0.95;
  ToleranceSpec::Pass pass = ToleranceSpec::Pass::kClass;
  MarginSource margin;  ///< what ranks the samples
  std::vector<PointTolerance> points;
  const PointTolerance* Find(size_t nominal) const;
};

/// Summarizes the variants among `points` (results[i] belongs to points[i])
/// by their nominal point. `margin` ranks the samples (the worst sample).
ToleranceSummary SummarizeTolerances(const ToleranceSpec& spec, const std::vector<Point>& points,
                                     const std::vector<PointResult>& results,
                                     const MarginSource& margin);

/// tolerance.csv: one row per nominal point and edge, the nominal point's
/// parameters first.
void WriteToleranceCsv(std::ostream& out, const ToleranceSummary& summary);

/// Whether a sample's edge passes: class full (kClass), or zvs_energy_margin
/// >= 0 (kEnergy). NaN margin: false.
bool SamplePasses(const EdgeMeasurement& e, ToleranceSpec::Pass pass);

}  // namespace zvsmap
