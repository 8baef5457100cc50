// Text for `zvsmap explain`: the hand calculation step by step, and the
// predictions beside the simulated values.
#pragma once

#include <string>
#include <vector>

#include "core/expression.h"
#include "handcalc/hand_calculation.h"
#include "netlist/template.h"
#include "result/edge_metrics.h"

namespace zvsmap {

/// Lines (no trailing newline): the model and its assumptions, its inputs with
/// the template parameter each comes from and its value, then per cell every
/// prediction with its formula, source and intermediate steps.
std::vector<std::string> ExplainHandCalculation(const HandCalculation& calc, const Template& tmpl,
                                                const Variables& resolved);

/// Lines: per measured edge, each prediction paired with a metric: predicted,
/// simulated, difference, relative difference, tolerance and "ok"/"BEYOND".
std::vector<std::string> ExplainComparison(const HandCalculation& calc,
                                           const std::vector<EdgeMeasurement>& edges);

}  // namespace zvsmap
