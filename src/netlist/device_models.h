// Switch models in rendered netlists: the generic library (netlists/switches.lib)
// and the user's own subcircuits from .include/.lib files, tied in by a pin map.
// See README "Switch models".
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "core/diagnostic.h"
#include "netlist/deck.h"
#include "netlist/template.h"
#include "sweep/device_spec.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// A `.subckt` found in a model file.
struct SubcktInfo {
  std::string name;                 ///< as written
  std::vector<std::string> pins;    ///< lower-case, in order
  std::vector<std::string> params;  ///< lower-case names declared after `params:`
  /// The default of each of `params`, as written after its '=' (same order).
  std::vector<std::string> param_defaults;
  bool has_vch = false;  ///< has an element named vch (zvsmap's channel-current probe)
  SourceLocation where;  ///< the .subckt line
  std::string text;      ///< the block from .subckt to .ends, physical lines
};

/// The generic switch library shipped in netlists/: DataFile("netlists/switches.lib")
/// (installed copy, $ZVSMAP_DATA_DIR or the source tree; see core/data_dir.h).
std::string GenericLibraryPath();

/// Every subcircuit defined in `path` (nested .include files are not followed).
/// False with `error` when the file cannot be read.
bool ScanSubckts(const std::string& path, std::vector<SubcktInfo>* out, std::string* error);

/// A device checked against its model file: the subcircuit it names and, for
/// each of its pins in order, where that pin is tied ("d", "g", "s", "@node"
/// or a number).
struct ResolvedDevice {
  DeviceSpec spec;
  SubcktInfo subckt;
  std::vector<std::string> targets;
  /// The user's model file (or its `section`) with its includes inlined and
  /// every card checked, tagged with file:line (empty for generic models).
  std::vector<DeckLine> model_cards;
};

/// Checks one device before anything runs: its sweep-file values are tokens
/// that stay on their card (no line breaks or control characters; `params`
/// a list of name=value whose names the subcircuit declares), the model file
/// exists, is text and passes the deck rules with everything it includes, the
/// subcircuit is in it (case-insensitive), the pin map matches its pins by
/// count or names, every pin is tied and drain, gate and source are each used.
/// Errors point at the sweep file's attribute and name the model file:line.
bool ResolveDevice(const DeviceSpec& spec, ResolvedDevice* out, Diagnostic* error);

/// Resolves every device of the sweep and checks each device axis's roles
/// against the template's cells (the cell exists and names that switch's
/// instance). Returns all problems.
bool ResolveSweepDevices(const SweepSpec& spec, const Template& tmpl,
                         std::vector<ResolvedDevice>* out, std::vector<Diagnostic>* errors);

/// The lines that put `device` in a netlist as the three-terminal switch
/// `instance` between `drain`, `gate`, `source`: `definitions` (the generic
/// subcircuit's text unless `defined_subckts` already has it; a user model's
/// cards are `model_cards`, which ApplyDevicesToDeck adds and any other caller
/// must put before the definitions; sources for fixed-voltage pins; a wrapper when
/// the subcircuit has no `vch`) and the `instance` line. `inherited` are name=value parameters of
/// the template's instance: only `vds0_v` (the initial drain-source voltage, a property of the
/// circuit) is kept, and only when the subcircuit declares it; then the device's own params are
/// added. Without `vch` inside the user's subcircuit, a wrapper adds one in series with the drain,
/// so i(v.<instance>.vch) is then the drain terminal current (channel plus output capacitance plus
/// reverse conduction).
struct DeviceLines {
  std::vector<std::string> definitions;
  std::string instance;
};
DeviceLines InstantiateDevice(const ResolvedDevice& device, const std::string& instance,
                              const std::string& drain, const std::string& gate,
                              const std::string& source, const std::vector<std::string>& inherited,
                              const std::vector<std::string>& defined_subckts);

/// Rewrites an assembled deck for a point's device choice ((role, device
/// name) pairs, roles "cell.high"/"cell.low"): each role's switch instance
/// (outside any .subckt) is replaced and the definitions (each used model
/// file's cards once, then zvsmap's wrappers and tie sources, tagged with the
/// sweep file's <device>) are inserted after the title. False with `error`
/// for an unknown role or device (a bug once ResolveSweepDevices passed).
bool ApplyDevicesToDeck(const Template& tmpl, const std::vector<ResolvedDevice>& devices,
                        const std::vector<std::pair<std::string, std::string>>& choice, Deck* deck,
                        std::string* error);

/// The nominal value of parameter `param` (lower-case) of `device`'s
/// subcircuit, for a tolerance on it (<vary device=...>): the device's own
/// `params` setting, else the subcircuit's default. False with `why` when the
/// subcircuit declares no such parameter, for vds0_v (the circuit's initial
/// drain voltage, not a model parameter), or when the value is not a plain
/// finite number (an expression: then set a number in <device params>).
bool DeviceParamNominal(const ResolvedDevice& device, const std::string& param, double* value,
                        std::string* why);

/// Copies of `devices` with `values` set in their params, each rendered as
/// name=FormatNumber(value) in place of the device's own setting of it (or
/// appended). Names and numbers only: no text from the sweep file is pasted.
std::vector<ResolvedDevice> WithDeviceParams(const std::vector<ResolvedDevice>& devices,
                                             const std::vector<DeviceParamValue>& values);

/// ApplyDevicesToDeck on netlist text (lines without origins).
bool ApplyDevices(const Template& tmpl, const std::vector<ResolvedDevice>& devices,
                  const std::vector<std::pair<std::string, std::string>>& choice,
                  std::string* netlist, std::string* error);

}  // namespace zvsmap
