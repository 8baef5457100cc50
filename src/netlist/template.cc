#include "netlist/template.h"

#include <cctype>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <optional>
#include <sstream>

#include "core/spice_number.h"
#include "core/text.h"
#include "netlist/include_closure.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

namespace {

bool StartsWithNoCase(const std::string& s, const std::string& prefix) {
  return Lower(s.substr(0, prefix.size())) == prefix;
}

std::vector<std::string> SplitBlanks(const std::string& s) {
  std::istringstream in(s);
  std::vector<std::string> out;
  for (std::string w; in >> w;) out.push_back(w);
  return out;
}

Diagnostic At(const std::string& path, int line, const std::string& message) {
  return Diagnostic{{path, line, 0}, message, {}};
}

// Splits ".param a=1 b = {x*2} c='y'" into (name, expression) pairs. Returns
// false with a message on malformed input.
bool SplitParamLine(const std::string& body, std::vector<std::pair<std::string, std::string>>* out,
                    std::string* message) {
  size_t i = 0;
  auto skip = [&] {
    while (i < body.size() && std::isspace(static_cast<unsigned char>(body[i]))) ++i;
  };
  while (true) {
    skip();
    if (i >= body.size()) return true;
    size_t name_start = i;
    while (i < body.size() && (std::isalnum(static_cast<unsigned char>(body[i])) || body[i] == '_'))
      ++i;
    std::string name = body.substr(name_start, i - name_start);
    skip();
    if (name.empty() || i >= body.size() || body[i] != '=') {
      *message = "malformed .param declaration (expected name=value)";
      return false;
    }
    ++i;
    skip();
    std::string value;
    if (i < body.size() && (body[i] == '{' || body[i] == '\'')) {
      char close = body[i] == '{' ? '}' : '\'';
      size_t end = body.find(close, i + 1);
      if (end == std::string::npos) {
        *message = std::string("unclosed '") + body[i] + "' in .param " + name;
        return false;
      }
      value = body.substr(i + 1, end - i - 1);
      i = end + 1;
    } else {
      size_t start = i;
      while (i < body.size() && !std::isspace(static_cast<unsigned char>(body[i]))) ++i;
      value = body.substr(start, i - start);
    }
    if (Trim(value).empty()) {
      *message = "empty value for .param " + name;
      return false;
    }
    out->emplace_back(Lower(name), Trim(value));
  }
}

const char* const kCellKeys[] = {"node",     "rail_high",  "rail_low",  "current",   "high",
                                 "low",      "high_cmd",   "low_cmd",   "high_gate", "high_source",
                                 "low_gate", "low_source", "high_dead", "low_dead",  "high_vth",
                                 "low_vth",  "inductance", "coss"};
const char* const kRequiredCellKeys[] = {"node",    "rail_high", "rail_low",
                                         "current", "high_cmd",  "low_cmd"};

// `*@ measure lead=P` (P in periods, kMinMeasureLead to kMaxMeasureLead).
bool ParseMeasureLead(const std::vector<std::string>& words, const std::string& path, int line,
                      Template* out, Diagnostic* error) {
  const std::string usage = "expected '*@ measure lead=<periods>', e.g. '*@ measure lead=0.25'";
  if (words.size() != 2 || Lower(words[1]).rfind("lead=", 0) != 0) {
    *error = At(path, line, usage);
    return false;
  }
  if (!std::isnan(out->measure_lead)) {
    *error = At(path, line, "more than one '*@ measure'");
    return false;
  }
  std::optional<double> lead = ParseSpiceNumber(words[1].substr(5));
  if (!lead || !(*lead >= kMinMeasureLead && *lead <= kMaxMeasureLead)) {
    *error = At(path, line,
                "'*@ measure lead=' must be a number of periods from " +
                    FormatNumber(kMinMeasureLead) + " to " + FormatNumber(kMaxMeasureLead) +
                    ", got '" + words[1].substr(5) + "'");
    return false;
  }
  out->measure_lead = *lead;
  out->measure_where = {path, line, 0};
  return true;
}

bool ParseCell(const std::vector<std::string>& words, const std::string& path, int line,
               CellSpec* cell, Diagnostic* error) {
  // words[0] == "cell", words[1] == name, then key=value pairs.
  if (words.size() < 2 || words[1].find('=') != std::string::npos) {
    *error = At(path, line, "'*@ cell' needs a name first, e.g. '*@ cell leg node=sw ...'");
    return false;
  }
  cell->name = words[1];
  cell->where = {path, line, 0};
  std::map<std::string, std::string> kv;
  for (size_t i = 2; i < words.size(); ++i) {
    size_t eq = words[i].find('=');
    if (eq == std::string::npos || eq == 0 || eq + 1 == words[i].size()) {
      *error = At(path, line, "expected key=value in '*@ cell', got '" + words[i] + "'");
      return false;
    }
    std::string key = Lower(words[i].substr(0, eq));
    bool known = false;
    for (const char* k : kCellKeys) known = known || key == k;
    if (!known) {
      std::vector<std::string> keys(std::begin(kCellKeys), std::end(kCellKeys));
      std::string hint = ClosestName(key, keys);
      *error = At(path, line,
                  "unknown cell key '" + key + "'" +
                      (hint.empty() ? "" : " (did you mean '" + hint + "'?)"));
      return false;
    }
    if (kv.count(key)) {
      *error = At(path, line, "cell key '" + key + "' given twice");
      return false;
    }
    kv[key] = Lower(words[i].substr(eq + 1));
  }
  for (const char* k : kRequiredCellKeys) {
    if (!kv.count(k)) {
      *error = At(path, line, "cell '" + cell->name + "' lacks required key '" + k + "'");
      return false;
    }
  }
  auto get = [&](const char* k) { return kv.count(k) ? kv[k] : std::string(); };
  cell->node = get("node");
  cell->rail_high = get("rail_high");
  cell->rail_low = get("rail_low");
  cell->current = get("current");
  cell->high = get("high");
  cell->low = get("low");
  cell->high_cmd = get("high_cmd");
  cell->low_cmd = get("low_cmd");
  cell->high_gate = get("high_gate");
  cell->high_source = get("high_source");
  cell->low_gate = get("low_gate");
  cell->low_source = get("low_source");
  cell->high_dead = get("high_dead");
  cell->low_dead = get("low_dead");
  cell->high_vth = get("high_vth");
  cell->low_vth = get("low_vth");
  cell->inductance = get("inductance");
  cell->coss = get("coss");
  return true;
}

// `*@ control` and `*@ regulate` come together and name declared parameters.
template <typename RequireParam>
bool CheckRegulation(const Template& t, const RequireParam& require_param, Diagnostic* error) {
  const RegulationSpec& r = t.regulation;
  if (r.param.empty() != r.vector.empty()) {
    const SourceLocation& where = r.param.empty() ? r.regulate_where : r.control_where;
    *error = Diagnostic{where,
                        r.param.empty() ? "'*@ regulate' needs a '*@ control <param> min= max='"
                                        : "'*@ control' needs a '*@ regulate v(<node>) target='",
                        {}};
    return false;
  }
  if (!r.declared()) return true;
  return require_param(r.param, r.control_where, "'*@ control'") &&
         require_param(r.target, r.regulate_where, "'*@ regulate' target");
}

}  // namespace

std::vector<std::string> Template::ParamNames() const {
  std::vector<std::string> names;
  for (const auto& p : params) names.push_back(p.name);
  return names;
}

const ParamDecl* Template::FindParam(const std::string& name) const {
  std::string key = Lower(name);
  for (const auto& p : params)
    if (p.name == key) return &p;
  return nullptr;
}

bool ParseTemplateText(const std::string& text, const std::string& path, Template* out,
                       Diagnostic* error) {
  *out = Template{};
  out->path = path;
  // Every card of the template and of every file it includes is checked
  // before anything else reads it.
  if (!ExpandNetlistText(text, path, /*has_title=*/true, &out->body, error)) return false;

  // Physical lines -> logical lines: SPICE "+" continuations and our "*@+".
  struct Annotation {
    int line;
    std::string text;
  };
  std::vector<Annotation> annotations;
  std::istringstream in(text);
  std::string raw;
  int number = 0;
  while (std::getline(in, raw)) {
    ++number;
    if (!raw.empty() && raw.back() == '\r') raw.pop_back();
    std::string t = Trim(raw);
    if (t.rfind("*@+", 0) == 0) {
      if (annotations.empty()) {
        *error = At(path, number, "'*@+' continues no annotation");
        return false;
      }
      annotations.back().text += " " + t.substr(3);
      continue;
    }
    if (t.rfind("*@", 0) == 0) {
      annotations.push_back({number, t.substr(2)});
      continue;
    }
    if (!t.empty() && t[0] == '+' && !out->lines.empty()) {
      out->lines.back().second += " " + t.substr(1);
      continue;
    }
    out->lines.emplace_back(number, raw);
  }

  for (const auto& [line, logical] : out->lines) {
    std::string t = Trim(logical);
    if (!StartsWithNoCase(t, ".param")) continue;
    if (t.size() > 6 && !std::isspace(static_cast<unsigned char>(t[6]))) continue;
    std::vector<std::pair<std::string, std::string>> pairs;
    std::string message;
    if (!SplitParamLine(t.substr(6), &pairs, &message)) {
      *error = At(path, line, message);
      return false;
    }
    for (auto& [name, expr] : pairs) {
      if (out->FindParam(name)) {
        *error = At(path, line, ".param '" + name + "' declared twice");
        return false;
      }
      out->params.push_back({name, expr, {path, line, 0}});
    }
  }

  for (const auto& a : annotations) {
    std::vector<std::string> words = SplitBlanks(a.text);
    if (words.empty()) continue;
    std::string kind = Lower(words[0]);
    if (kind == "period") {
      if (words.size() < 2) {
        *error = At(path, a.line, "'*@ period' needs an expression, e.g. '*@ period 1/fsw'");
        return false;
      }
      std::string expr = Trim(a.text.substr(a.text.find(words[0]) + words[0].size()));
      out->period_expression = Lower(expr);
      out->period_where = {path, a.line, 0};
    } else if (kind == "cell") {
      CellSpec cell;
      if (!ParseCell(words, path, a.line, &cell, error)) return false;
      for (const auto& c : out->cells) {
        if (c.name == cell.name) {
          *error = At(path, a.line, "cell '" + cell.name + "' declared twice");
          return false;
        }
      }
      out->cells.push_back(cell);
    } else if (kind == "state") {
      if (words.size() != 3 || Lower(words[2]).rfind("init=", 0) != 0 || words[2].size() <= 5) {
        *error = At(path, a.line, "expected '*@ state <vector> init=<param>'");
        return false;
      }
      out->states.push_back({Lower(words[1]), Lower(words[2].substr(5)), {path, a.line, 0}});
    } else if (kind == "model") {
      // `*@ model NAME input=param ...`: which hand-calculation model applies
      // (src/handcalc); the names are checked there, against its registry.
      if (words.size() < 2 || !out->model.empty()) {
        *error = At(path, a.line,
                    words.size() < 2 ? "'*@ model' needs a name, e.g. '*@ model buck'"
                                     : "more than one '*@ model'");
        return false;
      }
      out->model = Lower(words[1]);
      out->model_where = {path, a.line, 0};
      for (size_t k = 2; k < words.size(); ++k) {
        size_t eq = words[k].find('=');
        if (eq == std::string::npos || eq == 0 || eq + 1 == words[k].size()) {
          *error = At(path, a.line, "expected 'input=param' in '*@ model', got '" + words[k] + "'");
          return false;
        }
        out->model_bindings.emplace_back(Lower(words[k].substr(0, eq)),
                                         Lower(words[k].substr(eq + 1)));
      }
    } else if (kind == "measure") {
      if (!ParseMeasureLead(words, path, a.line, out, error)) return false;
    } else if (IsRegulationAnnotation(kind)) {
      if (!ParseRegulationAnnotation(words, {path, a.line, 0}, &out->regulation, &out->power,
                                     error)) {
        return false;
      }
    } else {
      *error = At(path, a.line,
                  "unknown annotation '*@ " + words[0] +
                      "' (known: period, cell, state, model, control, regulate, power, measure)");
      return false;
    }
  }

  if (out->period_expression.empty()) {
    *error = At(path, 0, "template has no '*@ period' annotation");
    return false;
  }
  if (out->cells.empty()) {
    *error = At(path, 0, "template declares no commutation cell ('*@ cell ...')");
    return false;
  }
  // Parameters named by annotations must exist.
  auto require_param = [&](const std::string& name, const SourceLocation& where,
                           const std::string& what) {
    if (name.empty() || out->FindParam(name)) return true;
    std::string hint = ClosestName(name, out->ParamNames());
    *error = Diagnostic{where,
                        what + " names parameter '" + name + "', which has no .param" +
                            (hint.empty() ? "" : " (did you mean '" + hint + "'?)"),
                        {}};
    return false;
  };
  for (const auto& c : out->cells) {
    if (!require_param(c.high_dead, c.where, "cell '" + c.name + "' high_dead")) return false;
    if (!require_param(c.low_dead, c.where, "cell '" + c.name + "' low_dead")) return false;
    const std::pair<const char*, const std::string*> named[] = {{"high_vth", &c.high_vth},
                                                                {"low_vth", &c.low_vth},
                                                                {"inductance", &c.inductance},
                                                                {"coss", &c.coss}};
    for (const auto& [key, name] : named) {
      if (!require_param(*name, c.where, "cell '" + c.name + "' " + key)) return false;
    }
  }
  for (const auto& s : out->states) {
    if (!require_param(s.init_param, s.where, "state '" + s.vector + "'")) return false;
  }
  return CheckRegulation(*out, require_param, error);
}

bool LoadTemplate(const std::string& path, Template* out, Diagnostic* error) {
  std::string text, message;
  if (!ReadDeckFile(path, &text, &message)) {
    std::error_code ec;
    *error = At(path, 0, std::filesystem::exists(path, ec) ? message : "cannot open template file");
    return false;
  }
  return ParseTemplateText(text, path, out, error);
}

double MeasureLead(const SweepSpec& spec, const Template& tmpl) {
  if (!std::isnan(spec.simulation.measure_lead)) return spec.simulation.measure_lead;
  if (!spec.devices.empty() || std::isnan(tmpl.measure_lead)) return kDefaultMeasureLead;
  return tmpl.measure_lead;
}

}  // namespace zvsmap
