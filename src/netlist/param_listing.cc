#include "netlist/param_listing.h"

#include <algorithm>
#include <cctype>

#include "core/text.h"

namespace zvsmap {

namespace {

bool IsNameStart(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool IsNameChar(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; }

void AddUse(std::vector<ParamListing>* list, const std::string& param, const std::string& use) {
  if (param.empty()) return;
  for (ParamListing& p : *list) {
    if (!SameName(p.name, param)) continue;
    if (std::find(p.uses.begin(), p.uses.end(), use) == p.uses.end()) p.uses.push_back(use);
  }
}

void AddCellUses(const CellSpec& c, std::vector<ParamListing>* list) {
  const std::pair<const char*, const std::string*> keys[] = {
      {"high_dead", &c.high_dead}, {"low_dead", &c.low_dead},     {"high_vth", &c.high_vth},
      {"low_vth", &c.low_vth},     {"inductance", &c.inductance}, {"coss", &c.coss}};
  for (const auto& [key, param] : keys) AddUse(list, *param, "cell " + c.name + " " + key);
}

}  // namespace

std::vector<std::string> ExpressionNames(const std::string& expression) {
  std::vector<std::string> names;
  size_t i = 0;
  while (i < expression.size()) {
    char c = expression[i];
    if (std::isdigit(static_cast<unsigned char>(c)) || c == '.') {
      // A number with its SPICE suffix ("500k", "1meg", "1e-3") holds no name.
      while (i < expression.size() && (IsNameChar(expression[i]) || expression[i] == '.')) ++i;
      continue;
    }
    if (!IsNameStart(c)) {
      ++i;
      continue;
    }
    size_t start = i;
    while (i < expression.size() && IsNameChar(expression[i])) ++i;
    std::string name = Lower(expression.substr(start, i - start));
    if (std::find(names.begin(), names.end(), name) == names.end()) names.push_back(name);
  }
  return names;
}

std::vector<ParamListing> ListParams(const Template& tmpl,
                                     const std::vector<std::string>& model_inputs) {
  std::vector<ParamListing> list;
  for (const ParamDecl& d : tmpl.params) {
    ParamListing p;
    p.name = d.name;
    p.expression = d.expression;
    p.computed = !ExpressionNames(d.expression).empty();
    p.where = d.where;
    list.push_back(std::move(p));
  }
  for (const std::string& name : ExpressionNames(tmpl.period_expression)) {
    AddUse(&list, name, "period");
  }
  for (const CellSpec& c : tmpl.cells) AddCellUses(c, &list);
  for (const StateSpec& s : tmpl.states) AddUse(&list, s.init_param, "state " + s.vector + " init");
  for (const std::string& input : model_inputs) {
    std::string param = input;
    for (const auto& [in, bound] : tmpl.model_bindings) {
      if (SameName(in, input)) param = bound;
    }
    AddUse(&list, param, "model input " + Lower(input));
  }
  return list;
}

}  // namespace zvsmap
