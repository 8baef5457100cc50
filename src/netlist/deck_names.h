// The names an assembled template defines (nodes and element instances at
// its top level), and the check that every name zvsmap's annotations and pin
// maps use exists there, before anything runs.
#pragma once

#include <set>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "netlist/deck.h"
#include "netlist/device_models.h"
#include "netlist/template.h"

namespace zvsmap {

/// Lower-case names defined outside any .subckt. `nodes` over-approximates
/// where an element's node count depends on its form (so an existing node
/// is never missed); "0" and "gnd" are always there.
struct DeckNames {
  std::set<std::string> nodes;
  std::set<std::string> elements;
};

/// The names of `cards` (e.g. Template::body).
DeckNames CollectDeckNames(const std::vector<DeckLine>& cards);

/// Every node, switch instance, sense source and state vector the template's
/// `*@ cell` and `*@ state` annotations name, checked against the template's
/// assembled deck: one Diagnostic per missing name, at the annotation's
/// file:line with a caret and a did-you-mean where a name is close.
std::vector<Diagnostic> CheckAnnotationNames(const Template& tmpl);

/// Every `@node` pin tie of `devices` names a node of the template's deck.
std::vector<Diagnostic> CheckDeviceNodes(const Template& tmpl,
                                         const std::vector<ResolvedDevice>& devices);

/// Both checks above; appends every problem to `errors`, true when none.
bool CheckDeckNames(const Template& tmpl, const std::vector<ResolvedDevice>& devices,
                    std::vector<Diagnostic>* errors);

}  // namespace zvsmap
