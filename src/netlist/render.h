// Rendering a template for one operating point: parameter values resolved to
// numbers, analysis and solver settings added, ready for the simulator.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "core/expression.h"
#include "netlist/deck.h"
#include "netlist/template.h"
#include "sweep/point.h"

namespace zvsmap {

/// Every template parameter resolved to a number for one point: the point's
/// values replace the defaults, then each declaration is evaluated in file
/// order (so `D={Vout/Vin}` follows a swept Vout). Keys are lower-case.
/// Fails (with file:line) when a value cannot be evaluated or the point sets a
/// parameter the template does not declare.
bool ResolveParams(const Template& tmpl, const std::vector<ParamValue>& values,
                   Variables* resolved, Diagnostic* error);

/// The switching period of a resolved point (the `*@ period` expression).
bool ResolvePeriod(const Template& tmpl, const Variables& resolved, double* period_s,
                   Diagnostic* error);

/// Transient settings added to the rendered netlist.
struct TranSettings {
  double tstop_s = 0;
  double tstart_s = 0;  ///< data before this is not stored
  double max_step_s = 0;
  double reltol = 1e-4;
};

/// The assembled deck of a point: a title of zvsmap's own, the template's
/// cards with every include inlined (Template::body; analysis and output
/// cards are left out there), the template's .param values replaced by the
/// resolved numbers, followed by zvsmap's `.options` (gear), `.save` of
/// `vectors`, `.tran ... uic` and `.end`. Names no file and runs in plain
/// ngspice; each line carries the file:line it came from.
Deck RenderDeck(const Template& tmpl, const Variables& resolved, const TranSettings& tran,
                const std::vector<std::string>& vectors);

/// RenderDeck(...).Text().
std::string RenderNetlist(const Template& tmpl, const Variables& resolved, const TranSettings& tran,
                          const std::vector<std::string>& vectors);

/// The vectors the analysis needs for every cell and state of the template.
std::vector<std::string> VectorsToSave(const Template& tmpl);

}  // namespace zvsmap
