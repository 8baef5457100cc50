// The regulation annotations of a template: the control parameter a closed
// loop would adjust, the quantity it holds at a set point, and the two power
// ports of the operating-point record.
//   *@ control D min=0.02 max=0.95 [default=open]
//   *@ regulate v(out) target=Vout
//   *@ power input=-v(in)*i(vsupply) output=v(out)*i(l1)
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// `*@ control` + `*@ regulate`: the steady state holds the period average of
/// `vector` at the value of parameter `target`, adjusting parameter `param`
/// within [min, max].
struct RegulationSpec {
  std::string param;  ///< the control parameter, lower-case (e.g. "d")
  double min = 0, max = 1;
  /// `default=open` makes a sweep without <simulation loop=...> run open loop
  /// (regulation on request only), for a template whose control cannot hold
  /// the set point in every mode it offers.
  bool regulated_by_default = true;
  std::string vector;  ///< the regulated vector, lower-case (e.g. "v(out)")
  std::string target;  ///< the parameter holding the set point, lower-case
  SourceLocation control_where, regulate_where;
  bool declared() const { return !param.empty(); }
};

/// True when the points run regulated: the template declares a control and
/// the sweep's <simulation> asks for the regulated loop, or asks for neither
/// and the control does not say `default=open`. The one place this
/// rule lives (the evaluator, the loop checks and the content hash ask it).
bool RunsRegulated(const RegulationSpec& regulation, const SimulationSettings& simulation);

/// One power port: P(t) = sign * v(t) * i(t), averaged over the period.
struct PowerProduct {
  double sign = 1;
  std::string voltage;  ///< a saved vector, e.g. "v(in)"
  std::string current;  ///< a saved vector, e.g. "i(vsupply)"
  bool declared() const { return !voltage.empty(); }
};

/// `*@ power input=... output=...`: the power into the converter and out of it.
struct PowerSpec {
  PowerProduct input, output;
  SourceLocation where;
  bool declared() const { return input.declared(); }
};

/// Parses `words` (the annotation split at blanks, words[0] its kind) of a
/// `control`, `regulate` or `power` annotation into `regulation` / `power`.
/// False with a file:line `error` when malformed or repeated.
bool ParseRegulationAnnotation(const std::vector<std::string>& words, const SourceLocation& where,
                               RegulationSpec* regulation, PowerSpec* power, Diagnostic* error);

/// True for the kinds ParseRegulationAnnotation reads.
bool IsRegulationAnnotation(const std::string& kind);

/// The vectors the annotations need saved (regulated vector, power ports).
std::vector<std::string> RegulationVectors(const RegulationSpec& regulation,
                                           const PowerSpec& power);

}  // namespace zvsmap
