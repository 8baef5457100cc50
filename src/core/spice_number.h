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

/// How a number's spelling compares with ngspice's reading of it (README "How
/// numbers are read"). ngspice reads a number, then a scale factor chosen by
/// the first letters (t g meg k m u n p f a, any case; "m" alone is milli and
/// "a" is atto), and ignores every letter after that.
struct NumberSpelling {
  enum class Kind {
    kPlain,     ///< a number with at most a scale factor: nothing to say
    kUnitNote,  ///< a scale factor and then a unit symbol ngspice ignores ("10uH", "5V"): a warning
    kRefused,   ///< reads differently than it looks ("0.5MHz", "2A", "1xyz"): an error
  };
  Kind kind = Kind::kPlain;
  /// kUnitNote and kRefused: what ngspice reads and, when refused, what to write.
  std::string message;
  /// kUnitNote: the number without its unit letters ("10u" for "10uH").
  std::string plain;
};

/// Judges the spelling of `text`. A text that is not a number at all is
/// kPlain here (ParseSpiceNumber refuses it).
NumberSpelling JudgeSpiceSpelling(const std::string& text);

/// Formats a value compactly: the shortest of %.12g, %.15g, %.17g that reads back exactly.
std::string FormatNumber(double value);

/// Formats a value with an engineering suffix for people ("4.7u", "500k").
std::string FormatEngineering(double value, int significant_digits = 4);

}  // namespace zvsmap
