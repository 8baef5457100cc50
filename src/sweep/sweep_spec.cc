#include "sweep/sweep_spec.h"

#include <limits>

#include "core/spice_number.h"

namespace zvsmap {

std::string ZvsCriterion::Describe() const {
  if (kind == Kind::kAbsolute) return "v_turn_on <= " + FormatNumber(value) + " V";
  return "v_turn_on <= " + FormatNumber(value * 100) + "% of rail";
}

size_t SweepSpec::GridSize() const {
  // Saturates instead of wrapping, so an absurd grid is still "too large".
  size_t n = 1;
  for (const AxisGroup& g : groups) {
    size_t s = g.size();
    if (s == 0) return 0;
    if (n > std::numeric_limits<size_t>::max() / s) return std::numeric_limits<size_t>::max();
    n *= s;
  }
  return n;
}

std::vector<std::pair<std::string, SourceLocation>> SweepSpec::NamedParams() const {
  std::vector<std::pair<std::string, SourceLocation>> out;
  for (const FixedValue& f : fixed) out.emplace_back(f.param, f.where);
  for (const AxisGroup& g : groups) {
    for (const AxisSpec& a : g.axes) {
      if (a.device_roles.empty()) out.emplace_back(a.param, a.where);
    }
  }
  for (const DerivedValue& d : derived) out.emplace_back(d.param, d.where);
  return out;
}

}  // namespace zvsmap
