// The outcome of one operating point.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "result/edge_metrics.h"
#include "result/operating_point.h"
#include "result/point_status.h"
#include "result/settle_record.h"

namespace zvsmap {

/// One point's result, as the run store and the reports see it.
struct PointResult {
  size_t index = 0;
  PointStatus status = PointStatus::kFailed;
  std::string reason;  ///< one line, empty when ok
  std::string log;     ///< the simulator's messages, kept when the point failed
  std::vector<EdgeMeasurement> edges;
  SettleRecord settle;
  /// The settled operating point (loop, control, averages, power balance).
  OperatingPoint operating;
  /// The solver aid the point ran with (sim/solver_aids.h): "none", an aid's
  /// name, or empty when no run succeeded.
  std::string solver_aid;
  double wall_s = 0;   ///< wall-clock time spent on the point
};

/// The result of a point that has none: status kNotRun, reason "not run".
PointResult NotRunResult(size_t index);

}  // namespace zvsmap
