// One dead time for the whole envelope, or a schedule of them: the
// intersection of every point's dead-time window (from the probe run's
// columns), the points that bind or empty it, and bins over the swept axes
// each with its own intersection (netlists/references.md sec. 10).
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "report/zvs_boundary.h"
#include "result/point_result.h"

namespace zvsmap {

/// The probe's columns the envelope reads (named by the probe's contract).
inline constexpr const char* kProbeTMinColumn = "probe_t_min_s";
inline constexpr const char* kProbeTMaxColumn = "probe_t_max_s";
inline constexpr const char* kProbeBoundColumn = "probe_bound_s";
inline constexpr const char* kProbeMaxAtBoundColumn = "probe_max_at_bound";
inline constexpr const char* kProbeValleyTimeColumn = "probe_t_valley_s";
inline constexpr const char* kProbeValleyVoltageColumn = "probe_v_valley_v";
inline constexpr const char* kLossOptimalColumn = "t_dead_optimal_s";

/// How the recommended dead time was chosen inside an intersection [lo, hi].
enum class DeadTimeChoice {
  kNone,         ///< no intersection, no recommendation
  kMidpoint,     ///< (lo + hi) / 2: the largest margin on the nearer side
  kLossOptimal,  ///< hi is only where the probe stopped: the largest loss-optimal
                 ///< dead time of the points, held inside [lo, hi]
};

/// "none", "midpoint", "loss-optimal".
const char* DeadTimeChoiceName(DeadTimeChoice choice);

/// The intersection of the windows [t_min, t_max] of a set of points, and the
/// dead time recommended inside it. Point numbers index input.points.
struct WindowIntersection {
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  int windows = 0;           ///< points whose window entered
  double lo = kNaN;          ///< the largest t_min: no shorter dead time serves all
  double hi = kNaN;          ///< the smallest t_max: no longer dead time serves all
  size_t lo_point = 0;       ///< the point whose t_min is `lo` (binds the early side)
  size_t hi_point = 0;       ///< the point whose t_max is `hi` (binds the late side)
  bool hi_at_bound = false;  ///< `hi` is the probe's bound, not a ring-back: the true
                             ///< late end is later still
  DeadTimeChoice choice = DeadTimeChoice::kNone;
  double recommended = kNaN;   ///< the dead time to set, NaN when none
  double margin_early = kNaN;  ///< recommended - lo (timing margin, early side)
  double margin_late = kNaN;   ///< hi - recommended (timing margin, late side; a lower
                               ///< bound when hi_at_bound)
  /// True when one dead time serves every point of the set (lo <= hi).
  bool Holds() const { return windows > 0 && lo <= hi; }
};

/// One reason the intersection is empty: point `early`'s shortest dead time
/// exceeds point `late`'s longest.
struct WindowConflict {
  size_t early = 0;
  size_t late = 0;
  double t_min = 0;  ///< of `early`
  double t_max = 0;  ///< of `late`
};

/// A point where ZVS is impossible (the probe never met the criterion), with
/// the best instant the probe saw.
struct ImpossiblePoint {
  size_t point = 0;
  double t_valley = WindowIntersection::kNaN;  ///< probe_t_valley_s
  double v_valley = WindowIntersection::kNaN;  ///< probe_v_valley_v
};

/// One bin of a schedule: a run of grid positions [first, last] along each
/// binned dimension (Grid::dims index `dim`), and the intersection of the
/// windows of the points in it.
struct ScheduleBin {
  struct Span {
    size_t dim = 0;
    int first = 0;
    int last = 0;
  };
  std::vector<Span> spans;  ///< one per EdgeEnvelope::schedule_dims, same order
  int points = 0;           ///< on-grid points of the bin with a window or ZVS impossible
  int impossible = 0;       ///< of those, points where ZVS is impossible
  WindowIntersection window;
};

/// The envelope of one cell's edge.
struct EdgeEnvelope {
  EdgeKey key;
  int measured = 0;  ///< points that ran (status ok) and measured the edge
  int unprobed = 0;  ///< of those, points without a probe window (columns absent)
  std::vector<ImpossiblePoint> impossible;  ///< excluded from every intersection
  WindowIntersection all;                   ///< over every point with a window
  /// When `all` is empty: the pairs that empty it, the widest overlap first,
  /// at most kMaxConflicts; `conflicts_total` counts them all.
  std::vector<WindowConflict> conflicts;
  int conflicts_total = 0;
  std::vector<size_t> schedule_dims;  ///< the swept dimensions the schedule bins
  /// Bins in row-major order over schedule_dims (the first varies slowest);
  /// one bin over everything when `all` holds.
  std::vector<ScheduleBin> schedule;
  int off_grid = 0;  ///< windowed points without a grid position (not in any bin)
  /// The bin holding grid position `coords`, or nullptr.
  const ScheduleBin* BinAt(const std::vector<int>& coords) const;
};

/// At most this many conflicts are kept per edge.
inline constexpr size_t kMaxConflicts = 20;

/// The envelope of every measured edge.
struct DeadTimeEnvelope {
  bool available = false;  ///< the results carry the probe's window columns
  std::vector<EdgeEnvelope> edges;
  /// The envelope of `key`, or nullptr.
  const EdgeEnvelope* Find(const EdgeKey& key) const;
};

/// The intersection of the windows of `members` (indices into `results`;
/// each member must have a finite window for `key`), with the recommended
/// dead time: the midpoint when the late end is a ring-back; when it is the
/// probe's bound, the largest finite t_dead_optimal_s of the members held in
/// [lo, hi] (the midpoint when there is none).
WindowIntersection IntersectWindows(const std::vector<PointResult>& results,
                                    const std::vector<size_t>& members, const EdgeKey& key);

/// Derives the envelope of each of `edges` from `results` (status ok points
/// only) on `grid`. `available` is false and `edges` empty when no result
/// carries probe_t_min_s and probe_t_max_s. The schedule cuts the swept
/// dimensions where a bin's intersection is empty, between the two points
/// that empty it, until every bin holds or cannot be cut; cuts that help no
/// bin are then removed (a small table, not always the smallest).
DeadTimeEnvelope ComputeDeadTimeEnvelope(const Grid& grid, const std::vector<PointResult>& results,
                                         const std::vector<EdgeKey>& edges);

}  // namespace zvsmap
