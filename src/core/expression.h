// Arithmetic expressions over named values, evaluated with muParser.
#pragma once

#include <map>
#include <string>

#include "core/diagnostic.h"

namespace zvsmap {

/// Names and values an expression may refer to.
using Variables = std::map<std::string, double>;

/// Evaluates `expr` (muParser syntax: + - * / ^, sqrt, exp, log, ln, abs, min,
/// max, sin, cos, asin, pi via `_pi`, ...; numbers may carry SPICE suffixes such
/// as 1u or 2meg, and `**` is accepted for power as in SPICE). On failure returns
/// false and sets `error_message` and `error_column` (1-based position in `expr`,
/// 0 if unknown). Division by zero and non-finite results are failures.
bool EvaluateExpression(const std::string& expr, const Variables& vars, double* value,
                        std::string* error_message, int* error_column);

/// Rewrites SPICE-suffixed numeric literals ("2.2u", "1meg") into plain numbers
/// and "**" into "^"; used before handing text to muParser. Exposed for tests.
std::string NormalizeSpiceExpression(const std::string& expr);

}  // namespace zvsmap
