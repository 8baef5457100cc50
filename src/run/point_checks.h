// Every expanded point evaluated without simulating it: parameter values,
// dead times, command timing and step counts (README "Checked before a run").
#pragma once

#include <cstddef>
#include <vector>

#include "core/diagnostic.h"
#include "netlist/template.h"
#include "run/point_evaluator.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// With an explicit max-step: fewer steps per period cannot resolve a commutation.
constexpr double kMinStepsPerPeriod = 20;
/// More steps per period than this is a wrong period or step bound, not a choice.
constexpr double kMaxStepsPerPeriod = 1e6;
/// More steps for one point (max-periods settling plus the measured periods).
constexpr double kMaxStepsPerPoint = 1e9;
/// How many failing points one message lists before "and N more".
constexpr size_t kPointsShown = 3;

/// Evaluates each point as the run would, without ngspice, and checks that
/// every .param and the period evaluate (the period finite and > 0); that each
/// cell's dead times are >= 0 and, alone and together, shorter than the period;
/// that the cells' `inductance` and `coss` parameters and the value of every
/// inductor and capacitor outside subcircuits are > 0; that each command
/// source's PULSE (delay, rise, width, fall, period) is >= 0 and fits in its
/// period, which fails when a dead time is longer than the interval it sits
/// in; and that the step count (period against the step bound
/// PointEvaluator::TranFor gives) lies within the limits above. Each problem
/// is reported once, at its template line (or the sweep file's max-step /
/// max-periods), with how many points fail, the first few with their
/// values, and the sweep lines that set those values. `sweep_text` holds the
/// sweep file (for the line and caret).
std::vector<Diagnostic> CheckPoints(const SweepSpec& spec, const Template& tmpl,
                                    const std::vector<Point>& points,
                                    const PointEvaluator& evaluator, const std::string& sweep_text);

}  // namespace zvsmap
