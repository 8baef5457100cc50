#include "sweep/requirement_parser.h"

#include <muParser.h>

#include <algorithm>
#include <cctype>
#include <cmath>

#include "core/expression.h"
#include "core/spice_number.h"
#include "core/text.h"

namespace zvsmap {

namespace {

bool IsName(const std::string& s) {
  if (s.empty() || std::isdigit(static_cast<unsigned char>(s[0]))) return false;
  return std::all_of(s.begin(), s.end(), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_';
  });
}

// Syntax-checks a where-expression and lists the names it uses. muParser's
// GetUsedVar parses without needing values for the names.
bool ScanExpression(const std::string& expr, std::vector<std::string>* names,
                    std::string* message) {
  try {
    mu::Parser parser;
    parser.DefineConst("_pi", 3.14159265358979323846);
    parser.SetExpr(NormalizeSpiceExpression(expr));
    for (const auto& kv : parser.GetUsedVar()) names->push_back(kv.first);
    return true;
  } catch (const mu::ParserError& e) {
    *message = e.GetMsg();
    return false;
  }
}

// The number in attribute `name`, judged like every number of the sweep file
// (core/spice_number: "45M" is milli, "2A" atto): false with the reason when
// it is refused or not a number.
bool ReadNumber(pugi::xml_node node, const char* name, const RequirementFail& fail, double* out) {
  std::string raw = Trim(node.attribute(name).value());
  NumberSpelling spelling = JudgeSpiceSpelling(raw);
  if (spelling.kind == NumberSpelling::Kind::kRefused) {
    return fail(name, "in attribute '" + std::string(name) + "': " + spelling.message);
  }
  std::optional<double> v = ParseSpiceNumber(raw);
  if (!v || !std::isfinite(*v)) {
    return fail(name, "bad number '" + raw + "' in attribute '" + std::string(name) + "'");
  }
  *out = *v;
  return true;
}

// dead-time="45n" within-window="true": the dead time to judge against the
// probe's window at every covered point.
bool ParseGivenDeadTime(pugi::xml_node node, const RequirementFail& fail, RequirementSpec* r) {
  r->kind = RequirementSpec::Kind::kGivenDeadTime;
  double v = 0;
  if (!ReadNumber(node, "dead-time", fail, &v)) return false;
  if (v <= 0) {
    return fail("dead-time", "'dead-time' must be > 0 (it is " +
                                 Trim(node.attribute("dead-time").value()) + ")");
  }
  r->dead_time_s = v;
  std::string within = Trim(node.attribute("within-window").value());
  if (!node.attribute("within-window")) {
    return fail("dead-time",
                "'dead-time' needs within-window=\"true\" (the dead time lies "
                "inside the probe's window at every point)");
  }
  if (within != "true") {
    return fail("within-window",
                "'within-window' takes \"true\" (leave the requirement out "
                "otherwise)");
  }
  return true;
}

// yield-min="99%" (a percentage or a fraction up to 1) or
// worst-margin-min="0.05": the bound a tolerance requirement checks.
bool ParseToleranceBound(pugi::xml_node node, bool yield, const RequirementFail& fail,
                         RequirementSpec* r) {
  const char* name = yield ? "yield-min" : "worst-margin-min";
  r->kind = yield ? RequirementSpec::Kind::kYield : RequirementSpec::Kind::kWorstMargin;
  std::string raw = Trim(node.attribute(name).value());
  bool percent = yield && !raw.empty() && raw.back() == '%';
  if (percent) {
    std::string number = Trim(raw.substr(0, raw.size() - 1));
    NumberSpelling spelling = JudgeSpiceSpelling(number);
    std::optional<double> v = ParseSpiceNumber(number);
    if (spelling.kind == NumberSpelling::Kind::kRefused) {
      return fail(name, "in attribute '" + std::string(name) + "': " + spelling.message);
    }
    if (!v || !std::isfinite(*v)) return fail(name, "bad number '" + raw + "' in attribute '" + name + "'");
    r->min = *v / 100;
  } else if (!ReadNumber(node, name, fail, &r->min)) {
    return false;
  }
  if (yield && !(r->min > 0 && r->min <= 1)) {
    return fail(name, "'yield-min' must lie above 0 and at most 100%, got '" + raw + "'");
  }
  return true;
}

}  // namespace

std::string RequirementSpec::Describe() const {
  std::string out = (cell.empty() ? std::string("every cell's ") : cell + ".") + edge;
  switch (kind) {
    case Kind::kClass:
      out += min_class == "full" ? " full ZVS" : " at least partial ZVS";
      break;
    case Kind::kMetric:
      out += " " + metric;
      if (!std::isnan(min)) out += " >= " + FormatEngineering(min);
      if (!std::isnan(min) && !std::isnan(max)) out += " and";
      if (!std::isnan(max)) out += " <= " + FormatEngineering(max);
      break;
    case Kind::kDeadTimeWindow:
      out += " dead time within the measured window";
      break;
    case Kind::kGivenDeadTime:
      out += " dead time " + FormatEngineering(dead_time_s) + "s within the probe's window";
      break;
    case Kind::kYield:
      out += " ZVS yield >= " + FormatNumber(min * 100) + "% at each point";
      break;
    case Kind::kWorstMargin:
      out += " worst-case energy margin >= " + FormatEngineering(min) + " at each point";
      break;
  }
  out += where_expression.empty() ? " over the whole grid" : " where " + where_expression;
  return out;
}

bool ParseRequirement(pugi::xml_node node, const SourceLocation& where, const RequirementFail& fail,
                      RequirementSpec* out) {
  static const std::vector<std::string> kAllowed = {
      "edge",  "class",     "metric",        "min", "max", "dead-time-within-window",
      "where", "dead-time", "within-window", "name", "yield-min", "worst-margin-min"};
  for (pugi::xml_attribute a : node.attributes()) {
    std::string name = a.name();
    if (std::find(kAllowed.begin(), kAllowed.end(), name) == kAllowed.end()) {
      std::string best = ClosestName(name, kAllowed);
      return fail(a.name(), "unknown attribute '" + name + "' on <require>" +
                                (best.empty() ? "" : " (did you mean '" + best + "'?)"));
    }
  }
  RequirementSpec r;
  r.where = where;
  r.name = Trim(node.attribute("name").value());

  std::string edge = Trim(node.attribute("edge").value());
  if (edge.empty())
    return fail(node.attribute("edge") ? "edge" : nullptr,
                "<require> needs 'edge' (\"cell.edge\" or \"edge\")");
  size_t dot = edge.find('.');
  if (dot != std::string::npos) {
    r.cell = edge.substr(0, dot);
    r.edge = edge.substr(dot + 1);
  } else {
    r.edge = edge;
  }
  if ((dot != std::string::npos && !IsName(r.cell)) || !IsName(r.edge)) {
    return fail("edge", "bad edge '" + edge + "' (use \"cell.edge\", e.g. \"leg.high_on\")");
  }
  r.cell = Lower(r.cell);

  bool has_class = node.attribute("class");
  bool has_metric = node.attribute("metric");
  bool has_window = node.attribute("dead-time-within-window");
  bool has_given = node.attribute("dead-time");
  if (node.attribute("within-window") && !has_given) {
    return fail("within-window",
                "'within-window' goes with 'dead-time' (e.g. dead-time=\"45n\" "
                "within-window=\"true\")");
  }
  bool has_yield = node.attribute("yield-min");
  bool has_worst = node.attribute("worst-margin-min");
  int kinds = int{has_class} + int{has_metric} + int{has_window} + int{has_given} +
              int{has_yield} + int{has_worst};
  if (kinds != 1) {
    return fail(nullptr,
                "<require> takes exactly one of 'class', 'metric', 'dead-time-within-window', "
                "'dead-time' (with within-window=\"true\"), 'yield-min' or 'worst-margin-min'");
  }
  if ((node.attribute("min") || node.attribute("max")) && !has_metric) {
    return fail(node.attribute("min") ? "min" : "max", "'min' and 'max' go with 'metric'");
  }
  if (has_class) {
    r.kind = RequirementSpec::Kind::kClass;
    r.min_class = Trim(node.attribute("class").value());
    if (r.min_class != "full" && r.min_class != "partial") {
      return fail("class", "bad class '" + r.min_class +
                               "' (use \"full\", or \"partial\" for full or partial)");
    }
  } else if (has_metric) {
    r.kind = RequirementSpec::Kind::kMetric;
    r.metric = Trim(node.attribute("metric").value());
    if (!IsName(r.metric)) return fail("metric", "bad metric name '" + r.metric + "'");
    for (const char* bound : {"min", "max"}) {
      if (!node.attribute(bound)) continue;
      double v = 0;
      if (!ReadNumber(node, bound, fail, &v)) return false;
      (std::string(bound) == "min" ? r.min : r.max) = v;
    }
    if (std::isnan(r.min) && std::isnan(r.max)) {
      return fail("metric", "<require metric=...> needs 'min', 'max' or both");
    }
    if (!std::isnan(r.min) && !std::isnan(r.max) && r.min > r.max) {
      return fail("max", "'max' is below 'min'");
    }
  } else if (has_given) {
    if (!ParseGivenDeadTime(node, fail, &r)) return false;
  } else if (has_yield || has_worst) {
    if (!ParseToleranceBound(node, has_yield, fail, &r)) return false;
  } else {
    r.kind = RequirementSpec::Kind::kDeadTimeWindow;
    std::string value = Trim(node.attribute("dead-time-within-window").value());
    if (value != "true") {
      return fail("dead-time-within-window",
                  "'dead-time-within-window' takes \"true\" (leave it out otherwise)");
    }
  }
  if (node.attribute("where")) {
    r.where_expression = Trim(node.attribute("where").value());
    std::string message;
    if (r.where_expression.empty()) return fail("where", "empty attribute 'where' on <require>");
    if (!ScanExpression(r.where_expression, &r.where_names, &message)) {
      return fail("where", "bad where-expression '" + r.where_expression + "': " + message);
    }
  }
  *out = std::move(r);
  return true;
}

bool CheckRequirementNames(const SweepSpec& spec, Diagnostic* error) {
  std::vector<std::string> known;
  for (const auto& named : spec.NamedParams()) known.push_back(named.first);
  for (const RequirementSpec& r : spec.requirements) {
    for (const std::string& name : r.where_names) {
      bool found = std::any_of(known.begin(), known.end(),
                               [&](const std::string& k) { return Lower(k) == Lower(name); });
      if (found) continue;
      std::string best = ClosestName(name, known);
      error->where = r.where;
      error->message = "where-expression names '" + name + "', which the sweep does not set" +
                       (best.empty() ? std::string() : " (did you mean '" + best + "'?)");
      error->source_line.clear();
      return false;
    }
  }
  return true;
}

}  // namespace zvsmap
