// Small text helpers shared by the parsers.
#pragma once

#include <string>

namespace zvsmap {

/// ASCII lower case (SPICE names and our keywords are case-insensitive).
std::string Lower(std::string s);

/// True when `a` and `b` are equal ignoring ASCII case (SPICE names).
bool SameName(const std::string& a, const std::string& b);

/// `s` without leading and trailing blanks (space, tab, CR, LF).
std::string Trim(const std::string& s);

/// `text` with every control character shown as an escape ("\\n", "\\x1b"),
/// for messages that quote a value or a line holding one.
std::string Printable(const std::string& text);

}  // namespace zvsmap
