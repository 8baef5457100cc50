// The outcome of one operating point.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <utility>
#include <vector>

#include "analysis/edge_metrics.h"

namespace zvsmap {

/// ok: measured in a settled period; failed: no measurement (reason says why);
/// unsettled: did not reach periodic steady state within the limits.
enum class PointStatus { kOk, kFailed, kUnsettled };

/// "ok", "failed", "unsettled".
const char* PointStatusName(PointStatus s);

/// How a point reached (or did not reach) periodic steady state.
struct SettleInfo {
  std::string method;      ///< e.g. "periods"
  int iterations = 0;      ///< Newton iterations (shooting) or 0
  int periods = 0;         ///< switching periods simulated in all
  double residual = std::numeric_limits<double>::quiet_NaN();  ///< final relative residual
  /// The settled start-of-period state: (init param, value), in template order.
  std::vector<std::pair<std::string, double>> initial_state;
};

/// One point's result, as the run store and the reports see it.
struct PointResult {
  size_t index = 0;
  PointStatus status = PointStatus::kFailed;
  std::string reason;  ///< one line, empty when ok
  std::string log;     ///< the simulator's messages, kept when the point failed
  std::vector<EdgeMeasurement> edges;
  SettleInfo settle;
  /// The solver aid the point ran with (sim/solver_aids.h): "none", an aid's
  /// name, or empty when no run succeeded.
  std::string solver_aid;
  double wall_s = 0;   ///< wall-clock time spent on the point
};

}  // namespace zvsmap
