// The ZVS region of a sweep as a grid: where each point sits, which margin
// measures ZVS, and where along each axis the class changes.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "result/point_result.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// One grid dimension: a plain axis, or a lockstep group (labelled by its
/// first axis; `also` names the others that move with it), or a device axis
/// (labelled by its switch roles, "leg.high leg.low"; values 0, 1, ... index
/// `labels`, the device names).
struct GridDim {
  std::string param;
  std::vector<std::string> also;
  std::vector<double> values;
  std::vector<std::string> labels = {};
  /// A device axis: its values name devices, not numbers.
  bool Categorical() const { return !labels.empty(); }
};

/// A cell's edge as the reports group measurements ("leg", "high_on").
struct EdgeKey {
  std::string cell;
  std::string edge;
  /// "leg.high_on".
  std::string Label() const { return cell + "." + edge; }
  bool operator==(const EdgeKey& o) const { return cell == o.cell && edge == o.edge; }
};

/// The margin the summary, the plots and `metric="zvs_margin"` use: the energy
/// margin column (name starting "zvs_energy_margin", else "zvs_margin") when
/// the results have one, else v_residual_limit_v - v_turn_on_v (volts).
/// What a positive value means depends on the source (`positive_means`): the
/// energy margin says the current's energy can bring the node to the rail at
/// some dead time (it does not see the set one); the voltage difference says
/// the turn-on was within the criterion.
struct MarginSource {
  std::string column;          ///< the column used, or "" for the voltage difference
  std::string description;     ///< e.g. "v_residual_limit_v - v_turn_on_v"
  std::string unit;            ///< "V", or "" when read from a column (unit in its name)
  std::string label;           ///< short name for plots, e.g. "energy margin (any dead time)"
  std::string positive_means;  ///< what a value >= 0 says, for summary.xml
};

/// The sweep's grid and each point's place on it.
struct Grid {
  std::vector<GridDim> dims;             ///< in file order (the first varies slowest)
  std::vector<std::vector<int>> coords;  ///< per entry of input.points; -1 when off the grid
  /// Dimensions with more than one value.
  std::vector<size_t> SweptDims() const;
  /// Steps `*at` to the next combination of positions on the dimensions
  /// `held` (a mixed-radix count, the first of `held` fastest); false when
  /// every combination has been visited (`*at` is then back at the first).
  bool NextSlice(const std::vector<size_t>& held, std::vector<int>* at) const;
};

/// Builds the grid from the sweep's axis groups. A point's position is the
/// one it got from ExpandSweep (Point::grid); a point without one (built by
/// hand) is placed at the axis value closest to its value.
Grid BuildGrid(const SweepSpec& spec, const std::vector<Point>& points);

/// Every (cell, edge) measured in `results`, in order of first appearance.
std::vector<EdgeKey> MeasuredEdges(const std::vector<PointResult>& results);

/// The measurement of `key` in `result`, or nullptr.
const EdgeMeasurement* FindEdge(const PointResult& result, const EdgeKey& key);

/// The first measured metric column in `results` whose name starts with
/// `prefix` (names holding "__" are hand-calculation columns and skipped), or "".
std::string FindColumnWithPrefix(const std::vector<PointResult>& results,
                                 const std::string& prefix);

/// The metric columns that hold the measured dead-time window of an edge:
/// the probe's probe_t_min_s and probe_t_max_s when the results carry both;
/// else its start (the shortest dead time that reaches ZVS; the first column
/// starting "t_dead_min", "t_clamp" or "t_zvs", in that preference) and its
/// end (the longest before ring-back; "t_dead_max", "t_ringback" or
/// "t_ring_back"). Columns with "__" (hand calculation) are never taken.
/// Either is "" when the results have no such column.
struct WindowColumns {
  std::string start;
  std::string end;
  bool found() const { return !start.empty() && !end.empty(); }
};

/// Looks up the dead-time window columns in `results`.
WindowColumns FindWindowColumns(const std::vector<PointResult>& results);

/// Chooses the margin for these results (see MarginSource).
MarginSource ChooseMargin(const std::vector<PointResult>& results);

/// The margin of one measurement, NaN when not measured.
double MarginOf(const EdgeMeasurement& m, const MarginSource& source);

/// Where the ZVS class of an edge changes between two neighbouring points of
/// one dimension, the other dimensions held at `at` (positions, -1 for the
/// dimension itself).
struct Boundary {
  size_t dim = 0;
  double value = 0;  ///< the located boundary
  double lower = 0;  ///< the neighbouring sampled axis values it lies between
  double upper = 0;
  bool interpolated = false;  ///< true: zero of the margin, interpolated linearly;
                              ///< false: the margins do not change sign, midpoint taken
  bool zvs_above = false;     ///< full ZVS on the `upper` side
  std::vector<int> at;        ///< positions of every dimension, -1 for `dim`
  double position = 0;        ///< `value` in index units along `dim` (for plotting)
};

/// Every class change of `key` (full versus not full) between neighbouring
/// points that both ran (status ok) and both measured the edge, along the
/// numeric dimensions (not between two devices of a device axis). Neighbours
/// are consecutive points of a line (the other positions equal), so on a
/// sparse set (adaptive refinement) the boundary is located between the
/// nearest sampled points; on a full grid they are the next values.
std::vector<Boundary> FindBoundaries(const Grid& grid, const std::vector<PointResult>& results,
                                     const EdgeKey& key, const MarginSource& margin);

}  // namespace zvsmap
