#include "result/edge_metrics.h"

#include <limits>

namespace zvsmap {

const char* ZvsClassName(ZvsClass c) {
  switch (c) {
    case ZvsClass::kFull: return "full";
    case ZvsClass::kPartial: return "partial";
    case ZvsClass::kHard: return "hard";
    case ZvsClass::kUnknown: break;
  }
  return "unknown";
}

double EdgeMeasurement::Get(const std::string& column) const {
  for (const auto& m : metrics)
    if (m.column == column) return m.value;
  for (const auto& c : comparisons) {
    for (const FlatColumn& f : FlatColumns(c)) {
      if (f.name == column) return f.value;
    }
  }
  return std::numeric_limits<double>::quiet_NaN();
}

const Comparison* EdgeMeasurement::FindComparison(const std::string& metric,
                                                  const std::string& tag) const {
  for (const auto& c : comparisons) {
    if (c.metric == metric && c.tag == tag) return &c;
  }
  return nullptr;
}

}  // namespace zvsmap
