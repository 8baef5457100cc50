// The settled operating point of a point: the loop it ran in, the control
// value it settled at, the regulated quantity, the slow states' averages and
// the power balance over the settled period.
#pragma once

#include <limits>
#include <string>
#include <vector>

namespace zvsmap {

/// How the control parameter was set. kNotSettled: the point failed before
/// an operating point existed; kOpen: the template's own value; kRegulated:
/// solved so that the regulated quantity sits at its set point.
enum class LoopKind { kNotSettled, kOpen, kRegulated };

/// "", "open", "regulated": the one place a loop kind becomes text.
const char* LoopKindName(LoopKind k);

/// The inverse of LoopKindName; false (and `out` left alone) for other text.
bool LoopKindFromName(const std::string& name, LoopKind* out);

/// One vector's average over the settled period, e.g. i(l1) = 5.02 A.
struct VectorAverage {
  std::string vector;
  double value = 0;
  bool operator==(const VectorAverage& o) const {
    return vector == o.vector && value == o.value;
  }
};

/// The operating point over the settled (last measured) period.
struct OperatingPoint {
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  LoopKind loop = LoopKind::kNotSettled;
  double control = kNaN;        ///< the control parameter's value (NaN: no `*@ control`)
  double set_point = kNaN;      ///< the regulated quantity's set point (regulated loop)
  double regulated_avg = kNaN;  ///< the regulated vector's average (NaN: no `*@ regulate`)
  double p_in_w = kNaN;         ///< average input power (NaN: no `*@ power`)
  double p_out_w = kNaN;        ///< average output power
  std::vector<VectorAverage> averages;  ///< each slow state's average, in template order

  /// p_out / p_in (NaN when either is missing or the input power is not positive).
  double Efficiency() const;
  /// (regulated_avg - set_point) / |set_point| (NaN unless regulated).
  double RegulationError() const;
};

}  // namespace zvsmap
