#include "handcalc/hand_calculation.h"

#include <cctype>
#include <cmath>
#include <fstream>
#include <map>

#include "core/spice_number.h"
#include "core/text.h"
#include "netlist/render.h"

namespace zvsmap {

namespace {

// Line `line` (1-based) of a file, or "" (e.g. a sweep parsed from text).
std::string FileLine(const std::string& path, int line) {
  std::ifstream in(path);
  std::string text;
  for (int k = 0; k < line && std::getline(in, text); ++k) {
  }
  if (!in) return "";
  if (!text.empty() && text.back() == '\r') text.pop_back();
  return text;
}

// A problem in a <predict> expression: file:line, and when the sweep file can
// be read, its line with a caret under column `column` of the expression.
Diagnostic ExpressionError(const PredictionSpec& p, int column, const std::string& message) {
  Diagnostic d;
  d.where = p.where;
  d.message = message;
  std::string line = FileLine(p.where.file, p.expr_where.line);
  if (line.empty() || p.expr_where.line != p.where.line || column <= 0) return d;
  size_t quote =
      line.find_first_of("\"'", static_cast<size_t>(std::max(0, p.expr_where.column - 1)));
  if (quote == std::string::npos) return d;
  size_t indent = std::min(line.find_first_not_of(" \t"), line.size());
  d.source_line = line.substr(indent);
  d.where.column = static_cast<int>(quote + 1 - indent) + column;
  return d;
}

// Evaluates one <predict> at a point. `known` maps lower-case names to values
// and to the spelling they were declared with (for did-you-mean).
struct Known {
  double value;
  std::string spelling;
};

bool EvaluatePrediction(const PredictionSpec& p, const std::map<std::string, Known>& known,
                        double* value, std::vector<std::string>* steps, Diagnostic* error) {
  Variables vars;
  std::vector<std::string> zero, missing_values;
  for (const std::string& name : p.names) {
    auto it = known.find(Lower(name));
    if (it == known.end()) continue;  // the evaluator names it, with its column
    vars[name] = it->second.value;
    steps->push_back(name + " = " +
                     (std::isnan(it->second.value) ? std::string("n/a")
                                                   : FormatEngineering(it->second.value, 6)));
    if (std::isnan(it->second.value)) missing_values.push_back(name);
    if (it->second.value == 0) zero.push_back(name);
  }
  std::string message;
  int column = 0;
  bool unknown = p.names.size() != vars.size();
  if (!unknown && !missing_values.empty()) {
    // The model gives no value here (e.g. no ZVS, so no transition time).
    *value = NAN;
    steps->push_back(p.name + " = n/a (" + missing_values.front() + " is n/a)");
    return true;
  }
  if (EvaluateExpression(p.expression, vars, value, &message, &column)) {
    steps->push_back(p.name + " = " + p.expression + " = " + FormatEngineering(*value, 6));
    return true;
  }
  *value = NAN;
  if (message.rfind("unknown name '", 0) == 0) {
    std::string name = message.substr(14, message.size() - 15);
    std::vector<std::string> candidates;
    for (const auto& kv : known) candidates.push_back(kv.second.spelling);
    std::string best = ClosestName(name, candidates);
    if (!best.empty()) message += " (did you mean '" + best + "'?)";
  } else if (message.find("finite") != std::string::npos) {
    message = "'" + p.expression + "' is not a finite number here" +
              (zero.empty() ? std::string(" (division by zero?)")
                            : " (division by zero: " + zero.front() + " = 0)");
    column = 0;
  }
  *error = ExpressionError(
      p, column,
      "prediction '" + p.name + "': " + message +
          (column > 0 ? " (column " + std::to_string(column) + " of the expression)" : ""));
  return false;
}

// A <predict> without `compare`: its value under its own name.
Comparison Unpaired(const Prediction& p) {
  Comparison c;
  c.tag = p.name;
  c.predicted = p.value;
  return c;
}

// A prediction set beside the simulated value `sim` of its metric.
Comparison Compare(const Prediction& p, double sim) {
  Comparison c;
  c.metric = p.metric;
  c.tag = p.user ? p.name : p.tag.empty() ? std::string("pred") : p.tag;
  c.predicted = p.value;
  c.difference = sim - p.value;
  c.relative_difference =
      (p.value != 0 && std::isfinite(p.value)) ? c.difference / std::fabs(p.value) : NAN;
  if (!std::isnan(p.value)) c.beyond_tolerance = p.tolerance.Exceeded(p.value, sim);
  return c;
}

}  // namespace

double SimulatedValue(const EdgeMeasurement& edge, const std::string& metric) {
  if (metric == "zvs_full") return edge.zvs == ZvsClass::kFull ? 1.0 : 0.0;
  return edge.Get(metric);
}

const Prediction* CellCalculation::Find(const std::string& name) const {
  for (const Prediction& p : predictions) {
    if (Lower(p.name) == Lower(name)) return &p;
  }
  return nullptr;
}

bool ComputeHandCalculation(const SweepSpec& spec, const Template& tmpl, const Variables& resolved,
                            HandCalculation* out, Diagnostic* error) {
  *out = HandCalculation();
  out->model = tmpl.model;
  const TopologyModel* model = nullptr;
  if (!tmpl.model.empty()) {
    model = FindTopologyModel(tmpl.model);
    if (!model) {
      std::vector<std::string> names = TopologyModelNames();
      std::string best = ClosestName(tmpl.model, names);
      *error = Diagnostic{tmpl.model_where,
                          "unknown model '" + tmpl.model + "' in '*@ model'" +
                              (best.empty() ? "" : " (did you mean '" + best + "'?)"),
                          {}};
      return false;
    }
    out->assumptions = model->Assumptions();
  }
  bool ok = true;
  for (const CellSpec& cell : tmpl.cells) {
    CellCalculation calc;
    calc.cell = cell.name;
    if (model) {
      ModelContext context;
      context.params = &resolved;
      context.cell = &cell;
      for (const auto& [input, param] : tmpl.model_bindings) context.bindings[input] = param;
      std::string message;
      if (!model->Predict(context, &calc.predictions, &message)) {
        *error = Diagnostic{tmpl.model_where, message, {}};
        return false;
      }
    }
    // Names an expression may use: parameters, then the model's predictions,
    // then earlier <predict>s (a later definition hides an earlier one).
    std::map<std::string, Known> known;
    for (const auto& [name, value] : resolved) {
      const ParamDecl* decl = tmpl.FindParam(name);
      known[Lower(name)] = {value, decl ? decl->name : name};
    }
    for (const Prediction& p : calc.predictions) known[Lower(p.name)] = {p.value, p.name};
    for (const PredictionSpec& spec_p : spec.predictions) {
      if (!spec_p.cell.empty() && spec_p.cell != cell.name) continue;
      Prediction p;
      p.name = spec_p.name;
      p.edge = spec_p.edge;
      p.metric = spec_p.compare;
      p.tolerance = {spec_p.tolerance_rel, spec_p.tolerance_abs};
      p.formula = p.name + " = " + spec_p.expression;
      p.source = spec_p.where.file + ":" + std::to_string(spec_p.where.line);
      p.user = true;
      Diagnostic problem;
      if (!EvaluatePrediction(spec_p, known, &p.value, &p.steps, &problem)) {
        if (ok) *error = problem;
        ok = false;
      }
      known[Lower(p.name)] = {p.value, p.name};
      calc.predictions.push_back(std::move(p));
    }
    out->cells.push_back(std::move(calc));
  }
  return ok;
}

bool AddPredictionMetrics(const SweepSpec& spec, const Template& tmpl, const Variables& resolved,
                          std::vector<EdgeMeasurement>* edges, Diagnostic* error) {
  HandCalculation calc;
  bool ok = ComputeHandCalculation(spec, tmpl, resolved, &calc, error);
  AddComparisons(calc, edges);
  return ok;
}

void AddComparisons(const HandCalculation& calc, std::vector<EdgeMeasurement>* edges) {
  for (EdgeMeasurement& e : *edges) {
    for (const CellCalculation& cell : calc.cells) {
      if (cell.cell != e.cell) continue;
      for (const Prediction& p : cell.predictions) {
        if (!p.edge.empty() && p.edge != e.edge) continue;
        if (p.metric.empty()) {
          if (p.user) e.comparisons.push_back(Unpaired(p));
          continue;
        }
        if (p.edge.empty()) continue;
        e.comparisons.push_back(Compare(p, SimulatedValue(e, p.metric)));
      }
    }
  }
}

std::vector<Diagnostic> CheckPredictions(const SweepSpec& spec, const Template& tmpl,
                                         const std::vector<Point>& points) {
  std::vector<Diagnostic> problems;
  if (points.empty() || (tmpl.model.empty() && spec.predictions.empty())) return problems;
  Variables resolved;
  Diagnostic error;
  if (!ResolveParams(tmpl, points.front().values, &resolved, &error)) return problems;
  for (const PredictionSpec& p : spec.predictions) {
    if (!p.cell.empty()) {
      bool found = false;
      std::vector<std::string> names;
      for (const CellSpec& c : tmpl.cells) {
        found = found || c.name == p.cell;
        names.push_back(c.name);
      }
      if (!found) {
        std::string best = ClosestName(p.cell, names);
        problems.push_back({p.where,
                            "prediction '" + p.name + "': the template has no cell '" + p.cell +
                                "'" + (best.empty() ? "" : " (did you mean '" + best + "'?)"),
                            {}});
      }
    }
  }
  HandCalculation calc;
  if (!ComputeHandCalculation(spec, tmpl, resolved, &calc, &error)) problems.push_back(error);
  return problems;
}

}  // namespace zvsmap
