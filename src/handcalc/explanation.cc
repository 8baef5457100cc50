#include "handcalc/explanation.h"

#include <cmath>
#include <cstdio>

#include "core/spice_number.h"

namespace zvsmap {

namespace {

std::string Value(double v) { return std::isnan(v) ? "n/a" : FormatEngineering(v, 4); }

std::string Printf(const char* format, const std::string& a, const std::string& b,
                   const std::string& c, const std::string& d, const std::string& e,
                   const std::string& f, const std::string& g) {
  char buf[512];
  std::snprintf(buf, sizeof buf, format, a.c_str(), b.c_str(), c.c_str(), d.c_str(), e.c_str(),
                f.c_str(), g.c_str());
  return buf;
}

}  // namespace

std::vector<std::string> ExplainHandCalculation(const HandCalculation& calc, const Template& tmpl,
                                                const Variables& resolved) {
  std::vector<std::string> lines;
  const TopologyModel* model = calc.model.empty() ? nullptr : FindTopologyModel(calc.model);
  if (model) {
    lines.push_back("model " + model->Name() + ": " + model->Assumptions());
    ModelContext context;
    context.params = &resolved;
    for (const auto& [input, param] : tmpl.model_bindings) context.bindings[input] = param;
    lines.push_back("inputs:");
    for (const ModelInput& in : model->Inputs()) {
      double v = context.Input(in.name);
      if (std::isnan(v) && !in.required) continue;
      lines.push_back("  " + in.name + " = " + Value(v) + "  (param " + context.ParamOf(in.name) +
                      "; " + in.description + ")");
    }
  } else {
    lines.push_back("no built-in model (the template has no '*@ model'); sweep formulas only");
  }
  for (const CellCalculation& cell : calc.cells) {
    lines.push_back("cell " + cell.cell + ":");
    std::string edge = "-";
    for (const Prediction& p : cell.predictions) {
      if (p.edge != edge) {
        edge = p.edge;
        lines.push_back(edge.empty() ? "  [whole cell]" : "  [" + edge + "]");
      }
      std::string head = "    " + p.name + " = " + Value(p.value);
      if (!p.metric.empty()) head += "   (vs simulated " + p.metric + ")";
      lines.push_back(head);
      lines.push_back("        " + p.formula + "   [" + p.source + "]");
      for (const std::string& step : p.steps) lines.push_back("        " + step);
    }
  }
  return lines;
}

std::vector<std::string> ExplainComparison(const HandCalculation& calc,
                                           const std::vector<EdgeMeasurement>& edges) {
  std::vector<std::string> lines;
  const char* kRow = "  %-28s %-16s %12s %12s %12s %9s  %s";
  for (const EdgeMeasurement& e : edges) {
    lines.push_back(e.cell + "." + e.edge + " (simulated ZVS class: " + ZvsClassName(e.zvs) + ")");
    lines.push_back(Printf(kRow, "prediction", "metric", "predicted", "simulated", "difference",
                           "relative", "tolerance"));
    for (const CellCalculation& cell : calc.cells) {
      if (cell.cell != e.cell) continue;
      for (const Prediction& p : cell.predictions) {
        if (p.edge != e.edge || p.metric.empty()) continue;
        double sim = SimulatedValue(e, p.metric), diff = sim - p.value;
        std::string rel = "n/a";
        if (!std::isnan(diff) && p.value != 0) {
          char buf[32];
          std::snprintf(buf, sizeof buf, "%+.2f %%", 100 * diff / std::fabs(p.value));
          rel = buf;
        }
        std::string verdict = std::isnan(p.value) ? "not predicted"
                              : p.tolerance.Exceeded(p.value, sim)
                                  ? "BEYOND " + p.tolerance.Describe()
                                  : "ok (" + p.tolerance.Describe() + ")";
        lines.push_back(
            Printf(kRow, p.name, p.metric, Value(p.value), Value(sim), Value(diff), rel, verdict));
      }
    }
  }
  return lines;
}

}  // namespace zvsmap
