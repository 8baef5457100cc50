#include "netlist/regulation_annotations.h"

#include <cctype>
#include <map>

#include "core/spice_number.h"
#include "core/text.h"

namespace zvsmap {

namespace {

Diagnostic At(const SourceLocation& where, const std::string& message) {
  return Diagnostic{where, message, {}};
}

// key=value words after the first `skip` words; false on a malformed word.
bool KeyValues(const std::vector<std::string>& words, size_t skip, const SourceLocation& where,
               std::map<std::string, std::string>* out, Diagnostic* error) {
  for (size_t k = skip; k < words.size(); ++k) {
    size_t eq = words[k].find('=');
    if (eq == std::string::npos || eq == 0 || eq + 1 == words[k].size()) {
      *error = At(where, "expected key=value in '*@ " + words[0] + "', got '" + words[k] + "'");
      return false;
    }
    std::string key = Lower(words[k].substr(0, eq));
    if (out->count(key)) {
      *error = At(where, "'" + key + "' given twice in '*@ " + words[0] + "'");
      return false;
    }
    (*out)[key] = words[k].substr(eq + 1);
  }
  return true;
}

// Every key of `kv` is one of `known` or `optional`, and every `known` key is there.
bool OnlyKeys(const std::map<std::string, std::string>& kv, const std::vector<std::string>& known,
              const std::string& kind, const SourceLocation& where, Diagnostic* error,
              const std::vector<std::string>& optional = {}) {
  for (const auto& [key, value] : kv) {
    bool ok = false;
    for (const auto& k : known) ok = ok || k == key;
    for (const auto& k : optional) ok = ok || k == key;
    if (!ok) {
      *error = At(where, "unknown key '" + key + "' in '*@ " + kind + "'");
      return false;
    }
  }
  for (const auto& k : known) {
    if (!kv.count(k)) {
      *error = At(where, "'*@ " + kind + "' needs " + k + "=");
      return false;
    }
  }
  return true;
}

bool IsVectorName(const std::string& s) {
  if (s.size() < 4 || (s[0] != 'v' && s[0] != 'i') || s[1] != '(' || s.back() != ')') return false;
  for (size_t k = 2; k + 1 < s.size(); ++k) {
    char c = s[k];
    if (!(std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '.' || c == ',')) {
      return false;
    }
  }
  return true;
}

// "-v(in)*i(vsupply)" -> sign -1, v(in), i(vsupply).
bool ParseProduct(const std::string& text, const SourceLocation& where, PowerProduct* out,
                  Diagnostic* error) {
  std::string t = Lower(text);
  out->sign = 1;
  if (!t.empty() && (t[0] == '-' || t[0] == '+')) {
    out->sign = t[0] == '-' ? -1 : 1;
    t = t.substr(1);
  }
  size_t star = t.find('*');
  if (star != std::string::npos) {
    out->voltage = t.substr(0, star);
    out->current = t.substr(star + 1);
  }
  if (star == std::string::npos || out->voltage[0] != 'v' || out->current[0] != 'i' ||
      !IsVectorName(out->voltage) || !IsVectorName(out->current)) {
    *error = At(where, "expected a power as [-]v(node)*i(source), e.g. '-v(in)*i(vsupply)', got '" +
                           text + "'");
    return false;
  }
  return true;
}

// A control bound is spelled as a plain number with at most a scale factor:
// a unit letter ("0.95V") or a misread suffix ("1MEGA") is refused, as no
// warning reaches the user from a template's annotation.
bool PlainBound(const std::map<std::string, std::string>& kv, const char* key,
                const SourceLocation& where, Diagnostic* error) {
  auto it = kv.find(key);
  if (it == kv.end()) return true;  // missing: the range check says so
  NumberSpelling spelling = JudgeSpiceSpelling(it->second);
  if (spelling.kind == NumberSpelling::Kind::kPlain) return true;
  *error = At(where, "'*@ control' " + std::string(key) + "=" + it->second + ": " +
                         spelling.message + "; write a plain number");
  return false;
}

bool ParseControl(const std::vector<std::string>& words, const SourceLocation& where,
                  RegulationSpec* out, Diagnostic* error) {
  std::map<std::string, std::string> kv;
  if (words.size() < 2 || words[1].find('=') != std::string::npos) {
    *error = At(where, "expected '*@ control <param> min=<number> max=<number>'");
    return false;
  }
  if (!KeyValues(words, 2, where, &kv, error) ||
      !OnlyKeys(kv, {"min", "max"}, "control", where, error, {"default"})) {
    return false;
  }
  if (!PlainBound(kv, "min", where, error) || !PlainBound(kv, "max", where, error)) return false;
  auto lo = ParseSpiceNumber(kv["min"]), hi = ParseSpiceNumber(kv["max"]);
  if (!lo || !hi || !(*lo < *hi)) {
    *error = At(where,
                "'*@ control' needs numbers min < max, got min=" + kv["min"] + " max=" + kv["max"]);
    return false;
  }
  auto by_default = kv.find("default");
  std::string loop = by_default == kv.end() ? "regulated" : Lower(by_default->second);
  if (loop != "regulated" && loop != "open") {
    *error = At(where, "'*@ control' default=" + by_default->second +
                           ": expected default=regulated or default=open");
    return false;
  }
  out->regulated_by_default = loop == "regulated";
  out->param = Lower(words[1]);
  out->min = *lo;
  out->max = *hi;
  out->control_where = where;
  return true;
}

bool ParseRegulate(const std::vector<std::string>& words, const SourceLocation& where,
                   RegulationSpec* out, Diagnostic* error) {
  std::map<std::string, std::string> kv;
  if (words.size() < 2 || !IsVectorName(Lower(words[1])) || words[1][0] == 'i' ||
      words[1][0] == 'I') {
    *error = At(where, "expected '*@ regulate v(<node>) target=<param>'");
    return false;
  }
  if (!KeyValues(words, 2, where, &kv, error) ||
      !OnlyKeys(kv, {"target"}, "regulate", where, error)) {
    return false;
  }
  out->vector = Lower(words[1]);
  out->target = Lower(kv["target"]);
  out->regulate_where = where;
  return true;
}

bool ParsePower(const std::vector<std::string>& words, const SourceLocation& where, PowerSpec* out,
                Diagnostic* error) {
  std::map<std::string, std::string> kv;
  if (!KeyValues(words, 1, where, &kv, error) ||
      !OnlyKeys(kv, {"input", "output"}, "power", where, error)) {
    return false;
  }
  out->where = where;
  return ParseProduct(kv["input"], where, &out->input, error) &&
         ParseProduct(kv["output"], where, &out->output, error);
}

}  // namespace

bool IsRegulationAnnotation(const std::string& kind) {
  return kind == "control" || kind == "regulate" || kind == "power";
}

bool ParseRegulationAnnotation(const std::vector<std::string>& words, const SourceLocation& where,
                               RegulationSpec* regulation, PowerSpec* power, Diagnostic* error) {
  const std::string kind = Lower(words[0]);
  bool repeated = (kind == "control" && !regulation->param.empty()) ||
                  (kind == "regulate" && !regulation->vector.empty()) ||
                  (kind == "power" && power->declared());
  if (repeated) {
    *error = At(where, "more than one '*@ " + kind + "'");
    return false;
  }
  if (kind == "control") return ParseControl(words, where, regulation, error);
  if (kind == "regulate") return ParseRegulate(words, where, regulation, error);
  return ParsePower(words, where, power, error);
}

std::vector<std::string> RegulationVectors(const RegulationSpec& regulation,
                                           const PowerSpec& power) {
  std::vector<std::string> out;
  if (!regulation.vector.empty()) out.push_back(regulation.vector);
  for (const PowerProduct* p : {&power.input, &power.output}) {
    if (!p->declared()) continue;
    out.push_back(p->voltage);
    out.push_back(p->current);
  }
  return out;
}

bool RunsRegulated(const RegulationSpec& regulation, const SimulationSettings& simulation) {
  using Loop = SimulationSettings::Loop;
  if (!regulation.declared() || simulation.loop == Loop::kOpen) return false;
  return simulation.loop == Loop::kRegulated || regulation.regulated_by_default;
}

}  // namespace zvsmap
