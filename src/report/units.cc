#include "report/units.h"

#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "core/text.h"

namespace zvsmap {

namespace {

bool EndsWith(const std::string& s, const std::string& tail) {
  return s.size() >= tail.size() && s.compare(s.size() - tail.size(), tail.size(), tail) == 0;
}

std::string SuffixUnit(const std::string& lower) {
  const std::pair<const char*, const char*> suffixes[] = {
      {"_v_per_s", "V/s"}, {"_ohm", "\u03a9"}, {"_hz", "Hz"}, {"_s", "s"}, {"_v", "V"},
      {"_a", "A"},         {"_j", "J"},        {"_f", "F"},   {"_c", "C"}, {"_h", "H"}};
  for (const auto& [suffix, unit] : suffixes) {
    if (EndsWith(lower, suffix)) return unit;
  }
  return "";
}

}  // namespace

std::string MetricUnit(const std::string& column) {
  std::string lower = Lower(column);
  if (EndsWith(lower, "__rel_diff") || EndsWith(lower, "__beyond_tol")) return "";
  size_t pair = lower.find("__");
  return SuffixUnit(pair == std::string::npos ? lower : lower.substr(0, pair));
}

std::string ParamUnit(const std::string& name) {
  std::string lower = Lower(name);
  std::string unit = SuffixUnit(lower);
  if (!unit.empty() || lower.empty()) return unit;
  if (lower == "f" || lower == "fs" || lower.rfind("fsw", 0) == 0 || lower.rfind("freq", 0) == 0) {
    return "Hz";
  }
  switch (lower[0]) {
    case 'v':
      return "V";
    case 'i':
      return "A";
    case 'l':
      return "H";
    case 'c':
      return "F";
    case 'r':
      return "\u03a9";
    case 't':
      return lower.rfind("tcm", 0) == 0 ? "" : "s";
    default:
      return "";
  }
}

std::string FormatQuantity(double value, const std::string& unit, int digits) {
  char buf[64];
  if (std::isnan(value)) return "n/a";
  if (value == 0) value = 0.0;  // -0 prints as "0"
  if (unit.empty()) {
    std::snprintf(buf, sizeof buf, "%.*g", digits, value);
    return buf;
  }
  static const char* const kPrefixes[] = {"f", "p", "n", "\u00b5", "m", "", "k", "M", "G", "T"};
  int exponent = 0;
  if (value != 0 && std::isfinite(value)) {
    exponent = static_cast<int>(std::floor(std::log10(std::fabs(value)) / 3)) * 3;
    // Rounding may carry into the next prefix (999.7 -> 1000).
    double scaled = std::fabs(value) / std::pow(10.0, exponent);
    std::snprintf(buf, sizeof buf, "%.*g", digits, scaled);
    if (std::atof(buf) >= 1000) exponent += 3;
  }
  if (exponent < -15) exponent = -15;
  if (exponent > 12) exponent = 12;
  std::snprintf(buf, sizeof buf, "%.*g", digits, value / std::pow(10.0, exponent));
  return std::string(buf) + " " + kPrefixes[(exponent + 15) / 3] + unit;
}

std::vector<double> NiceTicks(double lo, double hi, int max_ticks) {
  std::vector<double> ticks;
  if (!(hi > lo) || !std::isfinite(lo) || !std::isfinite(hi) || max_ticks < 2) return {lo, hi};
  double raw = (hi - lo) / (max_ticks - 1);
  double power = std::pow(10.0, std::floor(std::log10(raw)));
  double step = power;
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    step = m * power;
    if (step >= raw) break;
  }
  double first = std::ceil(lo / step - 1e-9);
  for (double k = first; k * step <= hi + step * 1e-9; k += 1) {
    ticks.push_back(k == 0 ? 0.0 : k * step);  // never "-0"
  }
  return ticks;
}

std::string AxisLabel(const std::string& name, const std::string& unit) {
  return unit.empty() ? name : name + " [" + unit + "]";
}

}  // namespace zvsmap
