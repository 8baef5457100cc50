// Reads <refine> elements of a sweep file and checks them against its axes
// (README "Adaptive refinement").
#pragma once

#include <functional>
#include <pugixml.hpp>
#include <string>

#include "core/diagnostic.h"
#include "sweep/refine_spec.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Reports a problem in the element being parsed: `attribute` is the attribute
/// at fault (nullptr for the element); returns false.
using RefineFail = std::function<bool(const char* attribute, const std::string& message)>;

/// Parses one <refine param="NAME" resolution="NUMBER"/>: the shape, the
/// parameter name (not refined twice among `spec.refine`) and a positive
/// resolution. Which axis it names is checked by CheckRefineAxes once the
/// whole file is read. On a problem calls `fail` and returns its result.
bool ParseRefine(pugi::xml_node node, const SourceLocation& where, const SweepSpec& spec,
                 const RefineFail& fail, RefineSpec* out);

/// Checks every <refine> of `spec` against the sweep's axes and fills each
/// one's group, coarse step and levels: the parameter must be a plain numeric
/// axis of at least two values (not a fixed or derived value, a device axis or
/// a lockstep axis), the resolution finer than the axis's widest spacing and
/// at most 2^10 times finer. False with `error` (at the element) otherwise.
bool CheckRefineAxes(SweepSpec* spec, Diagnostic* error);

}  // namespace zvsmap
