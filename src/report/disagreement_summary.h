// The run summary's view of the hand calculation: where it disagrees most
// with the simulation.
#pragma once

#include <string>
#include <vector>

#include "result/point_result.h"
#include "sweep/point.h"

namespace zvsmap {

/// Text lines (no trailing newline) listing, for the `max_pairs` prediction
/// pairs (cell, edge, paired Comparison from AddPredictionMetrics) with the
/// largest relative difference, that difference, the point where it occurs
/// and at how many points the pair is beyond its tolerance. Empty when no
/// point carries a paired prediction. `results[i]` belongs to `points[i]`.
std::vector<std::string> DisagreementSummary(const std::vector<Point>& points,
                                             const std::vector<PointResult>& results,
                                             size_t max_pairs = 5);

}  // namespace zvsmap
