#include "netlist/render.h"

#include <cctype>
#include <sstream>

#include "core/spice_number.h"
#include "core/text.h"
#include "netlist/cell_vectors.h"

namespace zvsmap {

namespace {

// The dot-command a line starts with (".tran", ".param", ...), lower-case, or "".
std::string DotCommand(const std::string& line) {
  std::string t = Trim(line);
  if (t.empty() || t[0] != '.') return "";
  size_t end = 1;
  while (end < t.size() && (std::isalnum(static_cast<unsigned char>(t[end])) || t[end] == '_'))
    ++end;
  return Lower(t.substr(0, end));
}

// Evaluates a template expression (names lower-cased, as SPICE treats them).
bool EvalTemplateExpr(const std::string& expr, const Variables& vars, const SourceLocation& where,
                      const std::string& what, double* value, Diagnostic* error) {
  std::string message;
  int column = 0;
  if (EvaluateExpression(Lower(expr), vars, value, &message, &column)) return true;
  *error = Diagnostic{where, what + " '" + expr + "': " + message, {}};
  return false;
}

}  // namespace

bool ResolveParams(const Template& tmpl, const std::vector<ParamValue>& values, Variables* resolved,
                   Diagnostic* error) {
  resolved->clear();
  Variables given;
  for (const auto& v : values) given[Lower(v.name)] = v.value;
  for (const auto& p : tmpl.params) {
    auto it = given.find(p.name);
    if (it != given.end()) {
      (*resolved)[p.name] = it->second;
      continue;
    }
    double value = 0;
    if (!EvalTemplateExpr(p.expression, *resolved, p.where, "cannot evaluate .param " + p.name,
                          &value, error)) {
      return false;
    }
    (*resolved)[p.name] = value;
  }
  // Values for names the template does not declare are a caller bug (the sweep
  // stage checks names against the template before anything runs).
  for (const auto& [name, value] : given) {
    if (!resolved->count(name)) {
      *error = Diagnostic{{tmpl.path, 0, 0}, "template declares no parameter '" + name + "'", {}};
      return false;
    }
  }
  return true;
}

bool ResolvePeriod(const Template& tmpl, const Variables& resolved, double* period_s,
                   Diagnostic* error) {
  if (!EvalTemplateExpr(tmpl.period_expression, resolved, tmpl.period_where,
                        "cannot evaluate the period", period_s, error)) {
    return false;
  }
  if (!(*period_s > 0)) {
    *error = Diagnostic{tmpl.period_where,
                        "the period evaluates to " + FormatNumber(*period_s) + " s, not > 0",
                        {}};
    return false;
  }
  return true;
}

Deck RenderDeck(const Template& tmpl, const Variables& resolved, const TranSettings& tran,
                const std::vector<std::string>& vectors) {
  Deck deck;
  // SPICE reads the first line as the title (checked by the include closure).
  std::string title = tmpl.lines.empty() ? "" : Trim(tmpl.lines.front().second);
  deck.lines.push_back({title.empty() ? "zvsmap deck" : title, {tmpl.path, 1, 0}});
  bool params_written = false;
  for (const DeckLine& card : tmpl.body) {
    if (card.origin.file == tmpl.path && DotCommand(card.text) == ".param") {
      // All parameters, resolved to numbers, where the first .param stood.
      if (!params_written) {
        for (const auto& p : tmpl.params) {
          deck.lines.push_back(
              {".param " + p.name + "=" + FormatNumber(resolved.at(p.name)), p.where});
        }
        params_written = true;
      }
      continue;
    }
    deck.lines.push_back(card);
  }
  deck.AddGenerated("* zvsmap analysis settings");
  deck.AddGenerated(".options method=gear reltol=" + FormatNumber(tran.reltol));
  if (!vectors.empty()) {
    std::string save = ".save";
    for (const auto& v : vectors) save += " " + v;
    deck.AddGenerated(save);
  }
  double tstep = tran.max_step_s > 0 ? tran.max_step_s : tran.tstop_s / 1000;
  deck.AddGenerated(".tran " + FormatNumber(tstep) + " " + FormatNumber(tran.tstop_s) + " " +
                    FormatNumber(tran.tstart_s) + " " + FormatNumber(tstep) + " uic");
  deck.AddGenerated(".end");
  return deck;
}

std::string RenderNetlist(const Template& tmpl, const Variables& resolved, const TranSettings& tran,
                          const std::vector<std::string>& vectors) {
  return RenderDeck(tmpl, resolved, tran, vectors).Text();
}

std::vector<std::string> VectorsToSave(const Template& tmpl) {
  std::vector<std::string> out;
  auto add = [&](const std::string& v) {
    for (const auto& x : out)
      if (x == v) return;
    out.push_back(v);
  };
  for (const auto& c : tmpl.cells) {
    for (const std::string& v : CellVectorsFor(c).All()) add(v);
  }
  for (const auto& s : tmpl.states) add(s.vector);
  for (const auto& v : RegulationVectors(tmpl.regulation, tmpl.power)) add(v);
  return out;
}

}  // namespace zvsmap
