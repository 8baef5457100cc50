#include "report/zvs_boundary.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>

namespace zvsmap {

std::vector<size_t> Grid::SweptDims() const {
  std::vector<size_t> out;
  for (size_t d = 0; d < dims.size(); ++d) {
    if (dims[d].values.size() > 1) out.push_back(d);
  }
  return out;
}

bool Grid::NextSlice(const std::vector<size_t>& held, std::vector<int>* at) const {
  for (size_t d : held) {
    if (++(*at)[d] < static_cast<int>(dims[d].values.size())) return true;
    (*at)[d] = 0;
  }
  return false;
}

namespace {

// A dimension per axis group: a device axis is labelled by its roles and its
// values are the device indices (its names in `labels`).
GridDim DimOf(const AxisGroup& group) {
  GridDim dim;
  const AxisSpec& first = group.axes.front();
  dim.values = first.values;
  if (!first.device_roles.empty()) {
    for (const std::string& role : first.device_roles) {
      dim.param += (dim.param.empty() ? "" : " ") + role;
    }
    dim.labels = first.device_names;
  } else {
    dim.param = first.param;
  }
  for (size_t k = 1; k < group.axes.size(); ++k) dim.also.push_back(group.axes[k].param);
  return dim;
}

// The axis value closest to the point's value on `dim`, or -1 (hand-built
// points without grid positions).
int NearestValue(const Point& point, const GridDim& dim) {
  std::optional<double> v = point.Get(dim.param);
  int best = -1;
  double best_distance = std::numeric_limits<double>::infinity();
  for (size_t k = 0; v && k < dim.values.size(); ++k) {
    double distance = std::fabs(dim.values[k] - *v);
    if (distance < best_distance) {
      best_distance = distance;
      best = static_cast<int>(k);
    }
  }
  return best;
}

}  // namespace

Grid BuildGrid(const SweepSpec& spec, const std::vector<Point>& points) {
  Grid grid;
  std::vector<size_t> group_of;  // the spec group of each dimension
  for (size_t g = 0; g < spec.groups.size(); ++g) {
    if (spec.groups[g].axes.empty()) continue;
    grid.dims.push_back(DimOf(spec.groups[g]));
    group_of.push_back(g);
  }
  for (const Point& point : points) {
    std::vector<int> c;
    bool expanded = point.grid.size() == spec.groups.size();
    for (size_t d = 0; d < grid.dims.size(); ++d) {
      c.push_back(expanded ? point.grid[group_of[d]] : NearestValue(point, grid.dims[d]));
    }
    grid.coords.push_back(std::move(c));
  }
  return grid;
}

std::vector<EdgeKey> MeasuredEdges(const std::vector<PointResult>& results) {
  std::vector<EdgeKey> keys;
  for (const PointResult& r : results) {
    for (const EdgeMeasurement& e : r.edges) {
      EdgeKey key{e.cell, e.edge};
      bool seen = false;
      for (const EdgeKey& k : keys) seen = seen || k == key;
      if (!seen) keys.push_back(key);
    }
  }
  return keys;
}

const EdgeMeasurement* FindEdge(const PointResult& result, const EdgeKey& key) {
  for (const EdgeMeasurement& e : result.edges) {
    if (e.cell == key.cell && e.edge == key.edge) return &e;
  }
  return nullptr;
}

std::string FindColumnWithPrefix(const std::vector<PointResult>& results,
                                 const std::string& prefix) {
  for (const PointResult& r : results) {
    for (const EdgeMeasurement& e : r.edges) {
      for (const Metric& m : e.metrics) {
        // "M__pred" and its companions are hand-calculation columns, not measurements.
        if (m.column.find("__") != std::string::npos) continue;
        if (m.column.compare(0, prefix.size(), prefix) == 0) return m.column;
      }
    }
  }
  return "";
}

WindowColumns FindWindowColumns(const std::vector<PointResult>& results) {
  WindowColumns w;
  // The probe's window (from the settled state, the turn-on withheld) when
  // the results carry both ends; else what the measuring run saw.
  std::string probe_start = FindColumnWithPrefix(results, "probe_t_min");
  std::string probe_end = FindColumnWithPrefix(results, "probe_t_max");
  if (!probe_start.empty() && !probe_end.empty()) return {probe_start, probe_end};
  for (const char* prefix : {"t_dead_min", "t_clamp", "t_zvs"}) {
    if (w.start.empty()) w.start = FindColumnWithPrefix(results, prefix);
  }
  for (const char* prefix : {"t_dead_max", "t_ringback", "t_ring_back"}) {
    if (w.end.empty()) w.end = FindColumnWithPrefix(results, prefix);
  }
  return w;
}

MarginSource ChooseMargin(const std::vector<PointResult>& results) {
  MarginSource source;
  source.column = FindColumnWithPrefix(results, "zvs_energy_margin");
  if (source.column.empty()) source.column = FindColumnWithPrefix(results, "zvs_margin");
  if (source.column.empty()) {
    source.description = "v_residual_limit_v - v_turn_on_v";
    source.unit = "V";
    source.label = "ZVS margin (residual voltage)";
    source.positive_means = "turn-on within the ZVS criterion";
  } else if (source.column.rfind("zvs_energy_margin", 0) == 0) {
    source.description = source.column;
    source.label = "energy margin (any dead time)";
    source.positive_means =
        "the commutated current's energy can bring the node to the rail at some dead time; "
        "the set dead time is not considered (see zvs_timing_margin_early_s and "
        "zvs_timing_margin_late_s)";
  } else {
    source.description = source.column;
    source.label = "ZVS margin";
    source.positive_means = "the column " + source.column + " is at least 0";
  }
  return source;
}

double MarginOf(const EdgeMeasurement& m, const MarginSource& source) {
  if (!source.column.empty()) return m.Get(source.column);
  return m.Get("v_residual_limit_v") - m.Get("v_turn_on_v");
}

std::vector<Boundary> FindBoundaries(const Grid& grid, const std::vector<PointResult>& results,
                                     const EdgeKey& key, const MarginSource& margin) {
  std::map<std::vector<int>, size_t> at_coords;
  for (size_t i = 0; i < grid.coords.size() && i < results.size(); ++i) {
    bool on_grid = true;
    for (int c : grid.coords[i]) on_grid = on_grid && c >= 0;
    if (on_grid) at_coords.emplace(grid.coords[i], i);
  }
  auto measured = [&](size_t i) -> const EdgeMeasurement* {
    if (results[i].status != PointStatus::kOk) return nullptr;
    const EdgeMeasurement* e = FindEdge(results[i], key);
    return e && e->zvs != ZvsClass::kUnknown ? e : nullptr;
  };

  // Neighbours along a dimension are the next point on the same line (the
  // other positions equal): on a full grid the next value, on a refined
  // (sparse) set the nearest sampled one, so the boundary is located at the
  // finest spacing each line has.
  std::vector<std::pair<std::vector<int>, Boundary>> found;  // (lower point's coords, boundary)
  for (size_t d = 0; d < grid.dims.size(); ++d) {
    if (grid.dims[d].Categorical()) continue;  // no boundary between two devices
    const std::vector<double>& values = grid.dims[d].values;
    std::map<std::vector<int>, std::vector<std::pair<int, size_t>>> lines;
    for (const auto& [coords, i] : at_coords) {
      std::vector<int> line = coords;
      line[d] = -1;
      lines[line].emplace_back(coords[d], i);  // ascending: the map is ordered
    }
    for (const auto& [line, members] : lines) {
      for (size_t k = 0; k + 1 < members.size(); ++k) {
        const EdgeMeasurement* a = measured(members[k].second);
        const EdgeMeasurement* b = measured(members[k + 1].second);
        if (!a || !b) continue;
        bool full_a = a->zvs == ZvsClass::kFull, full_b = b->zvs == ZvsClass::kFull;
        if (full_a == full_b) continue;
        int lo = members[k].first, hi = members[k + 1].first;
        Boundary boundary;
        boundary.dim = d;
        boundary.lower = values[lo];
        boundary.upper = values[hi];
        boundary.zvs_above = full_b;
        boundary.at = line;
        double ma = MarginOf(*a, margin), mb = MarginOf(*b, margin);
        // The margin's zero between the two points, by linear interpolation;
        // when the margins do not bracket zero (a criterion that disagrees with
        // the margin, or a margin not measured) the midpoint stands in.
        double t = 0.5;
        if (std::isfinite(ma) && std::isfinite(mb) && ma != mb && (ma >= 0) != (mb >= 0)) {
          t = ma / (ma - mb);
          boundary.interpolated = true;
        }
        boundary.value = boundary.lower + t * (boundary.upper - boundary.lower);
        boundary.position = lo + t * (hi - lo);
        std::vector<int> lower = line;
        lower[d] = lo;
        found.emplace_back(std::move(lower), std::move(boundary));
      }
    }
  }
  // Order: by dimension, then by the lower point's positions, so the output
  // is stable.
  std::sort(found.begin(), found.end(), [](const auto& x, const auto& y) {
    if (x.second.dim != y.second.dim) return x.second.dim < y.second.dim;
    return x.first < y.first;
  });
  std::vector<Boundary> out;
  for (auto& f : found) out.push_back(std::move(f.second));
  return out;
}

}  // namespace zvsmap
