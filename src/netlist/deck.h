// The assembled deck: the one self-contained netlist text zvsmap hands to
// ngspice for a point, every line tagged with the user's file:line it came from.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {

/// One card of an assembled deck (continuations joined, never a newline in
/// `text`) and where it came from. `origin.file` is empty for lines zvsmap adds.
struct DeckLine {
  std::string text;
  SourceLocation origin;
};

/// An assembled netlist: line N of Text() is lines[N - 1].
struct Deck {
  std::vector<DeckLine> lines;

  /// Appends a line zvsmap itself adds (no user origin).
  void AddGenerated(const std::string& text);
  /// Appends every line of `text` (split at newlines) with one origin.
  void AddText(const std::string& text, const SourceLocation& origin);
  /// The netlist text: each line followed by a newline.
  std::string Text() const;
  /// The deck as the content hash sees it: without the title (line 1),
  /// comment and blank lines, trailing blanks removed.
  std::string Canonical() const;
  /// The origin of 1-based line `number` of Text(), or nullptr when the line
  /// does not exist or zvsmap added it.
  const SourceLocation* Origin(int number) const;
};

/// True for a line ngspice reads as a comment or as nothing: blank, or its
/// first non-blank character is '*'.
bool IsCommentOrBlank(const std::string& line);

}  // namespace zvsmap
