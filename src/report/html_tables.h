// The numbers of index.html: per cell and edge the ZVS boundaries, the worst
// points, the dead-time window and the hand calculation's largest
// disagreements; the failed points; the fixed parameters and settings.
#pragma once

#include <string>

#include "report/report_set.h"

namespace zvsmap {

/// One <section> per measured edge (id "edge-CELL-EDGE") with its tables.
/// Every number cell carries the raw value in `data-value` (9 significant
/// digits, as summary.xml writes them) beside the text with units.
std::string HtmlEdgeSections(const ReportBasis& input);

/// The failed and unsettled points with their reasons and how settling was
/// attempted (id "failed-points"); a sentence when every point ran.
std::string HtmlFailedPoints(const ReportInput& input);

/// The fixed parameters, the derived ones, the dead-time parameters each cell
/// uses (from the sweep or the template's default) and the simulation
/// settings (id "settings").
std::string HtmlSettings(const ReportInput& input);

/// The slot for the recommended dead time or schedule (id
/// "recommended-dead-time"): filled by the dead-time analysis when it exists.
std::string HtmlRecommendedDeadTime(const ReportInput& input);

}  // namespace zvsmap
