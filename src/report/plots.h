// Plots of a sweep as SVG files, written without a display: a ZVS map per
// edge for 2-D sweeps, metric-versus-parameter curves for 1-D sweeps.
#pragma once

#include <string>
#include <vector>

#include "report/report_set.h"
#include "report/zvs_boundary.h"

namespace zvsmap {

/// A plot to write: its file name (inside the report folder), a caption and
/// the SVG text.
struct Plot {
  std::string file;
  std::string caption;
  std::string svg;
};

/// A map of `key` over dimensions `x_dim` and `y_dim` of the grid, the other
/// dimensions held at `fixed` (positions; entries for x_dim, y_dim ignored):
/// one rectangle per point coloured by ZVS class (grey: did not run), the
/// margin printed in each cell when there is room, and the class boundary
/// drawn as thick line segments at the located boundary values.
Plot ZvsMapPlot(const ReportBasis& input, const EdgeKey& key, size_t x_dim, size_t y_dim,
                const std::vector<int>& fixed);

/// A curve of metric `column` of `key` along dimension `dim` (others held at
/// `fixed`), markers coloured by ZVS class; when the results carry
/// `column + "__pred"` the hand-calculation prediction is overlaid dashed.
/// `column` "zvs_margin" means the summary's margin (ReportBasis::margin).
Plot MetricCurvePlot(const ReportBasis& input, const EdgeKey& key, size_t dim,
                     const std::vector<int>& fixed, const std::string& column);

/// The plots for this sweep: with two swept dimensions one map per edge; with
/// more, one map per edge for each combination of the further dimensions (at
/// most 16 per edge); with one, curves per edge of zvs_margin, v_turn_on_v,
/// i_commutated_a, t_transition_s and (if measured) t_zvs*. None otherwise.
std::vector<Plot> MakePlots(const ReportBasis& input);

}  // namespace zvsmap
