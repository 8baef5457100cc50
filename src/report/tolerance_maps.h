// Maps of what the tolerance variants say (README "Tolerances and yield"):
// per nominal point and edge the ZVS yield over the Monte Carlo samples, and
// the worst-case energy and timing margins over the corners, drawn over the
// swept axes like the class map. WriteReports draws them whenever the sweep
// has a <tolerances> block.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "report/plots.h"
#include "report/report_set.h"

namespace zvsmap {

/// What a tolerance map shows.
enum class ToleranceView {
  kYield,        ///< EdgeTolerance::yield, in bands (YieldBand)
  kWorstEnergy,  ///< EdgeTolerance::worst_energy_margin, diverging around 0
  kWorstTiming,  ///< EdgeTolerance::worst_timing_margin_s, diverging around 0
};

/// A band of the yield map's colour scale: yields from `low` (inclusive) up
/// to the next band's low.
struct YieldBand {
  double low;
  const char* colour;
  const char* label;
};

/// The yield map's bands, highest first: >= 99 %, 95-99 %, 90-95 %, 50-90 %,
/// below 50 %.
const std::vector<YieldBand>& YieldBands();

/// The band colour of `yield` (NaN: the "not measured" grey).
std::string YieldColour(double yield);

/// "yield_", "worst_energy_", "worst_timing_": the start of the view's file names.
const char* ToleranceViewStem(ToleranceView view);

/// No second dimension: the map is one row (a sweep with one swept axis).
constexpr size_t kOneRow = std::numeric_limits<size_t>::max();

/// A map of `view` for edge `key` over dimensions `x_dim` and `y_dim` (or one
/// row), the other dimensions held at `fixed`: one rectangle per nominal point
/// coloured on the view's scale, its value printed in it, a tooltip with the
/// details (the yield's Wilson interval, the samples counted, the worst
/// sample; the corner that gives the worst margin) and the same numbers as
/// data-* attributes (data-point, data-value; for the yield also data-low,
/// data-high, data-passes, data-samples; for margins data-corner), then a
/// legend of the scale. File: STEM CELL_EDGE[_SLICE].svg.
Plot ToleranceMapPlot(const ReportBasis& input, const EdgeKey& key, ToleranceView view,
                      size_t x_dim, size_t y_dim, const std::vector<int>& fixed);

/// The tolerance maps of this sweep (none without a <tolerances> block or
/// without a swept axis): per edge, a yield map when the block draws samples,
/// worst energy and timing margin maps when it runs corners (each only if some
/// point has the value); over the first two swept dimensions (one row for a
/// single swept axis), one map per combination of further dimensions (at most
/// 16 per edge and view).
std::vector<Plot> MakeToleranceMaps(const ReportBasis& input);

}  // namespace zvsmap
