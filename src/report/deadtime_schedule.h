// deadtime_schedule.csv: the envelope's dead time per bin of the swept
// parameters, a table a digital controller can hold (see README "Dead time
// across the envelope").
#pragma once

#include <ostream>
#include <string>

#include "report/report_set.h"

namespace zvsmap {

/// Writes one row per cell, edge and schedule bin of `input.envelope`:
/// cell, edge, bin (0-based, row-major over the swept parameters), for each
/// swept parameter P the columns P_from and P_to (grid values; a device axis
/// gives device names), points, impossible, single_value (1: one dead time
/// serves the bin), t_dead_earliest_s, t_dead_latest_s, late_end
/// ("ring-back" or "probe-bound"), t_dead_recommended_s, choice,
/// timing_margin_early_s, timing_margin_late_s, early_point, late_point
/// (the points binding each end). Writes nothing when the envelope is not
/// available.
void WriteDeadTimeScheduleCsv(std::ostream& out, const ReportBasis& input);

/// "Vin 48 V – 72 V" (one value: "Vin 35 V"; a device axis: its names).
std::string DescribeSpan(const Grid& grid, const ScheduleBin::Span& span);

}  // namespace zvsmap
