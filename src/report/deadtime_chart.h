// The dead-time chart of each edge: the measured window (shortest dead time
// that reaches ZVS, longest before ring-back) as a band over the first swept
// axis, one band per value of the second, with the dead time set drawn across.
#pragma once

#include <vector>

#include "report/plots.h"
#include "report/report_set.h"

namespace zvsmap {

/// One chart per measured edge ("deadtime_CELL_EDGE.svg") when the results
/// carry the window's start column (see FindWindowColumns) and the sweep has
/// a swept axis; further swept axes are held at their first value. A window
/// end that was not reached within the dead time leaves the band open
/// (drawn up to the dead time set, marked; with the probe's window, up to
/// its bound). A band never bridges a position without a window: a lone
/// window is a bar; a failed point (or one that did not measure the edge) is
/// a cross on the x axis, a point without a window a triangle. The
/// envelope's recommended dead time (input.envelope: the value of the
/// schedule bin holding each point) is drawn solid.
std::vector<Plot> DeadTimeCharts(const ReportBasis& input);

}  // namespace zvsmap
