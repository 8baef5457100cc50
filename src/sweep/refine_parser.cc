#include "sweep/refine_parser.h"

#include <algorithm>
#include <cmath>

#include "core/spice_number.h"
#include "core/text.h"

namespace zvsmap {

namespace {

// The most halvings of a coarse spacing: 2^10 = 1024 fine steps per coarse one.
constexpr int kMaxLevels = 10;

// The widest spacing between neighbouring values of an axis.
double WidestStep(const std::vector<double>& values) {
  double widest = 0;
  for (size_t k = 1; k < values.size(); ++k) {
    widest = std::max(widest, std::fabs(values[k] - values[k - 1]));
  }
  return widest;
}

}  // namespace

bool ParseRefine(pugi::xml_node node, const SourceLocation& where, const SweepSpec& spec,
                 const RefineFail& fail, RefineSpec* out) {
  for (pugi::xml_attribute a : node.attributes()) {
    std::string name = a.name();
    if (name != "param" && name != "resolution") {
      return fail(a.name(), "unknown attribute '" + name +
                                "' on <refine> (it takes 'param' and 'resolution')");
    }
  }
  out->where = where;
  out->param = Trim(node.attribute("param").value());
  if (!node.attribute("param")) return fail(nullptr, "missing attribute 'param' on <refine>");
  if (out->param.empty()) return fail("param", "empty attribute 'param' on <refine>");
  for (const RefineSpec& earlier : spec.refine) {
    if (SameName(earlier.param, out->param)) {
      return fail("param", "axis '" + out->param + "' is refined twice (first on line " +
                               std::to_string(earlier.where.line) + ")");
    }
  }
  if (!node.attribute("resolution")) {
    return fail(nullptr, "missing attribute 'resolution' on <refine>");
  }
  std::string raw = Trim(node.attribute("resolution").value());
  std::optional<double> v = ParseSpiceNumber(raw);
  if (!v || !std::isfinite(*v)) {
    return fail("resolution", "bad number '" + raw + "' in attribute 'resolution'");
  }
  if (*v <= 0) return fail("resolution", "'resolution' must be positive, got '" + raw + "'");
  out->resolution = *v;
  return true;
}

bool CheckRefineAxes(SweepSpec* spec, Diagnostic* error) {
  auto failed = [&](const RefineSpec& r, const std::string& message) {
    *error = Diagnostic(r.where, message);
    return false;
  };
  for (RefineSpec& r : spec->refine) {
    bool found = false;
    std::vector<std::string> axes;
    for (size_t g = 0; g < spec->groups.size() && !found; ++g) {
      const AxisGroup& group = spec->groups[g];
      for (const AxisSpec& a : group.axes) {
        for (const std::string& role : a.device_roles) {
          if (SameName(role, r.param)) {
            return failed(r, "'" + r.param +
                                 "' is a device axis: its values are switch models, with no "
                                 "spacing to refine");
          }
        }
        if (a.device_roles.empty()) axes.push_back(a.param);
        if (!a.device_roles.empty() || !SameName(a.param, r.param)) continue;
        if (group.lockstep) {
          return failed(r, "axis '" + r.param +
                               "' moves in a <lockstep> group; only a plain <axis> can be refined");
        }
        if (a.values.size() < 2) {
          return failed(r, "axis '" + r.param + "' has one value: nothing to refine between");
        }
        r.group = g;
        r.coarse_step = WidestStep(a.values);
        found = true;
      }
    }
    if (!found) {
      for (const FixedValue& f : spec->fixed) {
        if (SameName(f.param, r.param)) {
          return failed(r, "'" + r.param + "' is held fixed by <set>, not swept by an <axis>");
        }
      }
      for (const DerivedValue& d : spec->derived) {
        if (SameName(d.param, r.param)) {
          return failed(r, "'" + r.param + "' is derived by <derive>, not swept by an <axis>");
        }
      }
      std::string best = ClosestName(r.param, axes);
      return failed(r, "no axis '" + r.param + "' to refine" +
                           (best.empty() ? std::string() : " (did you mean '" + best + "'?)"));
    }
    // Halvings until every fine spacing is at most the resolution (a relative
    // slack of 1e-9 so 2 / 4 = 0.5 counts as reaching 0.5).
    int levels = 0;
    while (levels <= kMaxLevels &&
           r.coarse_step / std::ldexp(1.0, levels) > r.resolution * (1 + 1e-9)) {
      ++levels;
    }
    if (levels == 0) {
      return failed(r, "resolution " + FormatEngineering(r.resolution) + " of axis '" + r.param +
                           "' is not finer than its spacing " + FormatEngineering(r.coarse_step) +
                           ": nothing to refine");
    }
    if (levels > kMaxLevels) {
      return failed(r, "resolution " + FormatEngineering(r.resolution) + " of axis '" + r.param +
                           "' is more than 1024 times finer than its spacing " +
                           FormatEngineering(r.coarse_step) +
                           " (refine a finer coarse grid instead)");
    }
    r.levels = levels;
  }
  return true;
}

}  // namespace zvsmap
