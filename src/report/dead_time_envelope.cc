#include "report/dead_time_envelope.h"

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <map>
#include <set>
#include <utility>

namespace zvsmap {

namespace {

bool HasColumn(const EdgeMeasurement& e, const char* column) {
  for (const Metric& m : e.metrics) {
    if (m.column == column) return true;
  }
  return false;
}

// How one point stands for the envelope of an edge.
enum class WindowState { kNone, kUnprobed, kImpossible, kWindow };

WindowState StateOf(const PointResult& r, const EdgeKey& key) {
  if (r.status != PointStatus::kOk) return WindowState::kNone;
  const EdgeMeasurement* e = FindEdge(r, key);
  if (!e) return WindowState::kNone;
  if (!HasColumn(*e, kProbeTMinColumn)) return WindowState::kUnprobed;
  double t_min = e->Get(kProbeTMinColumn), t_max = e->Get(kProbeTMaxColumn);
  if (std::isnan(t_min)) return WindowState::kImpossible;
  if (!std::isfinite(t_min) || !std::isfinite(t_max)) return WindowState::kUnprobed;
  return WindowState::kWindow;
}

// The late end of the point's window is only where the probe stopped.
bool EndsAtBound(const EdgeMeasurement& e) {
  if (HasColumn(e, kProbeMaxAtBoundColumn)) return e.Get(kProbeMaxAtBoundColumn) > 0.5;
  double bound = e.Get(kProbeBoundColumn);
  return std::isfinite(bound) && e.Get(kProbeTMaxColumn) >= bound;
}

void Recommend(const std::vector<PointResult>& results, const std::vector<size_t>& members,
               const EdgeKey& key, WindowIntersection* w) {
  w->choice = DeadTimeChoice::kMidpoint;
  w->recommended = 0.5 * (w->lo + w->hi);
  if (w->hi_at_bound) {
    // No ring-back seen before the probe's bound: the midpoint of [lo, bound]
    // only says where the probe stopped, and every nanosecond past the rail
    // is body-diode conduction. Take the latest loss-optimal dead time
    // instead, so no point turns on before its own optimum.
    double latest = -INFINITY;
    for (size_t i : members) {
      double t = FindEdge(results[i], key)->Get(kLossOptimalColumn);
      if (std::isfinite(t)) latest = std::max(latest, t);
    }
    if (std::isfinite(latest)) {
      w->choice = DeadTimeChoice::kLossOptimal;
      w->recommended = std::clamp(latest, w->lo, w->hi);
    }
  }
  w->margin_early = w->recommended - w->lo;
  w->margin_late = w->hi - w->recommended;
}

// Points with a window, and the rest sorted out, for one edge.
struct Sorted {
  std::vector<size_t> windowed;
  std::vector<ImpossiblePoint> impossible;
  int measured = 0, unprobed = 0;
};

Sorted SortPoints(const std::vector<PointResult>& results, const EdgeKey& key) {
  Sorted s;
  for (size_t i = 0; i < results.size(); ++i) {
    WindowState state = StateOf(results[i], key);
    if (state == WindowState::kNone) continue;
    ++s.measured;
    if (state == WindowState::kUnprobed) ++s.unprobed;
    if (state == WindowState::kWindow) s.windowed.push_back(i);
    if (state == WindowState::kImpossible) {
      const EdgeMeasurement* e = FindEdge(results[i], key);
      s.impossible.push_back(
          {i, e->Get(kProbeValleyTimeColumn), e->Get(kProbeValleyVoltageColumn)});
    }
  }
  return s;
}

std::vector<WindowConflict> Conflicts(const std::vector<PointResult>& results,
                                      const std::vector<size_t>& members, const EdgeKey& key,
                                      const WindowIntersection& all) {
  std::set<std::pair<size_t, size_t>> pairs;
  for (size_t i : members) {
    const EdgeMeasurement* e = FindEdge(results[i], key);
    if (e->Get(kProbeTMinColumn) > all.hi) pairs.insert({i, all.hi_point});
    if (e->Get(kProbeTMaxColumn) < all.lo) pairs.insert({all.lo_point, i});
  }
  std::vector<WindowConflict> out;
  for (const auto& [early, late] : pairs) {
    out.push_back({early, late, FindEdge(results[early], key)->Get(kProbeTMinColumn),
                   FindEdge(results[late], key)->Get(kProbeTMaxColumn)});
  }
  std::stable_sort(out.begin(), out.end(), [](const WindowConflict& a, const WindowConflict& b) {
    return a.t_min - a.t_max > b.t_min - b.t_max;
  });
  return out;
}

// Cuts along each binned dimension: a cut at k separates grid positions
// k - 1 and k.
using Cuts = std::vector<std::vector<int>>;

// The bin of each dimension for `coords`, row-major over the cuts.
size_t BinIndex(const Cuts& cuts, const std::vector<size_t>& dims, const std::vector<int>& coords) {
  size_t index = 0;
  for (size_t k = 0; k < dims.size(); ++k) {
    const std::vector<int>& c = cuts[k];
    size_t b = std::upper_bound(c.begin(), c.end(), coords[dims[k]]) - c.begin();
    index = index * (c.size() + 1) + b;
  }
  return index;
}

size_t BinCount(const Cuts& cuts) {
  size_t n = 1;
  for (const std::vector<int>& c : cuts) n *= c.size() + 1;
  return n;
}

struct Binner {
  const Grid& grid;
  const std::vector<PointResult>& results;
  const EdgeKey& key;
  const std::vector<size_t>& dims;
  std::vector<size_t> on_grid;  // windowed points with a grid position

  std::vector<std::vector<size_t>> Members(const Cuts& cuts) const {
    std::vector<std::vector<size_t>> bins(BinCount(cuts));
    for (size_t i : on_grid) bins[BinIndex(cuts, dims, grid.coords[i])].push_back(i);
    return bins;
  }
  // Points in bins whose intersection is empty.
  size_t Unserved(const Cuts& cuts) const {
    size_t n = 0;
    for (const std::vector<size_t>& m : Members(cuts)) {
      if (!m.empty() && !IntersectWindows(results, m, key).Holds()) n += m.size();
    }
    return n;
  }
  // One cut between the two points that empty the first bin that can be
  // cut; false when none can.
  bool CutOnce(Cuts* cuts) const {
    for (const std::vector<size_t>& m : Members(*cuts)) {
      if (m.empty()) continue;
      WindowIntersection w = IntersectWindows(results, m, key);
      if (w.Holds()) continue;
      const std::vector<int>& a = grid.coords[w.lo_point];
      const std::vector<int>& b = grid.coords[w.hi_point];
      size_t best = 0;
      int spread = 0;
      for (size_t k = 0; k < dims.size(); ++k) {
        int d = std::abs(a[dims[k]] - b[dims[k]]);
        if (d > spread) spread = d, best = k;
      }
      if (spread == 0) continue;
      int at = std::min(a[dims[best]], b[dims[best]]) + (spread + 1) / 2;
      std::vector<int>& c = (*cuts)[best];
      c.insert(std::upper_bound(c.begin(), c.end(), at), at);
      return true;
    }
    return false;
  }
  // Removes every cut whose removal leaves no more points unserved.
  void Prune(Cuts* cuts) const {
    size_t unserved = Unserved(*cuts);
    for (size_t k = 0; k < cuts->size(); ++k) {
      for (size_t j = 0; j < (*cuts)[k].size();) {
        Cuts trial = *cuts;
        trial[k].erase(trial[k].begin() + j);
        size_t n = Unserved(trial);
        if (n <= unserved) {
          *cuts = std::move(trial);
          unserved = n;
        } else {
          ++j;
        }
      }
    }
  }
};

bool OnGrid(const Grid& grid, size_t i, const std::vector<size_t>& dims) {
  if (i >= grid.coords.size()) return false;
  for (size_t d : dims) {
    if (grid.coords[i][d] < 0) return false;
  }
  return true;
}

void BuildSchedule(const Grid& grid, const std::vector<PointResult>& results, const Sorted& sorted,
                   EdgeEnvelope* env) {
  env->schedule_dims = grid.SweptDims();
  const std::vector<size_t>& dims = env->schedule_dims;
  Binner binner{grid, results, env->key, dims, {}};
  for (size_t i : sorted.windowed) {
    if (OnGrid(grid, i, dims)) {
      binner.on_grid.push_back(i);
    } else {
      ++env->off_grid;
    }
  }
  Cuts cuts(dims.size());
  size_t limit = 1;
  for (size_t d : dims) limit += grid.dims[d].values.size();
  for (size_t n = 0; n < limit && binner.CutOnce(&cuts); ++n) {
  }
  binner.Prune(&cuts);

  std::vector<std::vector<size_t>> members = binner.Members(cuts);
  env->schedule.assign(members.size(), ScheduleBin());
  for (size_t b = 0; b < members.size(); ++b) {
    ScheduleBin& bin = env->schedule[b];
    size_t rest = b;
    bin.spans.resize(dims.size());
    for (size_t k = dims.size(); k-- > 0;) {
      size_t n = cuts[k].size() + 1, at = rest % n;
      rest /= n;
      int first = at == 0 ? 0 : cuts[k][at - 1];
      int last = at + 1 < n ? cuts[k][at] - 1 : static_cast<int>(grid.dims[dims[k]].values.size()) - 1;
      bin.spans[k] = {dims[k], first, last};
    }
    bin.window = IntersectWindows(results, members[b], env->key);
    bin.points = static_cast<int>(members[b].size());
  }
  for (const ImpossiblePoint& p : sorted.impossible) {
    if (!OnGrid(grid, p.point, dims)) continue;
    ++env->schedule[BinIndex(cuts, dims, grid.coords[p.point])].impossible;
    ++env->schedule[BinIndex(cuts, dims, grid.coords[p.point])].points;
  }
}

}  // namespace

const char* DeadTimeChoiceName(DeadTimeChoice choice) {
  switch (choice) {
    case DeadTimeChoice::kMidpoint:
      return "midpoint";
    case DeadTimeChoice::kLossOptimal:
      return "loss-optimal";
    case DeadTimeChoice::kNone:
      break;
  }
  return "none";
}

const ScheduleBin* EdgeEnvelope::BinAt(const std::vector<int>& coords) const {
  for (const ScheduleBin& bin : schedule) {
    bool inside = true;
    for (const ScheduleBin::Span& s : bin.spans) {
      int c = s.dim < coords.size() ? coords[s.dim] : -1;
      inside = inside && c >= s.first && c <= s.last;
    }
    if (inside) return &bin;
  }
  return nullptr;
}

const EdgeEnvelope* DeadTimeEnvelope::Find(const EdgeKey& key) const {
  for (const EdgeEnvelope& e : edges) {
    if (e.key == key) return &e;
  }
  return nullptr;
}

WindowIntersection IntersectWindows(const std::vector<PointResult>& results,
                                    const std::vector<size_t>& members, const EdgeKey& key) {
  WindowIntersection w;
  for (size_t i : members) {
    const EdgeMeasurement* e = FindEdge(results[i], key);
    double t_min = e->Get(kProbeTMinColumn), t_max = e->Get(kProbeTMaxColumn);
    if (w.windows == 0 || t_min > w.lo) w.lo = t_min, w.lo_point = i;
    if (w.windows == 0 || t_max < w.hi) {
      w.hi = t_max;
      w.hi_point = i;
      w.hi_at_bound = EndsAtBound(*e);
    }
    ++w.windows;
  }
  if (w.Holds()) Recommend(results, members, key, &w);
  return w;
}

DeadTimeEnvelope ComputeDeadTimeEnvelope(const Grid& grid, const std::vector<PointResult>& results,
                                         const std::vector<EdgeKey>& edges) {
  DeadTimeEnvelope out;
  out.available = !FindColumnWithPrefix(results, kProbeTMinColumn).empty() &&
                  !FindColumnWithPrefix(results, kProbeTMaxColumn).empty();
  if (!out.available) return out;
  for (const EdgeKey& key : edges) {
    EdgeEnvelope env;
    env.key = key;
    Sorted sorted = SortPoints(results, key);
    env.measured = sorted.measured;
    env.unprobed = sorted.unprobed;
    env.impossible = sorted.impossible;
    env.all = IntersectWindows(results, sorted.windowed, key);
    if (!env.all.Holds() && env.all.windows > 0) {
      env.conflicts = Conflicts(results, sorted.windowed, key, env.all);
      env.conflicts_total = static_cast<int>(env.conflicts.size());
      if (env.conflicts.size() > kMaxConflicts) env.conflicts.resize(kMaxConflicts);
    }
    BuildSchedule(grid, results, sorted, &env);
    out.edges.push_back(std::move(env));
  }
  return out;
}

}  // namespace zvsmap
