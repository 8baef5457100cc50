#include "sweep/tolerance_parser.h"

#include <algorithm>
#include <cctype>
#include <cmath>

#include "core/spice_number.h"
#include "core/text.h"

namespace zvsmap {

namespace {

// The full 2^k corner set is allowed up to this many varied parameters.
constexpr int kMaxAllCorners = 10;

class BlockReader {
 public:
  BlockReader(const ToleranceWhere& where, const ToleranceFail& fail, const ToleranceWarn& warn)
      : where_(where), fail_(fail), warn_(warn) {}

  bool Shape(pugi::xml_node node, const std::vector<std::string>& allowed) const {
    std::vector<std::string> seen;
    for (pugi::xml_attribute a : node.attributes()) {
      std::string name = a.name();
      if (std::find(allowed.begin(), allowed.end(), name) == allowed.end()) {
        std::string best = ClosestName(name, allowed);
        return fail_(node, a.name(),
                     "unknown attribute '" + name + "' on <" + node.name() + ">" +
                         (best.empty() ? "" : " (did you mean '" + best + "'?)"));
      }
      if (std::find(seen.begin(), seen.end(), name) != seen.end()) {
        return fail_(node, a.name(),
                     "attribute '" + name + "' given twice on <" + node.name() + ">");
      }
      seen.push_back(name);
    }
    return true;
  }

  // A number, judged like every number of the sweep file; `percent` allows a
  // trailing '%' (then *is_percent says whether it was there).
  bool Number(pugi::xml_node node, const char* name, bool percent, double* value,
              bool* is_percent = nullptr) const {
    std::string raw = Trim(node.attribute(name).value());
    bool has_percent = percent && !raw.empty() && raw.back() == '%';
    std::string number = has_percent ? Trim(raw.substr(0, raw.size() - 1)) : raw;
    NumberSpelling spelling = JudgeSpiceSpelling(number);
    std::string said = "in attribute '" + std::string(name) + "': " + spelling.message;
    if (spelling.kind == NumberSpelling::Kind::kRefused) return fail_(node, name, said);
    if (spelling.kind == NumberSpelling::Kind::kUnitNote) warn_(node, name, said);
    std::optional<double> v = ParseSpiceNumber(number);
    if (!v || !std::isfinite(*v)) {
      return fail_(node, name, "bad number '" + raw + "' in attribute '" + name + "'");
    }
    *value = has_percent ? *v / 100 : *v;
    if (is_percent) *is_percent = has_percent;
    return true;
  }

  bool WholeNumber(pugi::xml_node node, const char* name, double min, double max,
                   double* value) const {
    if (!Number(node, name, false, value)) return false;
    if (*value != std::floor(*value) || *value < min || *value > max) {
      return fail_(node, name,
                   "'" + std::string(name) + "' must be a whole number from " + FormatNumber(min) +
                       " to " + FormatNumber(max) + ", got '" + node.attribute(name).value() + "'");
    }
    return true;
  }

  bool Block(pugi::xml_node node, ToleranceSpec* out) const;
  bool Vary(pugi::xml_node node, const ToleranceSpec& block, VarySpec* out) const;

 private:
  const ToleranceWhere& where_;
  const ToleranceFail& fail_;
  const ToleranceWarn& warn_;
};

bool IsIdentifier(const std::string& s) {
  if (s.empty() || std::isdigit(static_cast<unsigned char>(s[0]))) return false;
  return std::all_of(s.begin(), s.end(), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_';
  });
}

bool IsDeviceLabel(const std::string& s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
  });
}

bool BlockReader::Block(pugi::xml_node node, ToleranceSpec* out) const {
  if (!Shape(node, {"seed", "samples", "corners", "confidence", "pass"})) return false;
  out->used = true;
  out->where = where_(node);
  double v = 0;
  if (node.attribute("samples")) {
    if (!WholeNumber(node, "samples", 0, 100000, &v)) return false;
    out->samples = static_cast<int>(v);
  }
  if (node.attribute("seed")) {
    // Whole numbers up to 2^53 read back exactly from a double.
    if (!WholeNumber(node, "seed", 0, 9007199254740992.0, &v)) return false;
    out->seed = static_cast<uint64_t>(v);
  } else if (out->samples > 0) {
    return fail_(node, nullptr,
                 "<tolerances samples=...> needs a 'seed' (a whole number), so every run draws "
                 "the same samples");
  }
  std::string corners = Trim(node.attribute("corners").value());
  if (!node.attribute("corners") || corners == "auto") {
    out->corners = ToleranceSpec::Corners::kAuto;
  } else if (corners == "all") {
    out->corners = ToleranceSpec::Corners::kAll;
  } else if (corners == "none") {
    out->corners = ToleranceSpec::Corners::kNone;
  } else {
    return fail_(node, "corners",
                 "'corners' must be 'auto', 'all' or 'none', got '" + corners + "'");
  }
  if (node.attribute("confidence")) {
    if (!Number(node, "confidence", true, &out->confidence)) return false;
    if (!(out->confidence >= 0.5 && out->confidence <= 0.9999)) {
      return fail_(node, "confidence",
                   "'confidence' must lie from 50% to 99.99%, got '" +
                       std::string(node.attribute("confidence").value()) + "'");
    }
  }
  std::string pass = Trim(node.attribute("pass").value());
  if (!node.attribute("pass") || pass == "class") {
    out->pass = ToleranceSpec::Pass::kClass;
  } else if (pass == "energy") {
    out->pass = ToleranceSpec::Pass::kEnergy;
  } else {
    return fail_(node, "pass", "'pass' must be 'class' or 'energy', got '" + pass + "'");
  }
  for (pugi::xml_node child : node.children()) {
    if (child.type() != pugi::node_element) {
      return fail_(node, nullptr, "unexpected text in <tolerances>");
    }
    std::string name = child.name();
    if (name != "vary") {
      return fail_(child, nullptr,
                   "unknown element <" + name + "> in <tolerances>" +
                       (ClosestName(name, std::vector<std::string>{"vary"}).empty()
                            ? ""
                            : " (did you mean <vary>?)"));
    }
    if (child.first_child()) return fail_(child, nullptr, "<vary> takes no content");
    VarySpec vary;
    if (!Vary(child, *out, &vary)) return false;
    out->vary.push_back(std::move(vary));
  }
  if (out->vary.empty()) return fail_(node, nullptr, "<tolerances> has no <vary> element");
  if (static_cast<int>(out->vary.size()) > kMaxVaried) {
    return fail_(node, nullptr,
                 "<tolerances> varies " + std::to_string(out->vary.size()) +
                     " parameters, more than " + std::to_string(kMaxVaried));
  }
  if (out->corners == ToleranceSpec::Corners::kAll &&
      static_cast<int>(out->vary.size()) > kMaxAllCorners) {
    return fail_(node, "corners",
                 "corners=\"all\" with " + std::to_string(out->vary.size()) +
                     " varied parameters is " + std::to_string(1L << out->vary.size()) +
                     " corners per point (at most " + std::to_string(kMaxAllCorners) +
                     " parameters; use corners=\"auto\" for the reduced set)");
  }
  if (out->corners == ToleranceSpec::Corners::kNone && out->samples == 0) {
    return fail_(node, nullptr,
                 "<tolerances corners=\"none\"> without 'samples' asks for no variant at all");
  }
  return true;
}

bool BlockReader::Vary(pugi::xml_node node, const ToleranceSpec& block, VarySpec* out) const {
  if (!Shape(node, {"param", "device", "within", "spread", "sigma"})) return false;
  out->where = where_(node);
  out->param = Trim(node.attribute("param").value());
  if (!node.attribute("param")) return fail_(node, nullptr, "missing attribute 'param' on <vary>");
  if (!IsIdentifier(out->param)) {
    return fail_(node, "param",
                 "bad parameter name '" + out->param +
                     "' (letters, digits and '_', not starting with a digit)");
  }
  if (node.attribute("device")) {
    out->device = Trim(node.attribute("device").value());
    if (!IsDeviceLabel(out->device)) {
      return fail_(node, "device",
                   "bad device name '" + out->device +
                       "' (the name of a <device>: letters, digits, '_' and '-')");
    }
    out->param = Lower(out->param);  // subcircuit parameters are matched in lower case
  }
  for (const VarySpec& earlier : block.vary) {
    if (SameName(earlier.param, out->param) && SameName(earlier.device, out->device)) {
      return fail_(node, "param",
                   "parameter '" + out->Label() + "' is varied twice (first on line " +
                       std::to_string(earlier.where.line) + ")");
    }
  }
  if (!node.attribute("within")) {
    return fail_(node, nullptr,
                 "missing attribute 'within' on <vary> (the band's half-width: \"10%\" of the "
                 "nominal value, or an amount such as \"50n\")");
  }
  if (!Number(node, "within", true, &out->within, &out->relative)) return false;
  if (out->within <= 0) {
    return fail_(
        node, "within",
        "'within' must be positive, got '" + std::string(node.attribute("within").value()) + "'");
  }
  if (out->relative && out->within >= 1) {
    return fail_(node, "within",
                 "'within' of 100% or more reaches zero or flips the sign of the value, got '" +
                     std::string(node.attribute("within").value()) + "'");
  }
  std::string spread = Trim(node.attribute("spread").value());
  if (!node.attribute("spread") || spread == "uniform") {
    out->spread = VarySpec::Spread::kUniform;
  } else if (spread == "normal") {
    out->spread = VarySpec::Spread::kNormal;
  } else if (spread == "corners") {
    out->spread = VarySpec::Spread::kCorners;
  } else {
    std::string best =
        ClosestName(spread, std::vector<std::string>{"uniform", "normal", "corners"});
    return fail_(node, "spread",
                 "unknown spread '" + spread + "' (use 'uniform', 'normal' or 'corners')" +
                     (best.empty() ? "" : "; did you mean '" + best + "'?"));
  }
  out->sigma = out->within / 3;
  if (node.attribute("sigma")) {
    if (out->spread != VarySpec::Spread::kNormal) {
      return fail_(node, "sigma", "'sigma' goes with spread=\"normal\"");
    }
    bool sigma_relative = false;
    if (!Number(node, "sigma", true, &out->sigma, &sigma_relative)) return false;
    if (out->sigma <= 0) {
      return fail_(
          node, "sigma",
          "'sigma' must be positive, got '" + std::string(node.attribute("sigma").value()) + "'");
    }
    if (sigma_relative != out->relative) {
      return fail_(node, "sigma",
                   std::string("'sigma' must be written like 'within' (") +
                       (out->relative ? "a percentage" : "an amount, without '%'") + ")");
    }
  }
  return true;
}

}  // namespace

const char* SpreadName(VarySpec::Spread s) {
  switch (s) {
    case VarySpec::Spread::kUniform:
      return "uniform";
    case VarySpec::Spread::kNormal:
      return "normal";
    case VarySpec::Spread::kCorners:
      return "corners";
  }
  return "uniform";
}

const char* PassName(ToleranceSpec::Pass p) {
  return p == ToleranceSpec::Pass::kEnergy ? "energy" : "class";
}

std::string ToleranceSpec::Canonical() const {
  if (!used) return "";
  std::string out = "tolerances seed=" + std::to_string(seed) +
                    " samples=" + std::to_string(samples) + " corners=" +
                    (corners == Corners::kAuto  ? "auto"
                     : corners == Corners::kAll ? "all"
                                                : "none");
  for (const VarySpec& v : vary) {
    out += "\nvary " + Lower(v.Label()) + " within=" + FormatNumber(v.within) +
           (v.relative ? "rel" : "abs") + " spread=" + SpreadName(v.spread) +
           " sigma=" + FormatNumber(v.sigma);
  }
  return out;
}

bool ParseTolerances(pugi::xml_node node, const ToleranceWhere& where, const ToleranceFail& fail,
                     const ToleranceWarn& warn, ToleranceSpec* out) {
  return BlockReader(where, fail, warn).Block(node, out);
}

namespace {

std::string Listed(const std::vector<std::string>& names) {
  std::string out;
  for (const std::string& n : names) out += (out.empty() ? "" : ", ") + n;
  return out;
}

// A <vary device=...> names a declared <device> that some device axis puts
// in the circuit (else the tolerance would change nothing).
bool CheckVariedDevice(const SweepSpec& spec, const VarySpec& v, Diagnostic* error) {
  std::vector<std::string> names;
  for (const DeviceSpec& d : spec.devices) names.push_back(d.name);
  bool declared = std::any_of(names.begin(), names.end(),
                              [&](const std::string& n) { return SameName(n, v.device); });
  if (!declared) {
    std::string best = ClosestName(v.device, names);
    *error = Diagnostic(v.where, "unknown device '" + v.device + "' in <vary device=...> (" +
                                     (names.empty() ? std::string("the sweep declares no <device>")
                                                    : "declared: " + Listed(names)) +
                                     (best.empty() ? "" : "; did you mean '" + best + "'?") + ")");
    return false;
  }
  for (const AxisGroup& g : spec.groups) {
    for (const AxisSpec& a : g.axes) {
      for (const std::string& n : a.device_names) {
        if (SameName(n, v.device)) return true;
      }
    }
  }
  *error = Diagnostic(v.where, "device '" + v.device +
                                   "' is in no <axis device=...>, so no point uses it and "
                                   "varying its '" +
                                   v.param + "' would change nothing");
  return false;
}

}  // namespace

bool CheckToleranceParams(const SweepSpec& spec, Diagnostic* error) {
  for (const VarySpec& v : spec.tolerances.vary) {
    auto failed = [&](const std::string& message) {
      *error = Diagnostic(v.where, message);
      return false;
    };
    if (v.OnDevice()) {
      if (!CheckVariedDevice(spec, v, error)) return false;
      continue;
    }
    for (const AxisGroup& g : spec.groups) {
      for (const AxisSpec& a : g.axes) {
        if (a.device_roles.empty() && SameName(a.param, v.param)) {
          return failed("'" + v.param + "' is a swept axis (line " + std::to_string(a.where.line) +
                        "); a tolerance varies a parameter around each point, so vary one the "
                        "axes do not sweep");
        }
      }
    }
    for (const DerivedValue& d : spec.derived) {
      if (SameName(d.param, v.param)) {
        return failed("'" + v.param + "' is derived by <derive> (line " +
                      std::to_string(d.where.line) +
                      "); vary a parameter it is derived from, or set it with <set>");
      }
    }
  }
  for (const RequirementSpec& r : spec.requirements) {
    bool yield = r.kind == RequirementSpec::Kind::kYield;
    if (!yield && r.kind != RequirementSpec::Kind::kWorstMargin) continue;
    const ToleranceSpec& t = spec.tolerances;
    std::string missing = !t.used ? "a <tolerances> block"
                          : yield && t.samples == 0
                              ? "Monte Carlo samples (<tolerances samples=...>)"
                          : !yield && t.corners == ToleranceSpec::Corners::kNone
                              ? "corners (<tolerances corners=\"auto\"> or \"all\")"
                              : "";
    if (!missing.empty()) {
      *error = Diagnostic(r.where, std::string("<require ") +
                                       (yield ? "yield-min" : "worst-margin-min") + "=...> needs " +
                                       missing);
      return false;
    }
  }
  if (spec.tolerances.used && !spec.refine.empty()) {
    *error = Diagnostic(spec.tolerances.where,
                        "<tolerances> and <refine> in one sweep are not supported yet: refine "
                        "the nominal map first, then run the tolerances on the points you keep");
    return false;
  }
  return true;
}

}  // namespace zvsmap
