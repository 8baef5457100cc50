// Units and numbers as the reports print them: the unit of a metric column
// or a swept parameter, values in engineering notation with the unit's own
// symbol (4.7 µH, 250 ns), dimensionless values plainly, and 1-2-5 axis ticks.
#pragma once

#include <string>
#include <vector>

namespace zvsmap {

/// The unit a metric column carries in its name suffix: "_s" s, "_v" V,
/// "_a" A, "_j" J, "_f" F, "_c" C, "_hz" Hz, "_ohm" Ω, "_v_per_s" V/s; ""
/// for a dimensionless column (margins, ratios, flags) and hand-calculation
/// columns ending "__diff" take the metric's unit, "__rel_diff" none.
std::string MetricUnit(const std::string& column);

/// The unit of a swept template parameter. A parameter's unit is inferred
/// from its name: first the metric suffixes above ("td_s", "coss_f"), then
/// the conventions of SPICE templates (first letter, case-insensitive):
/// V volts, I amperes, L henries, C farads, R ohms, "f"/"fsw"/"freq…" hertz,
/// "t…"/"td…" seconds. Anything else (D, n, tcm) is dimensionless ("").
std::string ParamUnit(const std::string& name);

/// `value` in engineering notation with `digits` significant digits and the
/// unit's symbol after an SI prefix ("4.7 µH", "-107 mV", "2 A"); with an
/// empty unit a plain number ("-0.000107", "0.25", "1.5e+06"). NaN: "n/a".
std::string FormatQuantity(double value, const std::string& unit, int digits = 3);

/// Axis ticks covering [lo, hi] at 1, 2 or 5 times a power of ten, at most
/// `max_ticks` (at least 2 values when lo < hi).
std::vector<double> NiceTicks(double lo, double hi, int max_ticks = 8);

/// "name [unit]", or the name alone for a dimensionless quantity.
std::string AxisLabel(const std::string& name, const std::string& unit);

}  // namespace zvsmap
