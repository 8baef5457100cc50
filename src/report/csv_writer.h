// edges.csv: one row per point and edge (see README "Outputs").
#pragma once

#include <ostream>
#include <string>
#include <vector>

#include "result/point_result.h"
#include "sweep/point.h"

namespace zvsmap {

/// Quotes a CSV field per RFC 4180 when it holds a comma, quote, CR or LF.
std::string CsvField(const std::string& text);

/// Formats a metric for CSV: %.9g, empty for NaN.
std::string CsvNumber(double value);

/// Writes the edge table. `results[i]` must belong to `points[i]`; rows come
/// in point order, edges in the order measured. Columns: point (then
/// refine_round, the round that added it, when the sweep is refined), every
/// parameter, cell, edge, zvs_class, every metric, then every comparison's
/// FlatColumns (each the union over rows, first appearance order), status,
/// reason, wall_time_s (the only timing column). The only writer that turns
/// comparisons into columns.
/// A point without edges (failed) gets one row with empty edge and metrics.
void WriteEdgesCsv(std::ostream& out, const std::vector<Point>& points,
                   const std::vector<PointResult>& results);

}  // namespace zvsmap
