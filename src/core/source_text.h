// A text file's lines, for messages that show the offending line and a caret.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {

/// The lines of one input file (sweep file or template), kept to point at a
/// place in a message found after the file was parsed.
class SourceText {
 public:
  /// Reads `path`. A file that cannot be read has no lines: messages then
  /// carry file:line without the line's text.
  explicit SourceText(const std::string& path);
  /// `text` as the contents of `path`.
  SourceText(const std::string& path, const std::string& text);

  /// A diagnostic at `line` (1-based) showing the line without its
  /// indentation and a caret under `column` (1-based in the line as written;
  /// 0 = no caret).
  Diagnostic At(int line, int column, std::string message) const;
  /// The place of `attribute=` inside the XML start tag that begins at
  /// `element` (its '<'), which may span lines; `element` itself when absent.
  SourceLocation FindAttribute(const SourceLocation& element, const std::string& attribute) const;
  /// The 1-based column of `word` (whole word, case-insensitive) in `line` at
  /// or after column `from`, or 0.
  int FindWord(int line, const std::string& word, int from = 1) const;
  /// The 1-based column of `text` (case-insensitive) in `line`, or 0.
  int FindText(int line, const std::string& text) const;

 private:
  std::string path_;
  std::string text_;
  std::vector<size_t> starts_;  // offset of each line
  std::string LineText(int line) const;
};

}  // namespace zvsmap
