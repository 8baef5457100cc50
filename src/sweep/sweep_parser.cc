#include "sweep/sweep_parser.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <pugixml.hpp>
#include <sstream>

#include "core/spice_number.h"
#include "core/text.h"
#include "result/edge_identity.h"
#include "sweep/axis_values.h"
#include "sweep/device_parser.h"
#include "sweep/prediction_parser.h"
#include "sweep/refine_parser.h"
#include "sweep/requirement_parser.h"
#include "sweep/tolerance_parser.h"

namespace zvsmap {

namespace {

bool IsIdentifier(const std::string& s) {
  if (s.empty() || std::isdigit(static_cast<unsigned char>(s[0]))) return false;
  return std::all_of(s.begin(), s.end(), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_';
  });
}

std::string Suggest(const std::string& name, const std::vector<std::string>& candidates,
                    const char* open, const char* close) {
  std::string best = ClosestName(name, candidates);
  if (best.empty()) return "";
  return std::string(" (did you mean ") + open + best + close + "?)";
}

class Parser {
 public:
  Parser(const std::string& text, const std::string& path, SweepSpec* spec, Diagnostic* error)
      : text_(text), path_(path), spec_(spec), error_(error) {
    line_starts_.push_back(0);
    for (size_t i = 0; i < text_.size(); ++i) {
      if (text_[i] == '\n') line_starts_.push_back(i + 1);
    }
  }

  bool Run(bool check_template_exists);

 private:
  // --- locations and failures ---
  SourceLocation At(ptrdiff_t offset) const {
    SourceLocation where;
    where.file = path_;
    if (offset < 0) return where;
    size_t off = std::min(static_cast<size_t>(offset), text_.size());
    auto it = std::upper_bound(line_starts_.begin(), line_starts_.end(), off);
    size_t line = static_cast<size_t>(it - line_starts_.begin());
    where.line = static_cast<int>(line);
    where.column = static_cast<int>(off - line_starts_[line - 1]) + 1;
    return where;
  }
  // The location of an element's '<' (offset_debug points at its name).
  SourceLocation Where(pugi::xml_node node) const {
    ptrdiff_t off = node.offset_debug();
    return At(off > 0 ? off - 1 : off);
  }
  // The location of `name=` inside the start tag of `node`, else the element's.
  SourceLocation WhereAttr(pugi::xml_node node, const char* name) const {
    ptrdiff_t start = node.offset_debug();
    if (start < 0) return Where(node);
    std::string key = name;
    char quote = 0;
    for (size_t i = static_cast<size_t>(start); i < text_.size(); ++i) {
      char c = text_[i];
      if (quote) {
        if (c == quote) quote = 0;
        continue;
      }
      if (c == '"' || c == '\'') quote = c;
      if (c == '>') break;
      if (i > 0 && std::isspace(static_cast<unsigned char>(text_[i - 1])) &&
          text_.compare(i, key.size(), key) == 0) {
        size_t j = text_.find_first_not_of(" \t\r\n", i + key.size());
        if (j != std::string::npos && text_[j] == '=') return At(static_cast<ptrdiff_t>(i));
      }
    }
    return Where(node);
  }
  // A diagnostic at `where` with the line's text and a caret.
  Diagnostic Make(SourceLocation where, std::string message) const {
    Diagnostic d(where, std::move(message));
    if (where.line > 0) {
      size_t b = line_starts_[where.line - 1];
      size_t e = text_.find('\n', b);
      std::string line = text_.substr(b, e == std::string::npos ? std::string::npos : e - b);
      if (!line.empty() && line.back() == '\r') line.pop_back();
      // Show the line without its indentation; keep the caret on the same character.
      size_t indent = std::min(line.find_first_not_of(" \t"), line.size());
      d.source_line = line.substr(indent);
      if (d.where.column > static_cast<int>(indent)) {
        d.where.column -= static_cast<int>(indent);
      } else {
        d.where.column = 0;
      }
    }
    return d;
  }
  bool Fail(SourceLocation where, std::string message) {
    *error_ = Make(where, std::move(message));
    return false;
  }
  // The first non-blank character of a text node.
  SourceLocation WhereText(pugi::xml_node node) const {
    ptrdiff_t off = node.offset_debug();
    if (off < 0) return At(off);
    size_t first = text_.find_first_not_of(" \t\r\n", static_cast<size_t>(off));
    return At(first == std::string::npos ? off : static_cast<ptrdiff_t>(first));
  }
  bool Fail(pugi::xml_node node, std::string message) { return Fail(Where(node), message); }
  bool FailAttr(pugi::xml_node node, const char* name, std::string message) {
    return Fail(WhereAttr(node, name), message);
  }

  // --- attribute helpers ---
  bool CheckShape(pugi::xml_node node, const std::vector<std::string>& allowed);
  bool Required(pugi::xml_node node, const char* name, std::string* value);
  bool Number(pugi::xml_node node, const char* name, double* value);
  bool WholeNumber(pugi::xml_node node, const char* name, long min, long* value);
  bool Positive(pugi::xml_node node, const char* name, double* value);
  bool Spelling(pugi::xml_node node, const char* name, const std::string& item);
  bool AtMost(pugi::xml_node node, const char* name, double value, double max,
              const std::string& why);
  bool AtLeast(pugi::xml_node node, const char* name, double value, double min,
               const std::string& why);
  bool ParamName(pugi::xml_node node, std::string* name);
  bool Once(pugi::xml_node node);

  // --- elements ---
  bool ParseTemplate(pugi::xml_node node);
  bool ParseSet(pugi::xml_node node);
  bool ParseAxis(pugi::xml_node node, AxisSpec* axis);
  bool ParseDeviceAxis(pugi::xml_node node, AxisSpec* axis);
  bool CheckDeviceAxes();
  bool ParseLockstep(pugi::xml_node node);
  bool ParseDerive(pugi::xml_node node);
  bool ParseSimulation(pugi::xml_node node);
  bool ParseZvs(pugi::xml_node node);
  bool ParseLimits(pugi::xml_node node);
  bool ParseTolerancesBlock(pugi::xml_node node);

  const std::string& text_;
  const std::string& path_;
  SweepSpec* spec_;
  Diagnostic* error_;
  std::vector<size_t> line_starts_;
  std::map<std::string, int> param_lines_;    // lower-case name -> line first named
  std::map<std::string, int> element_lines_;  // once-only element -> line
  std::string template_file_;                 // as written in the file
};

bool Parser::CheckShape(pugi::xml_node node, const std::vector<std::string>& allowed) {
  std::vector<std::string> seen;
  for (pugi::xml_attribute a : node.attributes()) {
    std::string name = a.name();
    if (std::find(allowed.begin(), allowed.end(), name) == allowed.end()) {
      return FailAttr(node, a.name(),
                      "unknown attribute '" + name + "' on <" + node.name() + ">" +
                          Suggest(name, allowed, "'", "'"));
    }
    if (std::find(seen.begin(), seen.end(), name) != seen.end()) {
      return FailAttr(node, a.name(),
                      "attribute '" + name + "' given twice on <" + node.name() + ">");
    }
    seen.push_back(name);
  }
  return true;
}

bool Parser::Required(pugi::xml_node node, const char* name, std::string* value) {
  pugi::xml_attribute a = node.attribute(name);
  if (!a) {
    return Fail(node, std::string("missing attribute '") + name + "' on <" + node.name() + ">");
  }
  *value = Trim(a.value());
  if (value->empty()) {
    return FailAttr(node, name,
                    std::string("empty attribute '") + name + "' on <" + node.name() + ">");
  }
  return true;
}

// Refuses a number that reads differently than it looks ("0.5MHz", "2A",
// "1xyz") and notes unit letters SPICE ignores ("10uH"); see core/spice_number.h.
bool Parser::Spelling(pugi::xml_node node, const char* name, const std::string& item) {
  NumberSpelling spelling = JudgeSpiceSpelling(item);
  if (spelling.kind == NumberSpelling::Kind::kPlain) return true;
  std::string message = "in attribute '" + std::string(name) + "': " + spelling.message;
  if (spelling.kind == NumberSpelling::Kind::kRefused) return FailAttr(node, name, message);
  spec_->warnings.push_back(Make(WhereAttr(node, name), message));
  return true;
}

bool Parser::AtMost(pugi::xml_node node, const char* name, double value, double max,
                    const std::string& why) {
  if (value <= max) return true;
  return FailAttr(node, name,
                  std::string("'") + name + "' must be at most " + FormatNumber(max) + ", got '" +
                      node.attribute(name).value() + "' (" + why + ")");
}

bool Parser::AtLeast(pugi::xml_node node, const char* name, double value, double min,
                     const std::string& why) {
  if (value >= min) return true;
  return FailAttr(node, name,
                  std::string("'") + name + "' must be at least " + FormatNumber(min) + ", got '" +
                      node.attribute(name).value() + "' (" + why + ")");
}

bool Parser::Number(pugi::xml_node node, const char* name, double* value) {
  std::string raw = node.attribute(name).value();
  if (!Spelling(node, name, raw)) return false;
  std::optional<double> v = ParseSpiceNumber(raw);
  if (!v) {
    return FailAttr(node, name,
                    "bad number '" + raw + "' in attribute '" + std::string(name) + "'");
  }
  *value = *v;
  return true;
}

bool Parser::WholeNumber(pugi::xml_node node, const char* name, long min, long* value) {
  double v = 0;
  if (!Number(node, name, &v)) return false;
  if (v != std::floor(v) || v < static_cast<double>(min) || v > 1e15) {
    return FailAttr(node, name,
                    std::string("'") + name + "' must be a whole number of at least " +
                        std::to_string(min) + ", got '" + node.attribute(name).value() + "'");
  }
  *value = static_cast<long>(v);
  return true;
}

bool Parser::Positive(pugi::xml_node node, const char* name, double* value) {
  if (!Number(node, name, value)) return false;
  if (*value <= 0) {
    return FailAttr(
        node, name,
        std::string("'") + name + "' must be positive, got '" + node.attribute(name).value() + "'");
  }
  return true;
}

// The target parameter of set/axis/derive: present, a valid name, named once.
bool Parser::ParamName(pugi::xml_node node, std::string* name) {
  if (!Required(node, "param", name)) return false;
  if (!IsIdentifier(*name)) {
    return FailAttr(
        node, "param",
        "bad parameter name '" + *name + "' (letters, digits and '_', not starting with a digit)");
  }
  SourceLocation where = Where(node);
  auto inserted = param_lines_.emplace(Lower(*name), where.line);
  if (!inserted.second) {
    return FailAttr(node, "param",
                    "parameter '" + *name + "' is named twice (first on line " +
                        std::to_string(inserted.first->second) + ")");
  }
  return true;
}

// Elements that may appear at most once.
bool Parser::Once(pugi::xml_node node) {
  int line = Where(node).line;
  auto inserted = element_lines_.emplace(node.name(), line);
  if (!inserted.second) {
    return Fail(node, std::string("more than one <") + node.name() + "> (first on line " +
                          std::to_string(inserted.first->second) + ")");
  }
  return true;
}

bool Parser::ParseTemplate(pugi::xml_node node) {
  if (!Once(node) || !CheckShape(node, {"file"}) || !Required(node, "file", &template_file_)) {
    return false;
  }
  namespace fs = std::filesystem;
  fs::path file(template_file_);
  if (file.is_relative()) file = fs::path(path_).parent_path() / file;
  spec_->template_path = file.lexically_normal().string();
  spec_->template_where = Where(node);
  return true;
}

bool Parser::ParseSet(pugi::xml_node node) {
  FixedValue f;
  std::string unused;
  if (!CheckShape(node, {"param", "value"}) || !ParamName(node, &f.param) ||
      !Required(node, "value", &unused) || !Number(node, "value", &f.value)) {
    return false;
  }
  f.where = Where(node);
  spec_->fixed.push_back(f);
  return true;
}

// <axis device="cell.high cell.low" values="name1 name2"/>: which switch
// model each role gets; the values are <device> names (checked at the end).
bool Parser::ParseDeviceAxis(pugi::xml_node node, AxisSpec* axis) {
  if (!CheckShape(node, {"device", "values"})) return false;
  axis->where = Where(node);
  std::string roles, values;
  if (!Required(node, "device", &roles) || !Required(node, "values", &values)) return false;
  for (const std::string& role : SplitValueList(roles)) {
    std::string r = Lower(role);
    SwitchRole parsed;
    if (!ParseSwitchRole(r, &parsed)) {
      return FailAttr(node, "device",
                      "bad switch role '" + role + "' (use CELL.high or CELL.low, e.g. leg.high)");
    }
    auto inserted = param_lines_.emplace("device:" + r, axis->where.line);
    if (!inserted.second) {
      return FailAttr(node, "device",
                      "switch role '" + role + "' is assigned twice (first on line " +
                          std::to_string(inserted.first->second) + ")");
    }
    axis->device_roles.push_back(r);
  }
  for (const std::string& item : SplitValueList(values)) {
    axis->device_names.push_back(item);
    axis->values.push_back(static_cast<double>(axis->values.size()));
  }
  if (axis->device_roles.empty()) return FailAttr(node, "device", "device axis names no role");
  if (axis->values.empty()) return FailAttr(node, "values", "device axis has no values");
  return true;
}

// Every device axis value names a declared <device>.
bool Parser::CheckDeviceAxes() {
  for (const AxisGroup& g : spec_->groups) {
    for (const AxisSpec& a : g.axes) {
      for (const std::string& name : a.device_names) {
        std::vector<std::string> declared;
        bool found = false;
        for (const DeviceSpec& d : spec_->devices) {
          declared.push_back(d.name);
          found = found || Lower(d.name) == Lower(name);
        }
        if (!found) {
          return Fail(a.where,
                      "unknown device '" + name + "' (declare it with <device name=\"" + name +
                          "\" .../>" +
                          (ClosestName(name, declared).empty()
                               ? std::string(")")
                               : "; did you mean '" + ClosestName(name, declared) + "'?)"));
        }
      }
    }
  }
  return true;
}

bool Parser::ParseAxis(pugi::xml_node node, AxisSpec* axis) {
  if (node.attribute("device")) return ParseDeviceAxis(node, axis);
  if (!CheckShape(node, {"param", "values", "from", "to", "step", "count", "spacing"}) ||
      !ParamName(node, &axis->param)) {
    return false;
  }
  axis->where = Where(node);
  bool has_values = node.attribute("values");
  bool has_range = node.attribute("from") || node.attribute("to") || node.attribute("step") ||
                   node.attribute("count") || node.attribute("spacing");
  if (has_values && has_range) {
    return Fail(node, "<axis> takes either 'values' or 'from'/'to', not both");
  }
  if (has_values) {
    for (const std::string& item : SplitValueList(node.attribute("values").value())) {
      if (!Spelling(node, "values", item)) return false;
      std::optional<double> v = ParseSpiceNumber(item);
      if (!v) {
        return FailAttr(node, "values", "bad number '" + item + "' in attribute 'values'");
      }
      axis->values.push_back(*v);
    }
    if (axis->values.empty()) {
      return FailAttr(node, "values", "axis '" + axis->param + "' has no values");
    }
    return true;
  }
  if (!has_range) {
    return Fail(node, "<axis> needs 'values', or 'from', 'to' and 'step' or 'count'");
  }
  std::string unused;
  double from = 0, to = 0;
  if (!Required(node, "from", &unused) || !Required(node, "to", &unused) ||
      !Number(node, "from", &from) || !Number(node, "to", &to)) {
    return false;
  }
  bool has_step = node.attribute("step"), has_count = node.attribute("count");
  if (has_step && has_count) return Fail(node, "<axis> takes 'step' or 'count', not both");
  if (!has_step && !has_count) return Fail(node, "<axis> with 'from'/'to' needs 'step' or 'count'");
  bool log_spacing = false;
  if (node.attribute("spacing")) {
    std::string spacing = node.attribute("spacing").value();
    if (spacing != "linear" && spacing != "log") {
      return FailAttr(node, "spacing", "bad spacing '" + spacing + "' (use 'linear' or 'log')");
    }
    log_spacing = spacing == "log";
  }
  std::string message;
  if (has_step) {
    if (log_spacing) return FailAttr(node, "spacing", "spacing=\"log\" needs 'count', not 'step'");
    double step = 0;
    if (!Required(node, "step", &unused) || !Number(node, "step", &step)) return false;
    if (!StepValues(from, to, step, &axis->values, &message)) {
      return FailAttr(node, "step", message);
    }
    return true;
  }
  long count = 0;
  if (!WholeNumber(node, "count", 1, &count)) return false;
  if (!CountValues(from, to, count, log_spacing, &axis->values, &message)) {
    return FailAttr(node, "count", message);
  }
  return true;
}

bool Parser::ParseLockstep(pugi::xml_node node) {
  if (!CheckShape(node, {})) return false;
  AxisGroup group;
  group.lockstep = true;
  group.where = Where(node);
  for (pugi::xml_node child : node.children()) {
    if (child.type() != pugi::node_element) {
      return Fail(WhereText(child), "unexpected text in <lockstep>");
    }
    std::string name = child.name();
    if (name != "axis") {
      return Fail(child, "unknown element <" + name + "> in <lockstep>" +
                             Suggest(name, {"axis"}, "<", ">"));
    }
    if (child.first_child()) return Fail(child, "<axis> takes no content");
    AxisSpec axis;
    if (!ParseAxis(child, &axis)) return false;
    if (!group.axes.empty() && axis.values.size() != group.axes.front().values.size()) {
      const AxisSpec& first = group.axes.front();
      return Fail(child, "lockstep axes differ in length: '" + first.param + "' has " +
                             std::to_string(first.values.size()) + " values, '" + axis.param +
                             "' has " + std::to_string(axis.values.size()));
    }
    group.axes.push_back(std::move(axis));
  }
  if (group.axes.empty()) return Fail(node, "<lockstep> has no axes");
  spec_->groups.push_back(std::move(group));
  return true;
}

bool Parser::ParseDerive(pugi::xml_node node) {
  DerivedValue d;
  if (!CheckShape(node, {"param", "expr"}) || !ParamName(node, &d.param) ||
      !Required(node, "expr", &d.expression)) {
    return false;
  }
  d.where = Where(node);
  spec_->derived.push_back(d);
  return true;
}

bool Parser::ParseSimulation(pugi::xml_node node) {
  if (node.attribute("measure-periods")) {
    return FailAttr(node, "measure-periods",
                    "'measure-periods' was replaced by 'measure-lead': the periods simulated "
                    "before the measured one (measure-periods=\"N\" measured after a lead of "
                    "N - 1 periods)");
  }
  if (!Once(node) || !CheckShape(node, {"settle-periods", "measure-lead", "max-step", "reltol",
                                        "timeout", "settle", "settle-tolerance", "max-newton",
                                        "max-periods", "solver-aid", "probe", "loop",
                                        "warm-start"})) {
    return false;
  }
  SimulationSettings& s = spec_->simulation;
  s.where = Where(node);
  // The meaningful range of each setting and why (README "Ranges of the settings").
  long n = 0;
  if (node.attribute("settle-periods")) {
    if (!WholeNumber(node, "settle-periods", 1, &n) ||
        !AtMost(node, "settle-periods", static_cast<double>(n), 100000,
                "a run of more periods than that is a hang, not a settling run")) {
      return false;
    }
    s.settle_periods = static_cast<int>(n);
  }
  if (node.attribute("measure-lead") &&
      (!Positive(node, "measure-lead", &s.measure_lead) ||
       !AtLeast(node, "measure-lead", s.measure_lead, kMinMeasureLead,
                "periods; the states not set at t = 0 need time to settle before a measurement") ||
       !AtMost(node, "measure-lead", s.measure_lead, kMaxMeasureLead,
               "periods; a longer lead adds run time, not accuracy"))) {
    return false;
  }
  if (node.attribute("max-step") &&
      (!Positive(node, "max-step", &s.max_step_s) ||
       !AtMost(node, "max-step", s.max_step_s, 1, "a step bound of seconds resolves no edge"))) {
    return false;
  }
  if (node.attribute("reltol") &&
      (!Positive(node, "reltol", &s.reltol) ||
       !AtLeast(node, "reltol", s.reltol, 1e-9, "finer than double precision can solve") ||
       !AtMost(node, "reltol", s.reltol, 0.1, "coarser than any result worth measuring"))) {
    return false;
  }
  if (node.attribute("timeout") &&
      (!Positive(node, "timeout", &s.timeout_s) ||
       !AtLeast(node, "timeout", s.timeout_s, 1, "seconds; no point settles in less") ||
       !AtMost(node, "timeout", s.timeout_s, 604800,
               "seconds; more than a week per point is a "
               "hang"))) {
    return false;
  }
  if (node.attribute("settle")) {
    const std::string text = node.attribute("settle").value();
    if (!SettleMethodFromName(text, &s.settle_method) ||
        (s.settle_method != SettleMethod::kShooting && s.settle_method != SettleMethod::kPeriods)) {
      return FailAttr(node, "settle",
                      "'settle' must be 'shooting' or 'periods', got '" + text + "'");
    }
  }
  if (node.attribute("settle-tolerance") &&
      (!Positive(node, "settle-tolerance", &s.settle_tolerance) ||
       !AtLeast(node, "settle-tolerance", s.settle_tolerance, 1e-9,
                "finer than double precision can solve") ||
       !AtMost(node, "settle-tolerance", s.settle_tolerance, 0.1,
               "relative to each state's ripple: above 10% a drifting state counts as settled"))) {
    return false;
  }
  if (node.attribute("max-newton")) {
    if (!WholeNumber(node, "max-newton", 0, &n) ||
        !AtMost(node, "max-newton", static_cast<double>(n), 100,
                "Newton converges in a few iterations or not at all")) {
      return false;
    }
    s.max_newton = static_cast<int>(n);
  }
  if (node.attribute("max-periods")) {
    if (!WholeNumber(node, "max-periods", 1, &n) ||
        !AtMost(node, "max-periods", static_cast<double>(n), 1000000,
                "a run of more periods than that is a hang, not a settling run")) {
      return false;
    }
    s.max_periods = static_cast<int>(n);
  }
  if (s.settle_periods > s.max_periods) {
    return FailAttr(node, node.attribute("settle-periods") ? "settle-periods" : "max-periods",
                    "'settle-periods' (" + std::to_string(s.settle_periods) +
                        ") is more than 'max-periods' (" + std::to_string(s.max_periods) +
                        "): settling stops after max-periods periods");
  }
  if (node.attribute("probe")) {
    std::string probe = node.attribute("probe").value();
    if (probe != "on" && probe != "off") {
      return FailAttr(node, "probe", "'probe' must be 'on' or 'off', got '" + probe + "'");
    }
    s.probe = probe == "on";
  }
  if (node.attribute("loop")) {
    std::string loop = node.attribute("loop").value();
    if (loop != "regulated" && loop != "open") {
      return FailAttr(node, "loop", "'loop' must be 'regulated' or 'open', got '" + loop + "'");
    }
    s.loop = loop == "open" ? SimulationSettings::Loop::kOpen : SimulationSettings::Loop::kRegulated;
  }
  if (node.attribute("warm-start")) {
    std::string warm = node.attribute("warm-start").value();
    if (warm != "on" && warm != "off") {
      return FailAttr(node, "warm-start",
                      "'warm-start' must be 'on' or 'off', got '" + warm + "'");
    }
    s.warm_start = warm == "on";
  }
  // Checked against the aid names in PrepareSweep (run/, which sees sim/).
  if (node.attribute("solver-aid")) s.solver_aid = node.attribute("solver-aid").value();
  return true;
}

bool Parser::ParseZvs(pugi::xml_node node) {
  std::string raw;
  if (!Once(node) || !CheckShape(node, {"residual"}) || !Required(node, "residual", &raw)) {
    return false;
  }
  bool percent = raw.back() == '%';
  std::string number = percent ? raw.substr(0, raw.size() - 1) : raw;
  if (!Spelling(node, "residual", number)) return false;
  std::optional<double> v = ParseSpiceNumber(number);
  if (!v) return FailAttr(node, "residual", "bad number '" + raw + "' in attribute 'residual'");
  if (*v <= 0) {
    return FailAttr(node, "residual", "'residual' must be positive, got '" + raw + "'");
  }
  // At half the rail or more, an edge above the limit is hard: no edge could be partial.
  if (percent && *v >= 50) {
    return FailAttr(node, "residual",
                    "'residual' must be below 50%, got '" + raw +
                        "' (an edge above half the rail is hard, so no edge could be partial)");
  }
  spec_->zvs.kind = percent ? ZvsCriterion::Kind::kFraction : ZvsCriterion::Kind::kAbsolute;
  spec_->zvs.value = percent ? *v / 100 : *v;
  return true;
}

bool Parser::ParseLimits(pugi::xml_node node) {
  if (!Once(node) || !CheckShape(node, {"max-points"})) return false;
  spec_->limits_where = Where(node);
  long n = 0;
  if (node.attribute("max-points")) {
    if (!WholeNumber(node, "max-points", 1, &n)) return false;
    spec_->max_points = static_cast<size_t>(n);
  }
  return true;
}

bool Parser::ParseTolerancesBlock(pugi::xml_node node) {
  if (!Once(node)) return false;
  auto where = [&](pugi::xml_node n) { return Where(n); };
  auto fail = [&](pugi::xml_node n, const char* attribute, const std::string& message) {
    return attribute ? FailAttr(n, attribute, message) : Fail(n, message);
  };
  auto warn = [&](pugi::xml_node n, const char* attribute, const std::string& message) {
    spec_->warnings.push_back(Make(WhereAttr(n, attribute), message));
  };
  return ParseTolerances(node, where, fail, warn, &spec_->tolerances);
}

bool Parser::Run(bool check_template_exists) {
  *spec_ = SweepSpec();
  spec_->path = path_;
  pugi::xml_document doc;
  pugi::xml_parse_result result = doc.load_buffer(text_.data(), text_.size());
  if (!result) {
    return Fail(At(result.offset), std::string("malformed XML: ") + result.description());
  }
  pugi::xml_node root = doc.document_element();
  if (std::string(root.name()) != "sweep") {
    return Fail(root, "root element is <" + std::string(root.name()) +
                          ">; a sweep file starts with <sweep>");
  }
  if (!CheckShape(root, {})) return false;
  spec_->limits_where = Where(root);

  static const std::vector<std::string> kElements = {"template", "set",        "axis",  "lockstep",
                                                     "derive",   "simulation", "zvs",   "limits",
                                                     "require",  "predict",    "device",
                                                     "refine",   "tolerances"};
  for (pugi::xml_node node : root.children()) {
    if (node.type() != pugi::node_element) {
      return Fail(WhereText(node), "unexpected text in <sweep>");
    }
    std::string name = node.name();
    if (std::find(kElements.begin(), kElements.end(), name) == kElements.end()) {
      return Fail(node,
                  "unknown element <" + name + "> in <sweep>" + Suggest(name, kElements, "<", ">"));
    }
    if (name != "lockstep" && name != "tolerances" && node.first_child()) {
      return Fail(node, "<" + name + "> takes no content");
    }
    bool ok = true;
    if (name == "template") {
      ok = ParseTemplate(node);
    } else if (name == "set") {
      ok = ParseSet(node);
    } else if (name == "axis") {
      AxisGroup group;
      group.where = Where(node);
      group.axes.emplace_back();
      ok = ParseAxis(node, &group.axes.back());
      if (ok) spec_->groups.push_back(std::move(group));
    } else if (name == "lockstep") {
      ok = ParseLockstep(node);
    } else if (name == "derive") {
      ok = ParseDerive(node);
    } else if (name == "simulation") {
      ok = ParseSimulation(node);
    } else if (name == "zvs") {
      ok = ParseZvs(node);
    } else if (name == "limits") {
      ok = ParseLimits(node);
    } else if (name == "require") {
      RequirementSpec r;
      for (const char* bound : {"min", "max"}) {
        if (node.attribute(bound) && !Spelling(node, bound, node.attribute(bound).value())) {
          return false;
        }
      }
      auto fail = [&](const char* attribute, const std::string& message) {
        return attribute ? FailAttr(node, attribute, message) : Fail(node, message);
      };
      ok = ParseRequirement(node, Where(node), fail, &r);
      if (ok) spec_->requirements.push_back(std::move(r));
    } else if (name == "device") {
      DeviceSpec d;
      auto fail = [&](const char* attribute, const std::string& message) {
        return attribute ? FailAttr(node, attribute, message) : Fail(node, message);
      };
      auto where = [&](const char* attribute) {
        return attribute ? WhereAttr(node, attribute) : Where(node);
      };
      ok = ParseDevice(node, path_, spec_->devices, where, fail, &d);
      if (ok) spec_->devices.push_back(std::move(d));
    } else if (name == "refine") {
      RefineSpec r;
      if (node.attribute("resolution") &&
          !Spelling(node, "resolution", node.attribute("resolution").value())) {
        return false;
      }
      auto fail = [&](const char* attribute, const std::string& message) {
        return attribute ? FailAttr(node, attribute, message) : Fail(node, message);
      };
      ok = ParseRefine(node, Where(node), *spec_, fail, &r);
      if (ok) spec_->refine.push_back(std::move(r));
    } else if (name == "tolerances") {
      ok = ParseTolerancesBlock(node);
    } else if (name == "predict") {
      PredictionSpec p;
      std::string tolerance = Trim(node.attribute("tolerance").value());
      if (!tolerance.empty() && tolerance.back() == '%') tolerance.pop_back();
      if (!Spelling(node, "tolerance", tolerance)) return false;
      auto fail = [&](const char* attribute, const std::string& message) {
        return attribute ? FailAttr(node, attribute, message) : Fail(node, message);
      };
      ok =
          ParsePrediction(node, Where(node), WhereAttr(node, "expr"), spec_->predictions, fail, &p);
      if (ok) spec_->predictions.push_back(std::move(p));
    }
    if (!ok) return false;
  }
  if (spec_->template_path.empty()) {
    return Fail(root, "missing <template file=\"...\"/>");
  }
  if (!CheckRequirementNames(*spec_, error_)) return Fail(error_->where, error_->message);
  if (!CheckDeviceAxes()) return false;
  if (!CheckRefineAxes(spec_, error_)) return Fail(error_->where, error_->message);
  if (!CheckToleranceParams(*spec_, error_)) return Fail(error_->where, error_->message);
  if (check_template_exists) {
    std::error_code ec;
    if (!std::filesystem::is_regular_file(spec_->template_path, ec)) {
      return FailAttr(doc.document_element().child("template"), "file",
                      "template file '" + template_file_ + "' does not exist (looked for '" +
                          spec_->template_path + "')");
    }
  }
  return true;
}

}  // namespace

bool ParseSweepText(const std::string& text, const std::string& path, SweepSpec* spec,
                    Diagnostic* error) {
  return Parser(text, path, spec, error).Run(/*check_template_exists=*/false);
}

bool ParseSweepFile(const std::string& path, SweepSpec* spec, Diagnostic* error) {
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    *error = Diagnostic{{path, 0, 0}, "cannot read the sweep file", {}};
    return false;
  }
  std::ostringstream buffer;
  buffer << in.rdbuf();
  std::string text = buffer.str();
  return Parser(text, path, spec, error).Run(/*check_template_exists=*/true);
}

std::vector<Diagnostic> CheckParamsKnown(const SweepSpec& spec,
                                         const std::vector<std::string>& known) {
  // SPICE parameter names are case-insensitive, so "vin" in the template
  // matches "Vin" in the sweep file.
  std::vector<Diagnostic> problems;
  std::vector<std::pair<std::string, SourceLocation>> named = spec.NamedParams();
  for (const VarySpec& v : spec.tolerances.vary) {
    if (!v.OnDevice()) named.emplace_back(v.param, v.where);  // devices: CheckDeviceVaries
  }
  for (const auto& [name, where] : named) {
    std::string lower = Lower(name);
    bool found = std::any_of(known.begin(), known.end(),
                             [&](const std::string& k) { return Lower(k) == lower; });
    if (found) continue;
    std::string best = ClosestName(name, known);
    // Else the three nearest by edit distance, so a guess ("deadtime") still
    // shows the spelling the template uses ("td_lh").
    // (C++17 lambdas cannot capture a structured binding: name it first.)
    const std::string& asked = name;
    std::vector<std::string> near(known.begin(), known.end());
    std::stable_sort(near.begin(), near.end(), [&](const std::string& a, const std::string& b) {
      return EditDistance(asked, a) < EditDistance(asked, b);
    });
    std::string listed;
    for (size_t i = 0; i < near.size() && i < 3; ++i) {
      listed += (i ? ", '" : "'") + near[i] + "'";
    }
    Diagnostic d;
    d.where = where;
    d.message = "unknown parameter '" + name + "' (the template declares no such .param" +
                (!best.empty()    ? "; did you mean '" + best + "'?"
                 : listed.empty() ? std::string()
                                  : "; closest: " + listed) +
                "; `zvsmap params " + spec.path + "` lists them all)";
    problems.push_back(std::move(d));
  }
  return problems;
}

}  // namespace zvsmap
