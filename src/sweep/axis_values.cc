#include "sweep/axis_values.h"

#include <algorithm>
#include <cctype>
#include <cmath>

#include "core/spice_number.h"

namespace zvsmap {

namespace {

std::string TooMany(double count) {
  return "range has " + FormatNumber(count) + " values, more than " +
         std::to_string(kMaxAxisValues);
}

}  // namespace

bool StepValues(double from, double to, double step, std::vector<double>* values,
                std::string* message) {
  values->clear();
  if (step == 0) {
    *message = "step must not be zero";
    return false;
  }
  if (from == to) {
    values->assign(1, from);
    return true;
  }
  if ((to - from) * step < 0) {
    *message = "step " + FormatNumber(step) + " has the wrong sign to go from " +
               FormatNumber(from) + " to " + FormatNumber(to);
    return false;
  }
  double n = (to - from) / step;
  if (n + 1 > static_cast<double>(kMaxAxisValues)) {
    // 1/1n is 999999999.9999999 in doubles; nudge so the count shown is exact.
    *message = TooMany(std::floor(n * (1 + 1e-12)) + 1);
    return false;
  }
  double steps = std::round(n);
  double scale = std::max(std::fabs(from), std::fabs(to));
  if (steps < 1 || std::fabs(from + steps * step - to) > 1e-9 * scale) {
    double below = from + std::floor(n) * step;
    *message = "range never reaches its end: from " + FormatNumber(from) + " in steps of " +
               FormatNumber(step) + " passes " + FormatNumber(to) + " between " +
               FormatNumber(below) + " and " + FormatNumber(below + step);
    return false;
  }
  // Interpolate instead of accumulating: from + i*step drifts (0.30000000000000004).
  size_t count = static_cast<size_t>(steps) + 1;
  values->resize(count);
  for (size_t i = 0; i < count; ++i) {
    (*values)[i] = from + (to - from) * static_cast<double>(i) / steps;
  }
  values->back() = to;
  return true;
}

bool CountValues(double from, double to, long count, bool log_spacing, std::vector<double>* values,
                 std::string* message) {
  values->clear();
  if (count < 1) {
    *message = "count must be at least 1";
    return false;
  }
  if (static_cast<size_t>(count) > kMaxAxisValues) {
    *message = TooMany(static_cast<double>(count));
    return false;
  }
  if (log_spacing && (from <= 0 || to <= 0)) {
    *message = "log spacing needs positive bounds, got from=" + FormatNumber(from) +
               " to=" + FormatNumber(to);
    return false;
  }
  if (count == 1) {
    if (from != to) {
      *message = "count=1 needs from equal to to (got " + FormatNumber(from) + " and " +
                 FormatNumber(to) + ")";
      return false;
    }
    values->assign(1, from);
    return true;
  }
  values->resize(static_cast<size_t>(count));
  double last = static_cast<double>(count - 1);
  for (long i = 0; i < count; ++i) {
    double t = static_cast<double>(i) / last;
    (*values)[i] = log_spacing ? from * std::pow(to / from, t) : from + (to - from) * t;
  }
  values->front() = from;
  values->back() = to;
  return true;
}

std::vector<std::string> SplitValueList(const std::string& text) {
  std::vector<std::string> items;
  std::string cur;
  for (char c : text) {
    if (c == ',' || std::isspace(static_cast<unsigned char>(c))) {
      if (!cur.empty()) items.push_back(cur);
      cur.clear();
    } else {
      cur += c;
    }
  }
  if (!cur.empty()) items.push_back(cur);
  return items;
}

}  // namespace zvsmap
