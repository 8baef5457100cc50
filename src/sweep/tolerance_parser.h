// Reads the <tolerances> block of a sweep file and checks it against the
// sweep's axes (README "Tolerances and yield").
#pragma once

#include <functional>
#include <pugixml.hpp>
#include <string>

#include "core/diagnostic.h"
#include "sweep/sweep_spec.h"
#include "sweep/tolerance_spec.h"

namespace zvsmap {

/// Reports a problem at `node` (an element of the block): `attribute` is the
/// attribute at fault (nullptr for the element); returns false.
using ToleranceFail =
    std::function<bool(pugi::xml_node node, const char* attribute, const std::string& message)>;
/// Where `node` (an element of the block) starts.
using ToleranceWhere = std::function<SourceLocation(pugi::xml_node node)>;
/// Notes a number with unit letters SPICE ignores (a warning, not fatal).
using ToleranceWarn =
    std::function<void(pugi::xml_node node, const char* attribute, const std::string& message)>;

/// Parses <tolerances seed="N" samples="N" corners="auto|all|none"
/// confidence="95%" pass="class|energy"> with <vary param="NAME" within="10%"|"50n"
/// spread="uniform|normal|corners" sigma="…"/> children: shapes, numbers
/// (judged by JudgeSpiceSpelling), positive widths, known spreads, no
/// parameter twice. Names are checked against the axes by
/// CheckToleranceParams and against the template by CheckParamsKnown.
bool ParseTolerances(pugi::xml_node node, const ToleranceWhere& where, const ToleranceFail& fail,
                     const ToleranceWarn& warn, ToleranceSpec* out);

/// A varied parameter must not be swept by an <axis> (nor a device axis
/// role), nor derived by <derive>; `corners="all"` allows at most 10 varied
/// parameters. False with `error` at the <vary> element otherwise.
bool CheckToleranceParams(const SweepSpec& spec, Diagnostic* error);

/// The most parameters a <tolerances> block may vary.
constexpr int kMaxVaried = 16;

}  // namespace zvsmap
