#include "run/sweep_setup.h"

#include <algorithm>
#include <cmath>

#include "core/text.h"
#include "handcalc/hand_calculation.h"
#include "netlist/deck_names.h"
#include "netlist/deck_rules.h"
#include "run/sweep_checks.h"
#include "netlist/wiring_checks.h"
#include "run/solver_ladder.h"
#include "sweep/sweep_expand.h"
#include "sweep/sweep_parser.h"
#include "sweep/tolerance_expand.h"
#include "netlist/render.h"

namespace zvsmap {

namespace {

// The nominal value of each <vary device=...> (NaN for a template
// parameter): its device's setting or its subcircuit's default, checked
// (declared, a plain number) before anything runs.
bool DeviceParamNominals(const PreparedSweep& sweep, std::vector<double>* out,
                         Diagnostic* error) {
  for (const VarySpec& v : sweep.spec.tolerances.vary) {
    out->push_back(NAN);
    if (!v.OnDevice()) continue;
    auto named = [&](const ResolvedDevice& d) { return SameName(d.spec.name, v.device); };
    auto device = std::find_if(sweep.devices.begin(), sweep.devices.end(), named);
    std::string why = "is not declared";
    if (device == sweep.devices.end() ||
        !DeviceParamNominal(*device, v.param, &out->back(), &why)) {
      *error = Diagnostic(v.where, "device '" + v.device + "': " + why);
      return false;
    }
    if (v.relative && out->back() == 0) {
      *error = Diagnostic(v.where, "device '" + v.device + "': '" + v.param +
                                       "' is 0, so a relative 'within' moves it nowhere; give "
                                       "an amount (within=\"50n\") instead of a percentage");
      return false;
    }
  }
  return true;
}

// The tolerance variants of every nominal point (sweep/tolerance_expand.h),
// around each varied parameter's value at that point: the point's own, else
// the template's (resolved like the deck will be).
bool AddToleranceVariants(PreparedSweep* out, Diagnostic* error) {
  const ToleranceSpec& tol = out->spec.tolerances;
  if (!tol.used) return true;
  std::vector<double> device_nominal;
  if (!DeviceParamNominals(*out, &device_nominal, error)) return false;
  std::vector<std::vector<double>> nominal_values;
  for (const Point& p : out->points) {
    Variables resolved;
    if (!ResolveParams(out->tmpl, p.values, &resolved, error)) return false;
    std::vector<double> row;
    for (size_t j = 0; j < tol.vary.size(); ++j) {
      const VarySpec& v = tol.vary[j];
      if (v.OnDevice()) {
        row.push_back(device_nominal[j]);
        continue;
      }
      auto it = resolved.find(Lower(v.param));
      if (it == resolved.end()) {
        *error = Diagnostic(v.where, "the template gives no value for '" + v.param + "'");
        return false;
      }
      row.push_back(it->second);
    }
    nominal_values.push_back(std::move(row));
  }
  return ExpandTolerances(tol, nominal_values, out->spec.max_points, &out->points, error);
}

}  // namespace

bool PrepareSweep(const std::string& sweep_path, size_t max_points_override, PreparedSweep* out,
                  std::vector<Diagnostic>* errors) {
  Diagnostic error;
  if (!ParseSweepFile(sweep_path, &out->spec, &error)) {
    errors->push_back(error);
    return false;
  }
  if (!CheckSolverAidSetting(out->spec, errors)) return false;
  if (max_points_override > 0) out->spec.max_points = max_points_override;
  std::string why;
  if (!CheckFileName(out->spec.template_path, &why)) {
    errors->push_back(Diagnostic{out->spec.template_where, "template: " + why, {}});
    return false;
  }
  if (!LoadTemplate(out->spec.template_path, &out->tmpl, &error)) {
    errors->push_back(error);
    return false;
  }
  std::vector<Diagnostic> unknown = CheckParamsKnown(out->spec, out->tmpl.ParamNames());
  if (!unknown.empty()) {
    errors->insert(errors->end(), unknown.begin(), unknown.end());
    return false;
  }
  if (!ResolveSweepDevices(out->spec, out->tmpl, &out->devices, errors)) return false;
  if (!CheckDeckNames(out->tmpl, out->devices, errors)) return false;
  std::vector<Diagnostic> wiring = CheckWiring(out->tmpl, out->devices);
  if (!wiring.empty()) {
    errors->insert(errors->end(), wiring.begin(), wiring.end());
    return false;
  }
  if (!ExpandSweep(out->spec, &out->points, &error)) {
    errors->push_back(error);
    return false;
  }
  if (!AddToleranceVariants(out, &error)) {
    errors->push_back(error);
    return false;
  }
  // Hand-calculation models and <predict> formulas are checked before any
  // simulation, so a typo does not surface as a note on every point.
  std::vector<Diagnostic> predictions = CheckPredictions(out->spec, out->tmpl, out->points);
  if (!predictions.empty()) {
    errors->insert(errors->end(), predictions.begin(), predictions.end());
    return false;
  }
  if (!CheckSweepUpFront(out, errors)) return false;
  out->refinement = StartRefinement(&out->spec, &out->points);
  return true;
}

}  // namespace zvsmap
