#include "core/diagnostic.h"

#include <algorithm>
#include <cctype>
#include <vector>

#include "core/text.h"

namespace zvsmap {

std::string Diagnostic::Format() const {
  std::string out;
  if (!where.file.empty()) {
    out += Printable(where.file);
    if (where.line > 0) out += ":" + std::to_string(where.line);
    out += ": ";
  }
  // The message quotes the user's values and the line is the user's text: a
  // tab shows as a space, other control bytes (a terminal's escape sequences
  // among them) escaped, and the caret counts them as shown.
  auto shown = [](std::string text) {
    std::replace(text.begin(), text.end(), '\t', ' ');
    return Printable(text);
  };
  out += shown(message);
  if (!source_line.empty()) {
    const std::string line = shown(source_line);
    out += "\n  " + line;
    if (where.column > 0) {
      const size_t before = std::min(source_line.size(), static_cast<size_t>(where.column - 1));
      out += "\n  " + std::string(shown(source_line.substr(0, before)).size(), ' ') + "^";
    }
  }
  return out;
}

int EditDistance(const std::string& a, const std::string& b) {
  // Classic Levenshtein with two rows; names are short.
  std::vector<int> prev(b.size() + 1), cur(b.size() + 1);
  for (size_t j = 0; j <= b.size(); ++j) prev[j] = static_cast<int>(j);
  for (size_t i = 1; i <= a.size(); ++i) {
    cur[0] = static_cast<int>(i);
    for (size_t j = 1; j <= b.size(); ++j) {
      bool same = std::tolower(static_cast<unsigned char>(a[i - 1])) ==
                  std::tolower(static_cast<unsigned char>(b[j - 1]));
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (same ? 0 : 1)});
    }
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

}  // namespace zvsmap
