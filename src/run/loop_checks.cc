#include "run/loop_checks.h"

#include <cmath>

#include "core/spice_number.h"
#include "core/text.h"
#include "netlist/render.h"

namespace zvsmap {

namespace {

// Where the sweep itself sets parameter `name` (an axis, a fixed or a derived
// value, a tolerance), or nullptr.
const SourceLocation* WhereSweepSets(const SweepSpec& spec, const std::string& name) {
  for (const auto& g : spec.groups) {
    for (const auto& a : g.axes) {
      if (SameName(a.param, name)) return &a.where;
    }
  }
  for (const auto& f : spec.fixed) {
    if (SameName(f.param, name)) return &f.where;
  }
  for (const auto& d : spec.derived) {
    if (SameName(d.param, name)) return &d.where;
  }
  for (const auto& v : spec.tolerances.vary) {
    if (!v.OnDevice() && SameName(v.param, name)) return &v.where;
  }
  return nullptr;
}

// True when the period at `point` changes when the control moves by a
// hundredth of its range.
bool PeriodFollowsControl(const Template& tmpl, const Point& point) {
  Variables base, moved;
  Diagnostic ignored;
  double t0 = 0, t1 = 0;
  if (!ResolveParams(tmpl, point.values, &base, &ignored) ||
      !ResolvePeriod(tmpl, base, &t0, &ignored)) {
    return false;  // CheckPoints reports an unresolvable point
  }
  const RegulationSpec& r = tmpl.regulation;
  std::vector<ParamValue> values = point.values;
  values.push_back({r.param, base.at(r.param) + 0.01 * (r.max - r.min)});
  if (!ResolveParams(tmpl, values, &moved, &ignored) ||
      !ResolvePeriod(tmpl, moved, &t1, &ignored)) {
    return false;
  }
  return std::fabs(t1 - t0) > 1e-12 * std::fabs(t0);
}

}  // namespace

std::vector<Diagnostic> CheckLoop(const SweepSpec& spec, const Template& tmpl,
                                  const std::vector<Point>& points) {
  std::vector<Diagnostic> out;
  const RegulationSpec& r = tmpl.regulation;
  if (spec.simulation.loop == SimulationSettings::Loop::kRegulated && !r.declared()) {
    out.push_back({spec.simulation.where,
                   "loop=\"regulated\" needs a template that declares its control and the "
                   "quantity it regulates ('*@ control <param> min= max=' and '*@ regulate "
                   "v(<node>) target=<param>'); " +
                       tmpl.path + " declares neither",
                   {}});
    return out;
  }
  if (!RunsRegulated(r, spec.simulation)) return out;
  if (const SourceLocation* where = WhereSweepSets(spec, r.param)) {
    out.push_back({*where,
                   "'" + r.param +
                       "' is the template's control parameter: in a regulated loop "
                       "the solve sets it to hold " +
                       r.vector + " at '" + r.target +
                       "'; to set it yourself, use <simulation loop=\"open\"/>",
                   {}});
  }
  if (!points.empty() && PeriodFollowsControl(tmpl, points.front())) {
    out.push_back({r.control_where,
                   "the switching period depends on the control parameter '" + r.param +
                       "', which a regulated loop moves while the period stays fixed; use "
                       "<simulation loop=\"open\"/> or a period that does not depend on it",
                   {}});
  }
  return out;
}

}  // namespace zvsmap
