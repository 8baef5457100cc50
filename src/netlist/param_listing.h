// What a template offers a sweep file: its .params and where zvsmap's
// annotations use them (for `zvsmap params` and "no such .param" hints).
#pragma once

#include <string>
#include <vector>

#include "netlist/template.h"

namespace zvsmap {

/// One declared parameter and the annotations that read it.
struct ParamListing {
  std::string name;        ///< lower-case, as declared
  std::string expression;  ///< the default: a number or an expression
  bool computed = false;   ///< true when the default is an expression over other names
  SourceLocation where;
  /// Annotation uses, e.g. "period", "cell leg high_dead", "state i(l1) init",
  /// "model input vin"; empty when no annotation reads the parameter.
  std::vector<std::string> uses;
};

/// Every .param of `tmpl` in file order with its annotation uses. A parameter
/// named in the period expression counts as used by "period"; a model input
/// reads the parameter bound to it (`*@ model NAME input=param`), else the
/// one of the input's own name (`model_inputs`: the model's input names).
std::vector<ParamListing> ListParams(const Template& tmpl,
                                     const std::vector<std::string>& model_inputs);

/// The identifiers (letters, digits, '_', starting with a letter or '_') in
/// an expression, lower-case, each once, in order of first appearance.
std::vector<std::string> ExpressionNames(const std::string& expression);

}  // namespace zvsmap
