// Diagnostics: an error message tied to a place in a source file.
#pragma once

#include <stdexcept>
#include <string>
#include <utility>

namespace zvsmap {

/// A place in a text file. `line` and `column` are 1-based; 0 means "unknown".
struct SourceLocation {
  std::string file;
  int line = 0;
  int column = 0;
};

/// An expected failure (bad input, rejected netlist, ...), reported to the user
/// as `file:line: message`, optionally followed by the offending line and a caret.
struct Diagnostic {
  Diagnostic() = default;
  /// (A constructor rather than aggregate initialisation: GCC 12 at -O2 and
  /// above warns "may be used uninitialized" on the aggregate form.)
  Diagnostic(SourceLocation where_in, std::string message_in, std::string source_line_in = {})
      : where(std::move(where_in)),
        message(std::move(message_in)),
        source_line(std::move(source_line_in)) {}

  SourceLocation where;
  std::string message;
  std::string source_line;  ///< the text of the line, if known (shown with a caret)

  /// "file:line: message" plus the source line and a caret when known.
  std::string Format() const;
};

/// The project's one exception type, for bugs and the truly unexpected and for
/// carrying a Diagnostic up to main(). Caught once in main().
class Error : public std::runtime_error {
 public:
  explicit Error(Diagnostic d)
      : std::runtime_error(d.Format()), diagnostic_(std::move(d)) {}
  explicit Error(const std::string& message)
      : Error(Diagnostic{{}, message, {}}) {}
  /// The diagnostic this error carries.
  const Diagnostic& diagnostic() const { return diagnostic_; }

 private:
  Diagnostic diagnostic_;
};

/// Edit distance between two names, case-insensitive (for "did you mean").
int EditDistance(const std::string& a, const std::string& b);

/// The closest candidate to `name` within a small edit distance, or "".
template <typename Range>
std::string ClosestName(const std::string& name, const Range& candidates) {
  std::string best;
  int best_distance = 1 + static_cast<int>(name.size()) / 3;
  if (best_distance < 2) best_distance = 2;
  for (const auto& c : candidates) {
    int d = EditDistance(name, c);
    if (d < best_distance || (d == best_distance && best.empty() && d <= 2)) {
      best_distance = d;
      best = c;
    }
  }
  return best;
}

}  // namespace zvsmap
