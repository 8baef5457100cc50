#include "sweep/point.h"

#include <cctype>

#include "core/spice_number.h"
#include "core/text.h"

namespace zvsmap {

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
  for (const DeviceParamValue& d : device_params) {
    if (!out.empty()) out += ' ';
    out += d.device + "." + d.param + "=" + FormatEngineering(d.value);
  }
  return out;
}

}  // namespace zvsmap
