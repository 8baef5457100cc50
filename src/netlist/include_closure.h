// The include closure: zvsmap reads every file a deck names (`.include`,
// `.inc`, `.lib FILE SECTION`, nested, each path relative to the file that
// names it) itself, checks every card of every file against the deck rules
// (netlist/deck_rules.h) and inlines the cards, so ngspice never opens a file.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "netlist/deck.h"

namespace zvsmap {

/// Expands netlist text read from `path` (which anchors its relative
/// includes and names it in messages): the cards of the text with every
/// include inlined, comments kept, blank lines, analysis/output cards,
/// library section definitions and everything after `.end` left out. With
/// `has_title` the first line is the title: it is checked for control and
/// script constructs and left out. Fails with a file:line Diagnostic (and a
/// caret) on the first refused card, include cycle, missing, unreadable or
/// binary file; an include problem names the including file:line.
bool ExpandNetlistText(const std::string& text, const std::string& path, bool has_title,
                       std::vector<DeckLine>* out, Diagnostic* error);

/// Expands a whole file (a device model file, `.include`d from outside any
/// netlist): as ExpandNetlistText without a title. `named_at` and
/// `named_line` say where the file was named, for the messages when it
/// cannot be read.
bool ExpandNetlistFile(const std::string& path, const SourceLocation& named_at,
                       const std::string& named_line, std::vector<DeckLine>* out,
                       Diagnostic* error);

/// Expands section `section` (case-insensitive) of library file `path`, as
/// `.lib path section` does; every card of the whole file is checked.
bool ExpandLibrarySection(const std::string& path, const std::string& section,
                          const SourceLocation& named_at, const std::string& named_line,
                          std::vector<DeckLine>* out, Diagnostic* error);

/// Reads a text file for a deck: false with a message (no location) when it
/// is missing, not a regular file, unreadable, or binary (holds a NUL byte).
bool ReadDeckFile(const std::string& path, std::string* text, std::string* message);

}  // namespace zvsmap
