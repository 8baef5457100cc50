// Analytic (hand-calculation) models of converter topologies: the interface
// every model implements and the registry that finds one by name. A template
// chooses its model with the annotation `*@ model NAME [input=param ...]`.
#pragma once

#include <cmath>
#include <map>
#include <string>
#include <vector>

#include "core/expression.h"
#include "netlist/template.h"

namespace zvsmap {

/// When a predicted and a simulated value count as disagreeing: the
/// difference exceeds max(relative * |predicted|, absolute).
struct Tolerance {
  double relative = 0.05;
  double absolute = 0;

  /// True when the pair disagrees. Both NaN agree (neither side has a value);
  /// exactly one NaN disagrees.
  bool Exceeded(double predicted, double simulated) const;
  /// "5%", "0.5n", "5% or 0.1" (for the explain output).
  std::string Describe() const;
};

/// One predicted quantity, with the working that led to it.
struct Prediction {
  std::string name;                ///< unique per model and cell; carries its unit ("i_valley_a")
  double value = NAN;              ///< NaN when the model does not apply (e.g. no ZVS reached)
  std::string edge;                ///< "high_on"/"low_on", or "" for the whole cell
  std::string metric;              ///< the simulated metric column it pairs with, or ""
  Tolerance tolerance;             ///< for the pairing
  std::string formula;             ///< the formula in symbols, e.g. "dI = (Vin - Vo)*D/(L*fs)"
  std::string source;              ///< where the formula comes from (netlists/references.md tag)
  std::vector<std::string> steps;  ///< the formula with numbers, intermediate values
  bool user = false;               ///< from the sweep file's <predict>, not the built-in model
  /// The pairing's column tag for a built-in prediction ("" = "pred"); two
  /// built-in predictions of one metric need different tags.
  std::string tag;
};

/// One input a model reads from the resolved template parameters.
struct ModelInput {
  std::string name;         ///< the model's name for it (lower-case), e.g. "vin"
  std::string description;  ///< e.g. "input voltage, V"
  bool required = true;
};

/// What a model sees for one point and one cell.
struct ModelContext {
  const Variables* params = nullptr;            ///< resolved template parameters, lower-case keys
  const CellSpec* cell = nullptr;               ///< the commutation cell the model describes
  std::map<std::string, std::string> bindings;  ///< model input -> template parameter

  /// The value of a model input: the bound parameter (default: the parameter
  /// of the same name), or NaN when the template has none.
  double Input(const std::string& name) const;
  /// The template parameter an input reads.
  std::string ParamOf(const std::string& name) const;
};

/// A topology's analytic model.
class TopologyModel {
 public:
  virtual ~TopologyModel() = default;
  /// The name used in `*@ model NAME`.
  virtual std::string Name() const = 0;
  /// One line: what the model assumes.
  virtual std::string Assumptions() const = 0;
  /// The inputs the model reads.
  virtual std::vector<ModelInput> Inputs() const = 0;
  /// Computes the predictions for one point. Fails (message in `error`) only
  /// when an input is missing or out of the model's domain.
  virtual bool Predict(const ModelContext& context, std::vector<Prediction>* out,
                       std::string* error) const = 0;
};

/// Appends a prediction (no metric pairing yet) and returns it, so the caller
/// can set `metric`, `tolerance` or `tag`. Shared by every model.
Prediction& AddPrediction(std::vector<Prediction>* out, std::string name, double value,
                          std::string formula, std::string source, std::vector<std::string> steps,
                          std::string edge = "");

/// Checks that every required input of `model` has a value in `context`;
/// otherwise fails with "model 'NAME' needs input 'x' (...): the template
/// has no parameter 'p'".
bool CheckRequiredInputs(const TopologyModel& model, const ModelContext& context,
                         std::string* error);

/// The model registered under `name` (case-insensitive), or nullptr.
const TopologyModel* FindTopologyModel(const std::string& name);

/// The names of all registered models.
std::vector<std::string> TopologyModelNames();

}  // namespace zvsmap
