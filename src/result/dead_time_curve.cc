#include "result/dead_time_curve.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace zvsmap {

const char* ZvsClassName(ZvsClass c) {
  switch (c) {
    case ZvsClass::kFull:
      return "full";
    case ZvsClass::kPartial:
      return "partial";
    case ZvsClass::kHard:
      return "hard";
    case ZvsClass::kUnknown:
      break;
  }
  return "unknown";
}

ZvsClass ClassifyTurnOn(double v_ds_v, double limit_v, double rail_v) {
  if (!std::isfinite(v_ds_v)) return ZvsClass::kUnknown;
  if (v_ds_v <= limit_v) return ZvsClass::kFull;
  if (v_ds_v < 0.5 * rail_v) return ZvsClass::kPartial;
  return ZvsClass::kHard;
}

double DeadTimeCurve::At(double t_dead) const {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  if (t_dead_s.empty() || t_dead_s.size() != v_ds_v.size() || !(t_dead >= t_dead_s.front()) ||
      !(t_dead <= t_dead_s.back())) {
    return nan;
  }
  auto hi = std::lower_bound(t_dead_s.begin(), t_dead_s.end(), t_dead);
  size_t k = static_cast<size_t>(hi - t_dead_s.begin());
  if (k == 0) return v_ds_v.front();
  double t0 = t_dead_s[k - 1], t1 = t_dead_s[k];
  double frac = t1 > t0 ? (t_dead - t0) / (t1 - t0) : 1.0;
  return v_ds_v[k - 1] + frac * (v_ds_v[k] - v_ds_v[k - 1]);
}

ZvsClass ClassAtDeadTime(const DeadTimeCurve& curve, double t_dead_s, double limit_v,
                         double rail_v) {
  return ClassifyTurnOn(curve.At(t_dead_s), limit_v, rail_v);
}

}  // namespace zvsmap
