// One operating point of a sweep.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace zvsmap {

/// A named parameter value.
struct ParamValue {
  std::string name;
  double value = 0;
};

/// A parameter of a <device>'s switch subcircuit set by a tolerance variant
/// (<vary device=...>): rendered on each instance of that device.
struct DeviceParamValue {
  std::string device;  ///< the <device> name, as written
  std::string param;   ///< a parameter its subcircuit declares (lower-case)
  double value = 0;
};

/// A tolerance variant of a nominal point (<tolerances>, sweep/tolerance_expand.h).
struct VariantTag {
  enum class Kind { kCorner, kSample };
  size_t nominal = 0;  ///< the index of the nominal point it varies
  Kind kind = Kind::kCorner;
  /// kCorner: the corner's mask (bit j set: the j-th <vary> at its high end);
  /// kSample: the Monte Carlo sample's number (0-based).
  unsigned number = 0;
};

/// One operating point: its index in the expanded sweep (stable for a given
/// sweep file) and the parameter values that differ from the template's
/// defaults, in a fixed order (fixed values, then axes in file order, then
/// derived values).
struct Point {
  size_t index = 0;
  std::vector<ParamValue> values;
  /// Switch models chosen by device axes: (role "cell.high"/"cell.low",
  /// device name), in axis order. Empty: the template's own switches.
  std::vector<std::pair<std::string, std::string>> devices = {};
  /// The point's position on the sweep's grid: one value index per axis
  /// group of the SweepSpec (device axes included), as ExpandSweep made it.
  /// Empty for a point built by hand (reports then place it by value).
  std::vector<int> grid = {};
  /// Adaptive refinement (<refine>): the round that added the point (0 = the
  /// coarse grid); -1 when the sweep is not refined.
  int refine_round = -1;
  /// Set on a tolerance variant; empty on a nominal point.
  std::optional<VariantTag> variant = std::nullopt;
  /// A variant's values of device parameters (<vary device=...>), in <vary>
  /// order; empty otherwise.
  std::vector<DeviceParamValue> device_params = {};

  /// The value of `name` (compared case-insensitively, as SPICE does), if this
  /// point sets it.
  std::optional<double> Get(const std::string& name) const;
  /// "Iout=2 L=1u ..." (engineering suffixes, 4 significant digits) — for messages.
  std::string Describe() const;
};

}  // namespace zvsmap
