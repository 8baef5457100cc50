// Fixed chains of sweep points for warm starts: which settled point a point
// starts from. The layout is a pure function of the expanded points (never of
// -j, shards, resume or timing), so a warm-started result is the same however
// the sweep is run.
#pragma once

#include <cstddef>
#include <vector>

#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// The most points a chain holds: a longer line of the innermost axis is cut
/// into ceil(n / 8) near-equal chains, so a one-axis sweep still spreads
/// over workers and shards (each cut costs one cold start).
constexpr size_t kMaxChainPoints = 8;

/// Where a point starts from. `previous` (kNone: a cold start) is its chain
/// predecessor: the point before it along the innermost axis group, in the
/// same chain (same
/// values of every other group, same refinement round), or for a tolerance
/// variant its nominal point. `before_previous` is the predecessor's own
/// predecessor along the same axis (kNone for a variant, a chain's second
/// point or a device axis), for a linear prediction from the two.
struct ChainLink {
  static constexpr size_t kNone = static_cast<size_t>(-1);
  size_t previous = kNone;
  size_t before_previous = kNone;
  /// With `before_previous`: the point's distance from `previous` over
  /// `previous`'s from `before_previous`, in grid steps (1 on an evenly
  /// filled line), for the linear prediction.
  double step_ratio = 1;
};

/// The sweep's innermost (last) axis group picks switch models.
bool InnermostIsDevice(const SweepSpec& spec);

/// The link of every point of `points` (absolute indices; a predecessor
/// always has a lower index than its successor). Points before `begin` (an
/// earlier refinement round) are never predecessors of points from `begin`
/// on, and links of points before `begin` are kNone. Points without a grid
/// position (built by hand) start cold. `innermost_is_device` says the last
/// axis group picks switch models: then a chain still links its points but
/// gives no `before_previous` (a model is no number to extrapolate along).
std::vector<ChainLink> ChainLinks(const std::vector<Point>& points, size_t begin,
                                  bool innermost_is_device);

/// The work units of points[begin..]: each chain along the innermost axis in
/// axis order, followed by the tolerance variants of its points in index
/// order; every point in exactly one unit, units ordered by their first
/// point. A unit runs in one worker in this order, and a shard takes whole
/// units, so every predecessor runs before its successors, in the same process.
std::vector<std::vector<size_t>> ChainUnits(const std::vector<Point>& points, size_t begin);

}  // namespace zvsmap
