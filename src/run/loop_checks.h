// The up-front checks of a sweep's loop (`<simulation loop=...>` against the
// template's `*@ control` / `*@ regulate`), before anything is simulated.
#pragma once

#include <vector>

#include "core/diagnostic.h"
#include "netlist/template.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Problems, each at its file:line: loop="regulated" on a template without a
/// control; a regulated sweep that also sets the control parameter itself (an
/// axis, a fixed value or a derived value); a switching period that depends on
/// the control (the solve keeps the period fixed), seen at the first point.
std::vector<Diagnostic> CheckLoop(const SweepSpec& spec, const Template& tmpl,
                                  const std::vector<Point>& points);

}  // namespace zvsmap
