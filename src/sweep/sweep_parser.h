// Reads a sweep file (XML, see README "Sweep file") into a SweepSpec.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Parses sweep XML text. `path` is used for messages and to resolve the
/// template path (relative to the sweep file's folder); the template file itself
/// is not looked at. On failure returns false and fills `error` with file:line
/// (the first problem found, in file order).
bool ParseSweepText(const std::string& text, const std::string& path, SweepSpec* spec,
                    Diagnostic* error);

/// Reads and parses a sweep file from disk, and also checks that the template
/// file exists.
bool ParseSweepFile(const std::string& path, SweepSpec* spec, Diagnostic* error);

/// Checks that every parameter the sweep names (fixed, swept or derived) is one
/// the template declares (`known`), suggesting the closest name when not. Names
/// compare case-insensitively, as SPICE names do. Returns all problems.
std::vector<Diagnostic> CheckParamsKnown(const SweepSpec& spec,
                                         const std::vector<std::string>& known);

}  // namespace zvsmap
