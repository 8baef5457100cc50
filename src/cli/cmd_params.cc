// `zvsmap params SWEEP|TEMPLATE`: what a template offers a sweep file — its
// .params (defaults, expressions, which annotations read them), its cells and
// edges, the metric names a <require> or <predict> can name, the hand
// calculation's predictions and the switch models available.
#include <algorithm>
#include <cstdio>
#include <string>

#include "result/edge_metrics.h"
#include "cli/commands.h"
#include "cli/exit_codes.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "handcalc/hand_calculation.h"
#include "netlist/device_models.h"
#include "netlist/param_listing.h"
#include "netlist/render.h"
#include "sweep/sweep_parser.h"

namespace zvsmap::cli {

namespace {

bool EndsWith(const std::string& s, const std::string& tail) {
  return s.size() >= tail.size() && s.compare(s.size() - tail.size(), tail.size(), tail) == 0;
}

// How the sweep file sets each parameter it names ("axis", "fixed", "derived").
std::string SetBySweep(const SweepSpec& spec, const std::string& param) {
  for (const FixedValue& f : spec.fixed) {
    if (SameName(f.param, param)) return "fixed " + FormatEngineering(f.value, 6);
  }
  for (const AxisGroup& g : spec.groups) {
    for (const AxisSpec& a : g.axes) {
      if (SameName(a.param, param)) return "axis, " + std::to_string(a.values.size()) + " values";
    }
  }
  for (const DerivedValue& d : spec.derived) {
    if (SameName(d.param, param)) return "derived " + d.expression;
  }
  return "";
}

void PrintParams(const Template& tmpl, const SweepSpec* spec) {
  std::vector<std::string> inputs;
  if (const TopologyModel* model = FindTopologyModel(tmpl.model)) {
    for (const ModelInput& in : model->Inputs()) inputs.push_back(in.name);
  }
  std::vector<ParamListing> list = ListParams(tmpl, inputs);
  size_t width = 4;
  for (const ParamListing& p : list) width = std::max(width, p.name.size());
  std::printf(".params (%zu; name = default, line, what reads it):\n", list.size());
  for (const ParamListing& p : list) {
    std::string uses;
    for (const std::string& u : p.uses) uses += (uses.empty() ? "" : "; ") + u;
    std::string set = spec ? SetBySweep(*spec, p.name) : "";
    if (!set.empty()) uses += (uses.empty() ? "" : "; ") + std::string("sweep: ") + set;
    std::string value = p.computed ? "{" + p.expression + "}" : p.expression;
    if (value.size() > 12) value += "\n   " + std::string(width + 15, ' ');
    std::printf("  %-*s = %-12s line %-4d %s%s\n", static_cast<int>(width), p.name.c_str(),
                value.c_str(), p.where.line, p.computed ? "(computed) " : "", uses.c_str());
  }
  std::printf("  period: %s\n", tmpl.period_expression.c_str());
}

void PrintCells(const Template& tmpl) {
  std::printf("\ncells and edges (name an edge as CELL.EDGE, or EDGE for every cell):\n");
  for (const CellSpec& c : tmpl.cells) {
    std::printf("  %s: node %s between %s (high switch %s) and %s (low switch %s)\n",
                c.name.c_str(), c.node.c_str(), c.rail_high.c_str(), c.high.c_str(),
                c.rail_low.c_str(), c.low.c_str());
    std::printf("    %s.high_on  node rises, dead time %s\n", c.name.c_str(),
                c.high_dead.empty() ? "(not named)" : c.high_dead.c_str());
    std::printf("    %s.low_on   node falls, dead time %s\n", c.name.c_str(),
                c.low_dead.empty() ? "(not named)" : c.low_dead.c_str());
  }
}

void PrintMetrics(const Template& tmpl, const SweepSpec& spec) {
  std::printf("\nmetrics a <require metric=...> or <predict compare=...> can name:\n ");
  std::printf(" zvs_margin zvs_full");
  for (const std::string& m : EdgeMetricNames()) std::printf(" %s", m.c_str());
  std::printf("\n");
  Variables resolved;
  Diagnostic error;
  HandCalculation calc;
  if (tmpl.model.empty()) {
    std::printf("hand calculation: the template names no `*@ model`\n");
    return;
  }
  if (!ResolveParams(tmpl, {}, &resolved, &error)) return;
  ComputeHandCalculation(spec, tmpl, resolved, &calc, &error);
  std::printf(
      "hand calculation (model %s): names a <predict expr=...> can use besides the "
      ".params, and the metric each pairs with:\n",
      tmpl.model.c_str());
  std::string line;
  for (const CellCalculation& cell : calc.cells) {
    for (const Prediction& p : cell.predictions) {
      if (p.user) continue;
      std::string item = p.name + (p.metric.empty() ? "" : " (-> " + p.metric + ")");
      if (line.size() + item.size() > 96) {
        std::printf("  %s\n", line.c_str());
        line.clear();
      }
      line += (line.empty() ? "" : ", ") + item;
    }
    break;  // every cell has the same names
  }
  if (!line.empty()) std::printf("  %s\n", line.c_str());
}

void PrintSwitchModels(const SweepSpec* spec) {
  std::printf("\nswitch models (<device model=...>), from %s:\n", GenericLibraryPath().c_str());
  std::vector<SubcktInfo> generic;
  std::string error;
  if (!ScanSubckts(GenericLibraryPath(), &generic, &error)) {
    std::printf("  (cannot read it: %s)\n", error.c_str());
  }
  for (const SubcktInfo& s : generic) {
    std::string params;
    for (const std::string& p : s.params) params += " " + p;
    std::printf("  %s  params:%s\n", s.name.c_str(), params.c_str());
  }
  if (!spec || spec->devices.empty()) return;
  std::printf("the sweep's <device>s:\n");
  for (const DeviceSpec& d : spec->devices) {
    std::printf("  %s  subcircuit %s%s%s\n", d.name.c_str(), d.subckt.c_str(),
                d.generic ? " (generic)" : " in ", d.generic ? "" : d.file_as_written.c_str());
  }
}

}  // namespace

void AddParamsCommand(CLI::App& app, int* exit_code) {
  auto path = std::make_shared<std::string>();
  CLI::App* cmd = app.add_subcommand(
      "params", "List a template's parameters, cells, edges, metric names and switch models");
  cmd->add_option("file", *path, "Sweep file (.xml) or netlist template")->required();
  cmd->callback([path, exit_code] {
    SweepSpec spec;
    Diagnostic error;
    bool is_sweep = EndsWith(Lower(*path), ".xml");
    std::string template_path = *path;
    if (is_sweep) {
      if (!ParseSweepFile(*path, &spec, &error)) {
        PrintErrors({error});
        *exit_code = kExitBadInput;
        return;
      }
      template_path = spec.template_path;
    }
    Template tmpl;
    if (!LoadTemplate(template_path, &tmpl, &error)) {
      PrintErrors({error});
      *exit_code = kExitBadInput;
      return;
    }
    std::printf("template %s%s\n\n", template_path.c_str(),
                tmpl.model.empty() ? "" : (" (hand-calculation model " + tmpl.model + ")").c_str());
    PrintParams(tmpl, is_sweep ? &spec : nullptr);
    PrintCells(tmpl);
    PrintMetrics(tmpl, spec);
    PrintSwitchModels(is_sweep ? &spec : nullptr);
    *exit_code = kExitOk;
  });
}

}  // namespace zvsmap::cli
