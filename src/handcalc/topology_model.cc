#include "handcalc/topology_model.h"

#include <algorithm>
#include <cctype>

#include "core/spice_number.h"
#include "handcalc/boost_model.h"
#include "handcalc/buck_model.h"
#include "handcalc/fullbridge_psm_model.h"

namespace zvsmap {

bool Tolerance::Exceeded(double predicted, double simulated) const {
  bool p = std::isnan(predicted), s = std::isnan(simulated);
  if (p || s) return p != s;
  double limit = std::max(relative * std::fabs(predicted), absolute);
  return std::fabs(simulated - predicted) > limit;
}

std::string Tolerance::Describe() const {
  std::string rel = relative > 0 ? FormatNumber(relative * 100) + "%" : "";
  std::string abs = absolute > 0 ? FormatEngineering(absolute) : "";
  if (!rel.empty() && !abs.empty()) return rel + " or " + abs;
  if (rel.empty() && abs.empty()) return "0";
  return rel + abs;
}

std::string ModelContext::ParamOf(const std::string& name) const {
  auto it = bindings.find(name);
  return it == bindings.end() ? name : it->second;
}

double ModelContext::Input(const std::string& name) const {
  std::string param = ParamOf(name);
  for (char& c : param) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  auto it = params->find(param);
  return it == params->end() ? NAN : it->second;
}

Prediction& AddPrediction(std::vector<Prediction>* out, std::string name, double value,
                          std::string formula, std::string source, std::vector<std::string> steps,
                          std::string edge) {
  Prediction p;
  p.name = std::move(name);
  p.value = value;
  p.edge = std::move(edge);
  p.formula = std::move(formula);
  p.source = std::move(source);
  p.steps = std::move(steps);
  out->push_back(std::move(p));
  return out->back();
}

bool CheckRequiredInputs(const TopologyModel& model, const ModelContext& context,
                         std::string* error) {
  for (const ModelInput& in : model.Inputs()) {
    if (in.required && std::isnan(context.Input(in.name))) {
      *error = "model '" + model.Name() + "' needs input '" + in.name + "' (" + in.description +
               "): the template has no parameter '" + context.ParamOf(in.name) + "'";
      return false;
    }
  }
  return true;
}

namespace {

// Every built-in model; a new topology adds its line here.
std::vector<const TopologyModel*> Registry() {
  return {&BuckModel(), &FullBridgePsmModel(), &BoostModel()};
}

}  // namespace

const TopologyModel* FindTopologyModel(const std::string& name) {
  for (const TopologyModel* m : Registry()) {
    if (EditDistance(m->Name(), name) == 0 && m->Name().size() == name.size()) return m;
  }
  return nullptr;
}

std::vector<std::string> TopologyModelNames() {
  std::vector<std::string> names;
  for (const TopologyModel* m : Registry()) names.push_back(m->Name());
  return names;
}

}  // namespace zvsmap
