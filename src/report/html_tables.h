// The numbers of index.html: per cell and edge the ZVS boundaries, the worst
// points, the dead-time window and the hand calculation's largest
// disagreements; the failed points; the fixed parameters and settings.
#pragma once

#include <string>
#include <vector>

#include "report/plots.h"
#include "report/report_set.h"

namespace zvsmap {

/// One <section> per measured edge (id "edge-CELL-EDGE") with its tables and,
/// from `plots`, the edge's maps ("map_CELL_EDGE…") and dead-time chart
/// ("deadtime_CELL_EDGE.svg"); `placed` (sized like `plots`) marks the plots
/// shown there. Every number cell carries the raw value in `data-value` (9
/// significant digits, as summary.xml writes them) beside the text with
/// units; operating points carry the point's index, so sorting by them gives
/// the sweep's order. Tables of several rows have class "sortable".
std::string HtmlEdgeSections(const ReportBasis& input, const std::vector<Plot>& plots,
                             std::vector<bool>* placed);

/// One row per measured edge (id "at-a-glance"): at how many points full ZVS
/// holds, the lowest margin and where, the dead time set, the longest window
/// start (the shortest dead time that reaches ZVS wherever it is reached) and
/// the largest hand-calculation difference; "" when no edge was measured.
std::string HtmlAtAGlance(const ReportBasis& input);

/// The failed and unsettled points with their reasons, how settling was
/// attempted and the solver aid the point last ran with (id "failed-points");
/// a sentence when every point ran.
std::string HtmlFailedPoints(const ReportBasis& input);

/// How many points needed each solver aid of the convergence ladder (id
/// "solver-aids"): a sentence, and a table when any aid was used.
std::string HtmlSolverAids(const ReportInput& input);

/// The fixed parameters, the derived ones, the dead-time parameters each cell
/// uses (from the sweep or the template's default) and the simulation
/// settings (id "settings").
std::string HtmlSettings(const ReportInput& input);

/// The recommended dead time per edge (id "recommended-dead-time", one
/// paragraph per edge with id "recommended-CELL-EDGE"): the value, its timing
/// margins and the points binding each side; when no single value serves,
/// the points that empty the intersection and the schedule table; the points
/// where ZVS is impossible. A sentence when the results carry no probe window.
/// (html_dead_time.cc)
std::string HtmlRecommendedDeadTime(const ReportBasis& input);

/// A number cell as every table writes it: text with units, the raw value
/// in data-value ("n/a" and an empty data-value for NaN).
std::string HtmlNumberCell(double value, const std::string& unit);

/// The point-number and operating-point cells of point `i`'s row.
std::string HtmlPointCells(const ReportInput& input, const Grid& grid, size_t i);

}  // namespace zvsmap
