// Reads <require> elements of a sweep file into RequirementSpecs.
#pragma once

#include <functional>
#include <pugixml.hpp>
#include <string>

#include "core/diagnostic.h"
#include "sweep/requirement_spec.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Reports a problem in the element being parsed: `attribute` is the attribute
/// at fault (nullptr for the element), and the callback returns false.
using RequirementFail = std::function<bool(const char* attribute, const std::string& message)>;

/// Parses one <require> element (attributes: edge, class | metric+min/max |
/// dead-time-within-window="true" | dead-time=T within-window="true", optional
/// where and name). T is a SPICE number > 0; that it is shorter than every
/// point's period is checked with the points (CheckPoints). `where` is the
/// element's location. On a problem calls `fail` and returns its result.
bool ParseRequirement(pugi::xml_node node, const SourceLocation& where, const RequirementFail& fail,
                      RequirementSpec* out);

/// Checks, once the whole file is read, that every where-expression uses only
/// parameters the sweep sets (fixed, swept or derived); the message names the
/// <require> element's file:line and suggests the closest name.
bool CheckRequirementNames(const SweepSpec& spec, Diagnostic* error);

}  // namespace zvsmap
