#include "result/point_result.h"

namespace zvsmap {

PointResult NotRunResult(size_t index) {
  PointResult r;
  r.index = index;
  r.status = PointStatus::kNotRun;
  r.reason = kNotRunReason;
  return r;
}

}  // namespace zvsmap
