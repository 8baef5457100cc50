// A SPICE netlist template: its .param defaults and zvsmap's annotations
// (switching period, commutation cells, slow states). See README "Templates".
#pragma once

#include <limits>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "netlist/deck.h"
#include "netlist/regulation_annotations.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// One `.param name = value` declaration, in file order.
struct ParamDecl {
  std::string name;        ///< lower-case (SPICE names are case-insensitive)
  std::string expression;  ///< without braces/quotes; a number or an expression
  SourceLocation where;
};

/// A half-bridge commutation cell declared by `*@ cell NAME key=value ...`.
/// Node names are lower-case; "0" is ground.
struct CellSpec {
  std::string name;
  std::string node;                    ///< switch node
  std::string rail_high;               ///< rail the node reaches when the high switch conducts
  std::string rail_low;                ///< rail the node reaches when the low switch conducts
  std::string current;                 ///< zero-volt source; i(current) > 0 flows OUT of the node
  std::string high, low;               ///< switch instance names (subcircuits)
  std::string high_cmd, low_cmd;       ///< logic command nodes, 0 V off / 1 V on
  std::string high_gate, high_source;  ///< optional: gate and source nodes
  std::string low_gate, low_source;
  std::string high_dead, low_dead;  ///< optional: params of the dead time before each turn-on
  std::string high_vth, low_vth;    ///< optional: params of each switch's gate threshold
  std::string inductance;           ///< optional: param of the commutating inductance
  std::string coss;                 ///< optional: param of a linear Coss per switch
  SourceLocation where;
};

/// A slow state for settling: the vector read at the end of a period and the
/// .param that sets its initial condition (`*@ state i(l1) init=il0`).
struct StateSpec {
  std::string vector;      ///< lower-case, e.g. "i(l1)", "v(out)"
  std::string init_param;  ///< lower-case
  SourceLocation where;
};

/// A parsed template. `lines` are the logical lines (continuations joined),
/// each with the physical line it started on.
struct Template {
  std::string path;
  std::vector<std::pair<int, std::string>> lines;
  /// The template's cards with every included file inlined and checked
  /// against the deck rules (netlist/include_closure.h), each tagged with its
  /// file:line; without the title, blank lines and analysis/output cards.
  std::vector<DeckLine> body;
  std::vector<ParamDecl> params;
  std::string period_expression;
  SourceLocation period_where;
  std::vector<CellSpec> cells;
  std::vector<StateSpec> states;
  /// The hand-calculation model chosen by `*@ model NAME [input=param ...]`
  /// (lower-case; "" = none) and its input bindings, in annotation order.
  std::string model;
  std::vector<std::pair<std::string, std::string>> model_bindings;
  SourceLocation model_where;
  /// `*@ control` + `*@ regulate` (netlist/regulation_annotations.h); not
  /// declared = the template can only run open loop.
  RegulationSpec regulation;
  /// `*@ power`: the ports of the operating-point record (optional).
  PowerSpec power;
  /// `*@ measure lead=P`: the lead (in periods) a measured run may take
  /// before its measured period, because the template sets every state at
  /// t = 0 that settling does not (switch capacitances, gate drives); NaN
  /// when not declared.
  double measure_lead = std::numeric_limits<double>::quiet_NaN();
  SourceLocation measure_where;

  /// The names of all declared parameters, in file order.
  std::vector<std::string> ParamNames() const;
  /// The declaration of `name` (case-insensitive), or nullptr.
  const ParamDecl* FindParam(const std::string& name) const;
};

/// The lead of the sweep's measured runs: its `measure-lead` when set, else
/// the template's `*@ measure lead=` unless the sweep brings its own switch
/// models (<device>: the template's promise covers its own switches only),
/// else kDefaultMeasureLead.
double MeasureLead(const SweepSpec& spec, const Template& tmpl);

/// Parses template text; `path` names it in messages and anchors its relative
/// includes, which are read, checked and inlined into `body`. Fails on a
/// refused card anywhere in the include closure, an unreadable include, a malformed
/// annotation (unknown key, missing required key, unknown cell reference to an
/// undeclared parameter) or a missing `*@ period` / `*@ cell`.
bool ParseTemplateText(const std::string& text, const std::string& path, Template* out,
                       Diagnostic* error);

/// Reads and parses a template file.
bool LoadTemplate(const std::string& path, Template* out, Diagnostic* error);

}  // namespace zvsmap
