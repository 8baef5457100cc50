#include "run/point_checks.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdio>
#include <map>
#include <optional>
#include <regex>
#include <set>

#include "core/expression.h"
#include "core/source_text.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "netlist/render.h"

namespace zvsmap {

namespace {

// Six significant digits: enough to see the mistake, short enough to read.
std::string Short(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

std::string Seconds(double v) { return Short(v) + " s"; }

std::string Count(double n) {
  char buf[32];
  std::snprintf(buf, sizeof buf, n < 1e6 ? "%.0f" : "%.3g", n);
  return buf;
}

// One problem at one point.
struct Finding {
  SourceLocation where;    // template or sweep place (raw column, 0 = none)
  bool in_sweep = false;   // `where` is in the sweep file
  std::string what;        // the same at every point
  std::string detail;      // this point's numbers
  std::string expression;  // its names lead to the sweep lines that set them
};

// Template cards the checks read, found once.
struct ValueCard {  // an inductor or capacitor outside subcircuits
  int line = 0;
  std::string element, value;
};
struct CommandSource {  // a V source driving a cell's command node with PULSE(...)
  int line = 0;
  std::string element, cell, role;
  std::vector<std::string> args;  // without braces or quotes
};

// Splits "a {b c} 'd'" at blanks and commas outside braces, quotes and parentheses.
std::vector<std::string> Fields(const std::string& text) {
  std::vector<std::string> out;
  std::string cur;
  int depth = 0;
  char quote = 0;
  for (char c : text) {
    if (quote) {
      if (c == quote) quote = 0;
    } else if (c == '\'') {
      quote = c;
    } else if (c == '{' || c == '(') {
      ++depth;
    } else if ((c == '}' || c == ')') && depth > 0) {
      --depth;
    } else if (depth == 0 && (std::isspace(static_cast<unsigned char>(c)) || c == ',')) {
      if (!cur.empty()) out.push_back(cur);
      cur.clear();
      continue;
    }
    cur += c;
  }
  if (!cur.empty()) out.push_back(cur);
  return out;
}

std::string Unwrap(const std::string& field) {
  if (field.size() >= 2 && ((field.front() == '{' && field.back() == '}') ||
                            (field.front() == '\'' && field.back() == '\''))) {
    return field.substr(1, field.size() - 2);
  }
  return field;
}

void ScanCards(const Template& tmpl, std::vector<ValueCard>* values,
               std::vector<CommandSource>* commands) {
  static const std::regex kPulse(R"(\bpulse\s*\()", std::regex::icase);
  int subckt_depth = 0;
  bool title = true;  // SPICE reads the first line as the title
  for (const auto& [line, text] : tmpl.lines) {
    if (title) {
      title = false;
      continue;
    }
    std::string t = Trim(text);
    std::string lower = Lower(t);
    if (lower.rfind(".subckt", 0) == 0) ++subckt_depth;
    if (lower.rfind(".ends", 0) == 0 && subckt_depth > 0) --subckt_depth;
    if (subckt_depth > 0 || t.empty()) continue;
    std::vector<std::string> f = Fields(t);
    if ((lower[0] == 'l' || lower[0] == 'c') && f.size() >= 4) {
      values->push_back({line, f[0], f[3]});
      continue;
    }
    std::smatch m;
    if (lower[0] != 'v' || f.size() < 4 || !std::regex_search(t, m, kPulse)) continue;
    for (const CellSpec& c : tmpl.cells) {
      for (const auto& [node, role] :
           {std::make_pair(c.high_cmd, "high_cmd"), std::make_pair(c.low_cmd, "low_cmd")}) {
        if (!SameName(f[1], node) || !(f[2] == "0" || SameName(f[2], "gnd"))) continue;
        size_t open = static_cast<size_t>(m.position(0) + m.length(0));
        size_t close = t.rfind(')');
        if (close == std::string::npos || close < open) continue;
        CommandSource s{line, f[0], c.name, role, {}};
        for (const std::string& a : Fields(t.substr(open, close - open))) {
          s.args.push_back(Unwrap(a));
        }
        commands->push_back(s);
      }
    }
  }
}

// Groups findings by place and kind; keeps the first few points of each.
class Findings {
 public:
  Findings(const SweepSpec& spec, const Template& tmpl) : spec_(spec), tmpl_(tmpl) {}

  void Add(const Point& point, const Finding& f) {
    auto same = [&](const Group& g) {
      return g.first.where.line == f.where.line && g.first.in_sweep == f.in_sweep &&
             g.first.what == f.what;
    };
    auto it = std::find_if(groups_.begin(), groups_.end(), same);
    if (it == groups_.end()) {
      groups_.push_back({f, {}, 0, {}});
      it = groups_.end() - 1;
    }
    ++it->count;
    if (it->examples.size() >= kPointsShown) return;
    std::string values = point.Describe();
    it->examples.push_back("point " + std::to_string(point.index) +
                           (values.empty() ? "" : " (" + values + ")") +
                           (f.detail.empty() ? "" : ": " + f.detail));
    std::set<std::string> visited;
    SetBy(point, f.expression, &visited, &it->set_by);
  }

  std::vector<Diagnostic> Report(size_t total, const SourceText& sweep,
                                 const SourceText& tmpl) const {
    std::vector<Diagnostic> out;
    for (const Group& g : groups_) {
      std::string message = g.first.what + " at " + std::to_string(g.count) + " of " +
                            std::to_string(total) + " points: ";
      for (size_t i = 0; i < g.examples.size(); ++i) message += (i ? "; " : "") + g.examples[i];
      if (g.count > g.examples.size()) {
        message += "; and " + std::to_string(g.count - g.examples.size()) + " more";
      }
      std::string lines;
      for (const auto& [name, where] : spec_.NamedParams()) {
        if (!g.set_by.count(Lower(name))) continue;
        lines += (lines.empty() ? "" : ", ") + where.file + ":" + std::to_string(where.line) +
                 " (" + name + ")";
      }
      if (!lines.empty()) message += " [values set at " + lines + "]";
      const SourceText& source = g.first.in_sweep ? sweep : tmpl;
      out.push_back(source.At(g.first.where.line, g.first.where.column, message));
    }
    return out;
  }

 private:
  struct Group {
    Finding first;
    std::vector<std::string> examples;
    size_t count;
    std::set<std::string> set_by;  // lower-case names the point sets
  };

  // The names the point sets that `expression` depends on, through the
  // template's .param expressions.
  void SetBy(const Point& point, const std::string& expression, std::set<std::string>* visited,
             std::set<std::string>* out) const {
    static const std::regex kName(R"([A-Za-z_][A-Za-z0-9_]*)");
    for (std::sregex_iterator it(expression.begin(), expression.end(), kName), end; it != end;
         ++it) {
      std::string name = Lower(it->str());
      if (!visited->insert(name).second) continue;
      if (point.Get(name)) {
        out->insert(name);
      } else if (const ParamDecl* decl = tmpl_.FindParam(name)) {
        SetBy(point, decl->expression, visited, out);
      }
    }
  }

  const SweepSpec& spec_;
  const Template& tmpl_;
  std::vector<Group> groups_;
};

// Expressions evaluated once per distinct set of the values they use: most
// points of a grid share their command timing (a muParser evaluation costs
// tens of microseconds, a lookup here a fraction of that).
class EvalCache {
 public:
  bool Eval(const std::string& expr, const Variables& vars, double* value) {
    Entry& e = entries_[expr];
    if (!e.scanned) {
      static const std::regex kName(R"([A-Za-z_][A-Za-z0-9_]*)");
      std::string lower = Lower(expr);
      for (std::sregex_iterator it(lower.begin(), lower.end(), kName), end; it != end; ++it) {
        e.names.push_back(it->str());
      }
      e.scanned = true;
    }
    std::vector<double> key;
    for (const std::string& name : e.names) {
      auto it = vars.find(name);
      key.push_back(it == vars.end() ? std::nan("") : it->second);
    }
    auto hit = e.results.find(key);
    if (hit == e.results.end()) {
      if (e.results.size() >= kMaxRemembered) e.results.clear();  // bounded memory
      double v = 0;
      std::string message;
      int column = 0;
      bool ok = EvaluateExpression(Lower(expr), vars, &v, &message, &column);
      hit = e.results.emplace(key, ok ? std::optional<double>(v) : std::nullopt).first;
    }
    if (!hit->second) return false;
    *value = *hit->second;
    return true;
  }

 private:
  static constexpr size_t kMaxRemembered = 4096;  // results per expression
  struct Entry {
    bool scanned = false;
    std::vector<std::string> names;
    std::map<std::vector<double>, std::optional<double>> results;
  };
  std::map<std::string, Entry> entries_;
};

// Everything the checks of one point need.
struct PointContext {
  const SweepSpec& spec;
  const Template& tmpl;
  const SourceText& sweep;
  const SourceText& source;  // the template
  const Point& point;
  const Variables& resolved;
  double period = 0;
  Findings* findings;
  EvalCache* cache;

  void Add(SourceLocation where, std::string what, std::string detail,
           std::string expression) const {
    findings->Add(point, {where, false, std::move(what), std::move(detail), std::move(expression)});
  }
  // A .param's line, the caret on its name.
  SourceLocation ParamPlace(const std::string& name) const {
    const ParamDecl* decl = tmpl.FindParam(name);
    if (!decl) return {tmpl.path, 0, 0};
    return {tmpl.path, decl->where.line, source.FindWord(decl->where.line, name)};
  }
  bool Eval(const std::string& expr, double* value) const {
    return cache->Eval(expr, resolved, value);
  }
};

void CheckDeadTimes(const PointContext& c) {
  const double t = c.period;
  for (const CellSpec& cell : c.tmpl.cells) {
    const std::pair<std::string, const char*> deads[] = {{cell.high_dead, "high"},
                                                         {cell.low_dead, "low"}};
    bool ok = true;
    for (const auto& [name, side] : deads) {
      if (name.empty() || !c.resolved.count(name)) continue;
      double v = c.resolved.at(name);
      std::string which =
          "dead time '" + name + "' (cell " + cell.name + ", before the " + side + " turn-on)";
      if (v < 0) {
        c.Add(c.ParamPlace(name), which + " must be >= 0", name + " = " + Seconds(v), name);
        ok = false;
      } else if (v >= t) {
        c.Add(c.ParamPlace(name), which + " must be shorter than the period",
              name + " = " + Seconds(v) + ", period " + Seconds(t),
              name + " " + c.tmpl.period_expression);
        ok = false;
      }
    }
    if (!ok || cell.high_dead.empty() || cell.low_dead.empty()) continue;
    double sum = c.resolved.at(cell.high_dead) + c.resolved.at(cell.low_dead);
    if (sum >= t) {
      c.Add(cell.where,
            "the dead times of cell " + cell.name + " ('" + cell.high_dead + "' + '" +
                cell.low_dead + "') must add up to less than the period",
            "sum " + Seconds(sum) + ", period " + Seconds(t),
            cell.high_dead + " " + cell.low_dead + " " + c.tmpl.period_expression);
    }
  }
}

// <require dead-time=T within-window="true">: T must be shorter than the
// period at every point the requirement covers.
void CheckRequiredDeadTimes(const PointContext& c) {
  for (const RequirementSpec& r : c.spec.requirements) {
    if (r.kind != RequirementSpec::Kind::kGivenDeadTime || r.dead_time_s < c.period) continue;
    if (!r.where_expression.empty()) {
      double covers = 0;
      std::string message;
      int column = 0;
      if (!EvaluateExpression(r.where_expression, c.resolved, &covers, &message, &column) ||
          covers == 0) {
        continue;  // not covered here (an expression that fails is reported with the results)
      }
    }
    SourceLocation at = c.sweep.FindAttribute(r.where, "dead-time");
    c.findings->Add(c.point, {at, true, "<require>'s dead-time must be shorter than the period",
                              "dead-time " + Seconds(r.dead_time_s) + ", period " +
                                  Seconds(c.period),
                              c.tmpl.period_expression});
  }
}

void CheckPositiveParams(const PointContext& c) {
  for (const CellSpec& cell : c.tmpl.cells) {
    for (const auto& [name, key] :
         {std::make_pair(cell.inductance, "inductance"), std::make_pair(cell.coss, "coss")}) {
      if (name.empty() || !c.resolved.count(name)) continue;
      double v = c.resolved.at(name);
      if (v > 0) continue;
      c.Add(c.ParamPlace(name), "cell " + cell.name + "'s " + key + " '" + name + "' must be > 0",
            name + " = " + Short(v), name);
    }
  }
}

void CheckValueCards(const PointContext& c, const std::vector<ValueCard>& cards) {
  for (const ValueCard& card : cards) {
    double v = 0;
    if (!c.Eval(Unwrap(card.value), &v) || v > 0) continue;  // not evaluable here: ngspice's
    bool inductor = std::tolower(static_cast<unsigned char>(card.element[0])) == 'l';
    c.Add({c.tmpl.path, card.line, c.source.FindText(card.line, card.value)},
          std::string(inductor ? "inductor " : "capacitor ") + card.element + "'s value '" +
              card.value + "' must be > 0",
          "it is " + Short(v), card.value);
  }
}

// The cell's dead times and the period, for a message about its commands.
std::string DeadTimes(const PointContext& c, const std::string& cell_name) {
  std::string out;
  for (const CellSpec& cell : c.tmpl.cells) {
    if (cell.name != cell_name) continue;
    for (const std::string* name : {&cell.high_dead, &cell.low_dead}) {
      if (name->empty() || out.find(*name + " =") != std::string::npos) continue;
      out += *name + " = " + Seconds(c.resolved.at(*name)) + ", ";
    }
  }
  return out + "period " + Seconds(c.period);
}

void CheckCommands(const PointContext& c, const std::vector<CommandSource>& sources) {
  for (const CommandSource& s : sources) {
    if (s.args.size() < 7) continue;  // ngspice's defaults apply
    double td = 0, tr = 0, tf = 0, pw = 0, per = 0;
    if (!c.Eval(s.args[2], &td) || !c.Eval(s.args[3], &tr) || !c.Eval(s.args[4], &tf) ||
        !c.Eval(s.args[5], &pw) || !c.Eval(s.args[6], &per)) {
      continue;
    }
    std::string who = "command source " + s.element + " (cell " + s.cell + ", " + s.role + ")";
    std::string names;
    for (const std::string& a : s.args) names += a + " ";
    SourceLocation where{c.tmpl.path, s.line, c.source.FindWord(s.line, "pulse")};
    std::string context = " with " + DeadTimes(c, s.cell);
    const char* too_long = ": is a dead time longer than the interval it sits in?";
    if (!(per > 0)) {
      c.Add(where, who + ": its PULSE period '" + s.args[6] + "' must be > 0",
            "it is " + Seconds(per), names);
    } else if (td < 0 || tr < 0 || tf < 0) {
      c.Add(where, who + ": its PULSE delay, rise and fall must be >= 0" + too_long,
            "delay " + Seconds(td) + ", rise " + Seconds(tr) + ", fall " + Seconds(tf) + context,
            names);
    } else if (pw < 0) {
      c.Add(where, who + ": its PULSE width '" + s.args[5] + "' must be >= 0" + too_long,
            "width " + Seconds(pw) + context, names);
    } else if (tr + pw + tf > per * (1 + 1e-9)) {
      c.Add(where, who + ": its PULSE rise + width + fall must fit in its period" + too_long,
            "rise + width + fall = " + Seconds(tr + pw + tf) + context, names);
    }
  }
}

void CheckSteps(const PointContext& c, const PointEvaluator& evaluator) {
  const SimulationSettings& sim = c.spec.simulation;
  TranSettings tran = evaluator.TranFor(c.resolved, c.period);
  if (!(tran.max_step_s > 0)) return;
  double per_period = c.period / tran.max_step_s;
  bool explicit_step = sim.max_step_s > 0;
  SourceLocation period_at{c.tmpl.path, c.tmpl.period_where.line,
                           c.source.FindText(c.tmpl.period_where.line, c.tmpl.period_expression)};
  auto in_sweep = [&](const char* attribute, const std::string& what, const std::string& detail) {
    SourceLocation at = c.sweep.FindAttribute(sim.where, attribute);
    c.findings->Add(c.point, {at, true, what, detail, c.tmpl.period_expression});
  };
  std::string against = "period " + Seconds(c.period) + " against the step bound " +
                        Seconds(tran.max_step_s) + ": " + Count(per_period) + " steps per period";
  if (explicit_step && per_period < kMinStepsPerPeriod) {
    in_sweep("max-step",
             "'max-step' must give at least " + Count(kMinStepsPerPeriod) +
                 " steps per period to resolve the commutations",
             against);
  } else if (per_period > kMaxStepsPerPeriod) {
    std::string what = "a point may take at most " + Count(kMaxStepsPerPeriod) +
                       " steps per period (is the period or the step bound what you meant?)";
    if (explicit_step) {
      in_sweep("max-step", what, against);
    } else {
      c.Add(period_at, what, against, c.tmpl.period_expression);
    }
  } else {
    const double measured = MeasuredRunFor(c.spec, c.tmpl, c.resolved, c.period).periods;
    double steps = (sim.max_periods + measured) * per_period;
    if (steps <= kMaxStepsPerPoint) return;
    std::string what = "a point may take at most " + Count(kMaxStepsPerPoint) + " steps";
    std::string detail = "(max-periods " + std::to_string(sim.max_periods) + " + " +
                         FormatNumber(measured) + " periods of the measured run) x " +
                         Count(per_period) + " steps per period = " + Count(steps);
    if (sim.where.line > 0) {
      in_sweep("max-periods", what, detail);
    } else {
      c.Add(period_at, what, detail, c.tmpl.period_expression);
    }
  }
}

// Every check of one point (the later ones only once its values evaluate).
void CheckPoint(const SweepSpec& spec, const Template& tmpl, const SourceText& sweep,
                const SourceText& source, const Point& point, const PointEvaluator& evaluator,
                const std::vector<ValueCard>& cards, const std::vector<CommandSource>& commands,
                Findings* findings, EvalCache* cache) {
  Variables resolved;
  Diagnostic error;
  if (!ResolveParams(tmpl, point.values, &resolved, &error)) {
    std::string expression;
    for (const ParamDecl& p : tmpl.params) {
      if (p.where.line == error.where.line) expression += p.expression + " ";
    }
    findings->Add(point, {error.where, false, error.message, "", expression});
    return;
  }
  PointContext c{spec, tmpl, sweep, source, point, resolved, 0, findings, cache};
  SourceLocation period_at{tmpl.path, tmpl.period_where.line,
                           source.FindText(tmpl.period_where.line, tmpl.period_expression)};
  std::string message;
  int column = 0;
  if (!EvaluateExpression(tmpl.period_expression, resolved, &c.period, &message, &column)) {
    c.Add(period_at, "the period '" + tmpl.period_expression + "' cannot be evaluated: " + message,
          "", tmpl.period_expression);
    return;
  }
  if (!(c.period > 0)) {
    c.Add(period_at, "the period '" + tmpl.period_expression + "' must be > 0",
          "it is " + Seconds(c.period), tmpl.period_expression);
    return;
  }
  CheckDeadTimes(c);
  CheckRequiredDeadTimes(c);
  CheckPositiveParams(c);
  CheckValueCards(c, cards);
  CheckCommands(c, commands);
  CheckSteps(c, evaluator);
}

}  // namespace

std::vector<Diagnostic> CheckPoints(const SweepSpec& spec, const Template& tmpl,
                                    const std::vector<Point>& points,
                                    const PointEvaluator& evaluator,
                                    const std::string& sweep_text) {
  SourceText sweep(spec.path, sweep_text);
  SourceText source(tmpl.path);
  std::vector<ValueCard> cards;
  std::vector<CommandSource> commands;
  ScanCards(tmpl, &cards, &commands);
  Findings findings(spec, tmpl);
  EvalCache cache;
  for (const Point& point : points) {
    CheckPoint(spec, tmpl, sweep, source, point, evaluator, cards, commands, &findings, &cache);
  }
  return findings.Report(points.size(), sweep, source);
}

}  // namespace zvsmap
