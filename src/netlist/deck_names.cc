#include "netlist/deck_names.h"

#include <cctype>
#include <sstream>

#include "core/text.h"

namespace zvsmap {

namespace {

std::vector<std::string> Words(const std::string& text) {
  std::istringstream in(text);
  std::vector<std::string> out;
  for (std::string w; in >> w;) out.push_back(Lower(w));
  return out;
}

bool EndsNodes(const std::string& w) {
  static const char* const kKeywords[] = {"value", "poly", "table", "vol", "cur", "params:"};
  if (w.find_first_of("=({'") != std::string::npos) return true;
  for (const char* k : kKeywords) {
    if (w == k) return true;
  }
  return false;
}

// How many words after the name may be nodes (an upper bound).
size_t MaxNodes(char letter) {
  switch (letter) {
    case 'r':
    case 'c':
    case 'l':
    case 'v':
    case 'i':
    case 'd':
    case 'f':
    case 'h':
    case 'b':
    case 'w':
      return 2;
    case 'j':
    case 'z':
      return 3;
    case 'e':
    case 'g':
    case 's':
    case 't':
    case 'o':
      return 4;
    case 'k':
      return 0;
    default:
      return 64;  // x, q, m, a, ...: every word that can be a node
  }
}

std::vector<std::string> ElementNodes(const std::vector<std::string>& w) {
  std::vector<std::string> nodes;
  size_t max = MaxNodes(w[0][0]);
  for (size_t i = 1; i < w.size() && nodes.size() < max && !EndsNodes(w[i]); ++i) {
    nodes.push_back(w[i]);
  }
  // A subcircuit instance ends with the subcircuit's name.
  if (w[0][0] == 'x' && !nodes.empty()) nodes.pop_back();
  return nodes;
}

// The annotation text beginning at `where` and its `*@+` continuation lines.
struct AnnotationLine {
  int line;
  std::string text;
};
std::vector<AnnotationLine> AnnotationText(const Template& tmpl, const SourceLocation& where) {
  std::vector<AnnotationLine> out;
  for (const DeckLine& l : tmpl.body) {
    if (l.origin.file != tmpl.path || l.origin.line < where.line) continue;
    std::string t = Trim(l.text);
    if (l.origin.line > where.line && t.compare(0, 3, "*@+") != 0) break;
    out.push_back({l.origin.line, l.text});
  }
  return out;
}

Diagnostic Missing(const Template& tmpl, const SourceLocation& where, const std::string& key,
                   const std::string& what, const std::string& name,
                   const std::set<std::string>& candidates) {
  std::string hint = ClosestName(name, candidates);
  Diagnostic d{where,
               what + " '" + name + "' (" + key + ") is not in the template's deck" +
                   (hint.empty() ? "" : " (did you mean '" + hint + "'?)"),
               {}};
  // The caret goes under `key=name`, else under the name (state vectors).
  std::vector<AnnotationLine> lines = AnnotationText(tmpl, where);
  for (const std::string& needle : {key + "=" + name, name}) {
    for (const auto& a : lines) {
      size_t at = Lower(a.text).find(needle);
      if (at == std::string::npos) continue;
      d.where.line = a.line;
      d.where.column = static_cast<int>(at + 1);
      d.source_line = a.text;
      return d;
    }
  }
  return d;
}

}  // namespace

DeckNames CollectDeckNames(const std::vector<DeckLine>& cards) {
  DeckNames names;
  names.nodes = {"0", "gnd"};
  int depth = 0;
  for (const DeckLine& l : cards) {
    if (IsCommentOrBlank(l.text)) continue;
    std::vector<std::string> w = Words(l.text);
    if (w[0] == ".subckt") ++depth;
    if (w[0] == ".ends" && depth > 0) --depth;
    if (depth > 0 || !std::isalpha(static_cast<unsigned char>(w[0][0]))) continue;
    names.elements.insert(w[0]);
    for (const auto& n : ElementNodes(w)) names.nodes.insert(n);
  }
  return names;
}

std::vector<Diagnostic> CheckAnnotationNames(const Template& tmpl) {
  DeckNames names = CollectDeckNames(tmpl.body);
  std::vector<Diagnostic> out;
  auto node = [&](const CellSpec& c, const char* key, const std::string& n) {
    if (!n.empty() && !names.nodes.count(n))
      out.push_back(Missing(tmpl, c.where, key, "cell '" + c.name + "': node", n, names.nodes));
  };
  auto element = [&](const SourceLocation& where, const std::string& key, const std::string& what,
                     const std::string& n) {
    if (!n.empty() && !names.elements.count(n))
      out.push_back(Missing(tmpl, where, key, what, n, names.elements));
  };
  for (const CellSpec& c : tmpl.cells) {
    const std::pair<const char*, const std::string*> nodes[] = {{"node", &c.node},
                                                                {"rail_high", &c.rail_high},
                                                                {"rail_low", &c.rail_low},
                                                                {"high_cmd", &c.high_cmd},
                                                                {"low_cmd", &c.low_cmd},
                                                                {"high_gate", &c.high_gate},
                                                                {"high_source", &c.high_source},
                                                                {"low_gate", &c.low_gate},
                                                                {"low_source", &c.low_source}};
    for (const auto& [key, n] : nodes) node(c, key, *n);
    element(c.where, "current", "cell '" + c.name + "': sense source", c.current);
    element(c.where, "high", "cell '" + c.name + "': switch instance", c.high);
    element(c.where, "low", "cell '" + c.name + "': switch instance", c.low);
  }
  for (const StateSpec& s : tmpl.states) {
    const std::string& v = s.vector;
    if (v.size() < 4 || v.back() != ')' || (v[0] != 'v' && v[0] != 'i') || v[1] != '(') {
      out.push_back({s.where, "state vector '" + v + "' is not v(node), v(a,b) or i(element)", {}});
      continue;
    }
    std::string inner = v.substr(2, v.size() - 3);
    if (v[0] == 'v') {
      std::istringstream parts(inner);
      for (std::string n; std::getline(parts, n, ',');) {
        n = Trim(n);
        if (n.find('.') == std::string::npos && !names.nodes.count(n))
          out.push_back(Missing(tmpl, s.where, "v", "state: node", n, names.nodes));
      }
    } else if (inner.find('.') == std::string::npos) {
      element(s.where, "i", "state: element", inner);
    }
  }
  return out;
}

std::vector<Diagnostic> CheckDeviceNodes(const Template& tmpl,
                                         const std::vector<ResolvedDevice>& devices) {
  DeckNames names = CollectDeckNames(tmpl.body);
  std::vector<Diagnostic> out;
  for (const ResolvedDevice& d : devices) {
    for (const PinTie& tie : d.spec.pins) {
      if (tie.to.size() < 2 || tie.to[0] != '@' || names.nodes.count(tie.to.substr(1))) continue;
      std::string hint = ClosestName(tie.to.substr(1), names.nodes);
      out.push_back({d.spec.pins_where,
                     "device '" + d.spec.name + "': the pin map ties a pin to node '" +
                         tie.to.substr(1) + "', which the template's deck (" + tmpl.path +
                         ") does not have" +
                         (hint.empty() ? "" : " (did you mean '@" + hint + "'?)"),
                     {}});
    }
  }
  return out;
}

bool CheckDeckNames(const Template& tmpl, const std::vector<ResolvedDevice>& devices,
                    std::vector<Diagnostic>* errors) {
  std::vector<Diagnostic> a = CheckAnnotationNames(tmpl);
  std::vector<Diagnostic> b = CheckDeviceNodes(tmpl, devices);
  errors->insert(errors->end(), a.begin(), a.end());
  errors->insert(errors->end(), b.begin(), b.end());
  return a.empty() && b.empty();
}

}  // namespace zvsmap
