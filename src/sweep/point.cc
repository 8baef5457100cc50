#include "sweep/point.h"

#include <cctype>

#include "core/spice_number.h"

namespace zvsmap {

namespace {

// SPICE parameter names are case-insensitive.
bool SameName(const std::string& a, const std::string& b) {
  if (a.size() != b.size()) return false;
  for (size_t i = 0; i < a.size(); ++i) {
    if (std::tolower(static_cast<unsigned char>(a[i])) !=
        std::tolower(static_cast<unsigned char>(b[i]))) {
      return false;
    }
  }
  return true;
}

}  // namespace

std::optional<double> Point::Get(const std::string& name) const {
  for (const ParamValue& v : values) {
    if (SameName(v.name, name)) return v.value;
  }
  return std::nullopt;
}

std::string Point::Describe() const {
  std::string out;
  for (const ParamValue& v : values) {
    if (!out.empty()) out += ' ';
    out += v.name + "=" + FormatEngineering(v.value);
  }
  for (const auto& [role, device] : devices) {
    if (!out.empty()) out += ' ';
    out += role + "=" + device;
  }
  return out;
}

}  // namespace zvsmap
