// The values of one sweep axis: ranges by step or by count, and value lists.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

namespace zvsmap {

/// The most values one axis may have. A longer axis is a typo (a step in the
/// wrong unit), not a sweep; refusing it keeps a huge vector from being built.
inline constexpr size_t kMaxAxisValues = 1000000;

/// from, from + step, ..., to. `to` must be reached within 1e-9 relative to the
/// larger bound; endpoints are exact and inner values are interpolated, so
/// 0..1 by 0.1 gives 11 values with 0.3 read as 0.3. from == to gives one
/// value. On failure (zero step, step of the wrong sign, end never reached, too
/// many values) returns false and sets `message`.
bool StepValues(double from, double to, double step, std::vector<double>* values,
                std::string* message);

/// `count` values from `from` to `to` (both included), evenly spaced or, with
/// `log_spacing`, in equal ratios (both bounds must then be positive). count=1
/// needs from == to. On failure returns false and sets `message`.
bool CountValues(double from, double to, long count, bool log_spacing, std::vector<double>* values,
                 std::string* message);

/// The items of a value list separated by blanks and/or commas ("5 12, 24").
std::vector<std::string> SplitValueList(const std::string& text);

}  // namespace zvsmap
