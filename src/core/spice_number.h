// SPICE-style numbers: "2.2u", "500k", "1meg", "10n", "48".
#pragma once

#include <optional>
#include <string>

namespace zvsmap {

/// Parses a number with an optional SPICE scale suffix (case-insensitive):
/// f p n u m k meg g t (and "mil" is NOT accepted). Letters after the suffix
/// are allowed as a unit annotation only when they are letters (e.g. "10nF",
/// "48V"), as SPICE does. Returns nullopt for anything else (empty, junk,
/// trailing non-letters, non-finite).
std::optional<double> ParseSpiceNumber(const std::string& text);

/// Formats a value compactly: the shortest of %.12g, %.15g, %.17g that reads back exactly.
std::string FormatNumber(double value);

/// Formats a value with an engineering suffix for people ("4.7u", "500k").
std::string FormatEngineering(double value, int significant_digits = 4);

}  // namespace zvsmap
