#include "result/operating_point.h"

#include <cmath>

namespace zvsmap {

const char* LoopKindName(LoopKind k) {
  switch (k) {
    case LoopKind::kOpen:
      return "open";
    case LoopKind::kRegulated:
      return "regulated";
    case LoopKind::kNotSettled:
      break;
  }
  return "";
}

bool LoopKindFromName(const std::string& name, LoopKind* out) {
  for (LoopKind k : {LoopKind::kNotSettled, LoopKind::kOpen, LoopKind::kRegulated}) {
    if (name == LoopKindName(k)) {
      *out = k;
      return true;
    }
  }
  return false;
}

double OperatingPoint::Efficiency() const {
  if (!(p_in_w > 0) || std::isnan(p_out_w)) return kNaN;
  return p_out_w / p_in_w;
}

double OperatingPoint::RegulationError() const {
  if (loop != LoopKind::kRegulated || !(std::fabs(set_point) > 0)) return kNaN;
  return (regulated_avg - set_point) / std::fabs(set_point);
}

}  // namespace zvsmap
