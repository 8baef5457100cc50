// Everything about a sweep that can be checked once, before anything is
// simulated (README "Checked before a run"): number spellings in the template,
// the names requirements and predictions use, and every expanded point.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "core/expression.h"
#include "netlist/template.h"
#include "run/sweep_setup.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// Runs every up-front check on a prepared sweep: CheckTemplateNumbers,
/// CheckResultNames and CheckPoints. Puts the sweep file's and the template's
/// warnings into `sweep->warnings`. Returns false with every problem found
/// appended to `errors`.
bool CheckSweepUpFront(PreparedSweep* sweep, std::vector<Diagnostic>* errors);

/// The template's `.param` values written as one plain number, judged as
/// JudgeSpiceSpelling does; unit letters are refused here too, because zvsmap
/// evaluates a `.param` value as an expression, where letters after a number
/// are not allowed. Each problem at the template's file:line with a caret.
std::vector<Diagnostic> CheckTemplateNumbers(const Template& tmpl);

/// Every name a `<require>` uses (its cell, its edge, its metric column) and a
/// `<predict>` uses (its cell, its `compare` metric) against the template's
/// cells, the edges high_on/low_on and the metric columns the analysis and the
/// hand calculation give (EdgeMetricNames, "zvs_margin", the prediction
/// columns at the first point), with did-you-mean and the known names.
/// `sweep_text` holds the sweep file (for the line and caret).
std::vector<Diagnostic> CheckResultNames(const SweepSpec& spec, const Template& tmpl,
                                         const std::vector<Point>& points,
                                         const std::string& sweep_text);

/// The metric columns a `<require metric=...>` may name on the edges of
/// `cell` ("" = every cell) called `edge`, given a point's resolved values
/// (empty: the edge metrics and "zvs_margin" only).
std::vector<std::string> RequirableMetrics(const SweepSpec& spec, const Template& tmpl,
                                           const std::string& cell, const std::string& edge,
                                           const Variables& resolved);

}  // namespace zvsmap
