#include "run/sweep_checks.h"

#include <algorithm>
#include <cctype>
#include <fstream>
#include <sstream>

#include "result/edge_metrics.h"
#include "run/loop_checks.h"
#include "core/source_text.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "handcalc/hand_calculation.h"
#include "netlist/render.h"
#include "run/point_checks.h"
#include "run/point_evaluator.h"

namespace zvsmap {

namespace {

std::string ReadAll(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream buffer;
  if (in) buffer << in.rdbuf();
  return buffer.str();
}

std::string Join(const std::vector<std::string>& names) {
  std::string out;
  for (const std::string& n : names) out += (out.empty() ? "" : ", ") + n;
  return out;
}

// " (did you mean 'x'?; known: a, b, c)" for an unknown name.
std::string Hint(const std::string& name, const std::vector<std::string>& known,
                 const std::string& what) {
  std::string best = ClosestName(name, known);
  return " (" + (best.empty() ? std::string() : "did you mean '" + best + "'? ") + what + ": " +
         Join(known) + ")";
}

bool Contains(const std::vector<std::string>& names, const std::string& name, bool any_case) {
  return std::any_of(names.begin(), names.end(), [&](const std::string& n) {
    return any_case ? SameName(n, name) : n == name;
  });
}

// A .param value that is one number as written ("500k", "1e-3", "10uH").
bool IsPlainLiteral(const std::string& value) {
  if (value.empty()) return false;
  if (!(std::isdigit(static_cast<unsigned char>(value[0])) || value[0] == '.')) return false;
  return std::all_of(value.begin(), value.end(), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '.' || c == '+' || c == '-';
  });
}

}  // namespace

std::vector<Diagnostic> CheckTemplateNumbers(const Template& tmpl) {
  std::vector<Diagnostic> problems;
  SourceText source(tmpl.path);
  for (const ParamDecl& p : tmpl.params) {
    if (!IsPlainLiteral(p.expression)) continue;
    NumberSpelling spelling = JudgeSpiceSpelling(p.expression);
    if (spelling.kind == NumberSpelling::Kind::kPlain) continue;
    std::string message = ".param " + p.name + ": " + spelling.message;
    if (spelling.kind == NumberSpelling::Kind::kUnitNote) {
      message = ".param " + p.name + ": '" + p.expression +
                "' has unit letters, which a template .param may not have (zvsmap evaluates "
                "its value as an expression); write '" +
                spelling.plain + "'";
    }
    int name_at = source.FindWord(p.where.line, p.name);
    int column = source.FindWord(p.where.line, p.expression, name_at > 0 ? name_at : 1);
    problems.push_back(source.At(p.where.line, column, message));
  }
  return problems;
}

std::vector<std::string> RequirableMetrics(const SweepSpec& spec, const Template& tmpl,
                                           const std::string& cell, const std::string& edge,
                                           const Variables& resolved) {
  std::vector<std::string> names = EdgeMetricNames();
  names.push_back("zvs_margin");
  if (resolved.empty()) return names;
  // The prediction columns exactly as AddPredictionMetrics adds them.
  for (const CellSpec& c : tmpl.cells) {
    if (!cell.empty() && !SameName(c.name, cell)) continue;
    std::vector<EdgeMeasurement> edges(1);
    edges[0].cell = c.name;
    edges[0].edge = edge;
    Diagnostic ignored;
    AddPredictionMetrics(spec, tmpl, resolved, &edges, &ignored);
    for (const Metric& m : edges[0].metrics) {
      if (!Contains(names, m.column, false)) names.push_back(m.column);
    }
    for (const Comparison& comparison : edges[0].comparisons) {
      for (const FlatColumn& f : FlatColumns(comparison)) {
        if (!Contains(names, f.name, false)) names.push_back(f.name);
      }
    }
  }
  return names;
}

std::vector<Diagnostic> CheckResultNames(const SweepSpec& spec, const Template& tmpl,
                                         const std::vector<Point>& points,
                                         const std::string& sweep_text) {
  static const std::vector<std::string> kEdges = {"high_on", "low_on"};
  SourceText source(spec.path, sweep_text);
  std::vector<Diagnostic> problems;
  auto fail = [&](const SourceLocation& element, const char* attribute,
                  const std::string& message) {
    SourceLocation at = source.FindAttribute(element, attribute);
    problems.push_back(source.At(at.line, at.column, message));
  };
  std::vector<std::string> cells;
  for (const CellSpec& c : tmpl.cells) cells.push_back(c.name);
  Variables resolved;
  Diagnostic ignored;
  if (!points.empty() && !ResolveParams(tmpl, points.front().values, &resolved, &ignored)) {
    resolved.clear();  // CheckPoints reports it
  }

  for (const RequirementSpec& r : spec.requirements) {
    if (!r.cell.empty() && !Contains(cells, r.cell, true)) {
      fail(r.where, "edge",
           "<require> names cell '" + r.cell + "', which the template does not declare" +
               Hint(r.cell, cells, "cells"));
      continue;
    }
    if (!Contains(kEdges, r.edge, false)) {
      fail(r.where, "edge",
           "<require> names edge '" + r.edge + "', which no cell has" +
               Hint(r.edge, kEdges, "edges"));
      continue;
    }
    if (r.kind != RequirementSpec::Kind::kMetric) continue;
    std::vector<std::string> metrics = RequirableMetrics(spec, tmpl, r.cell, r.edge, resolved);
    if (!Contains(metrics, r.metric, false)) {
      fail(r.where, "metric",
           "<require> names metric '" + r.metric + "', which no " + r.edge + " edge has" +
               Hint(r.metric, metrics, "metrics"));
    }
  }

  std::vector<std::string> comparable = EdgeMetricNames();
  comparable.push_back("zvs_full");
  for (const PredictionSpec& p : spec.predictions) {
    if (!p.cell.empty() && !Contains(cells, p.cell, false)) {
      fail(p.where, "cell",
           "<predict> names cell '" + p.cell + "', which the template does not declare" +
               Hint(p.cell, cells, "cells"));
    }
    if (!p.compare.empty() && !Contains(comparable, p.compare, false)) {
      fail(p.where, "compare",
           "<predict compare=...> names no metric column: '" + p.compare + "'" +
               Hint(p.compare, comparable, "columns"));
    }
  }
  return problems;
}

bool CheckSweepUpFront(PreparedSweep* sweep, std::vector<Diagnostic>* errors) {
  sweep->warnings = sweep->spec.warnings;
  std::vector<Diagnostic> found = CheckTemplateNumbers(sweep->tmpl);
  const std::string sweep_text = ReadAll(sweep->spec.path);
  std::vector<Diagnostic> names =
      CheckResultNames(sweep->spec, sweep->tmpl, sweep->points, sweep_text);
  found.insert(found.end(), names.begin(), names.end());
  std::vector<Diagnostic> loop = CheckLoop(sweep->spec, sweep->tmpl, sweep->points);
  found.insert(found.end(), loop.begin(), loop.end());
  if (found.empty()) {
    // Points are evaluated only when the names are right (else every point
    // would repeat the same problem).
    PointEvaluator evaluator(sweep->spec, sweep->tmpl);
    found = CheckPoints(sweep->spec, sweep->tmpl, sweep->points, evaluator, sweep_text);
  }
  errors->insert(errors->end(), found.begin(), found.end());
  return found.empty();
}

}  // namespace zvsmap
