#include "sweep/sweep_expand.h"

#include "core/expression.h"

namespace zvsmap {

bool ExpandPointAt(const SweepSpec& spec, const std::vector<size_t>& digit, size_t index,
                   Point* point, Diagnostic* error) {
  Point p;
  p.index = index;
  p.grid.assign(digit.begin(), digit.end());
  for (const FixedValue& f : spec.fixed) p.values.push_back({f.param, f.value});
  for (size_t g = 0; g < spec.groups.size(); ++g) {
    for (const AxisSpec& a : spec.groups[g].axes) {
      if (!a.device_roles.empty()) {
        // A device axis sets no parameter: it picks each role's switch model.
        for (const auto& role : a.device_roles)
          p.devices.emplace_back(role, a.device_names[digit[g]]);
        continue;
      }
      p.values.push_back({a.param, a.values[digit[g]]});
    }
  }
  for (const DerivedValue& d : spec.derived) {
    // Every value of the point so far is visible, under the name the sweep
    // file gives it (muParser names are case-sensitive).
    Variables vars;
    for (const ParamValue& v : p.values) vars[v.name] = v.value;
    double value = 0;
    std::string message;
    int column = 0;
    if (!EvaluateExpression(d.expression, vars, &value, &message, &column)) {
      error->where = d.where;
      error->message = "cannot evaluate '" + d.expression + "' for '" + d.param + "' at point " +
                       std::to_string(index) + " (" + p.Describe() + "): " + message;
      error->source_line.clear();
      return false;
    }
    p.values.push_back({d.param, value});
  }
  *point = std::move(p);
  return true;
}

bool ExpandSweep(const SweepSpec& spec, std::vector<Point>* points, Diagnostic* error) {
  points->clear();
  // Check the size before allocating anything: a grid of a billion points
  // should be a message, not an out-of-memory crash.
  size_t n = spec.GridSize();
  if (n > spec.max_points) {
    error->where = spec.limits_where;
    if (error->where.file.empty()) error->where.file = spec.path;
    error->message = "sweep has " + std::to_string(n) + " points, more than the limit of " +
                     std::to_string(spec.max_points) +
                     " (raise <limits max-points> or use --max-points)";
    error->source_line.clear();
    return false;
  }
  points->reserve(n);
  std::vector<size_t> digit(spec.groups.size(), 0);
  for (size_t index = 0; index < n; ++index) {
    // Mixed-radix digits, the last group fastest (like nested loops).
    size_t rest = index;
    for (size_t g = spec.groups.size(); g-- > 0;) {
      size_t size = spec.groups[g].size();
      digit[g] = rest % size;
      rest /= size;
    }
    Point p;
    if (!ExpandPointAt(spec, digit, index, &p, error)) {
      points->clear();
      return false;
    }
    points->push_back(std::move(p));
  }
  return true;
}

}  // namespace zvsmap
