// A switch model the sweep file brings (<device>): a generic library model or
// the user's own subcircuit from a .include/.lib file, with a pin map.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {

/// Where one subcircuit pin is tied. `pin` is the subcircuit's pin name
/// (lower-case) in the named form, "" in the positional form (then the entry's
/// position is the pin's). `to` is "d", "g" or "s" (the switch's drain, gate,
/// source as the template wires its instance), "@node" (a template node, e.g.
/// "@0") or a number (a fixed voltage to ground, e.g. "25" for a temperature
/// node); the sweep parser checks its form.
struct PinTie {
  std::string pin;
  std::string to;
};

/// One <device> element.
struct DeviceSpec {
  std::string name;      ///< the label used in <axis device=...> and the CSV
  bool generic = false;  ///< true: `subckt` is a model of netlists/switches.lib
  std::string file;      ///< model file resolved against the sweep file's folder ("" if generic)
  std::string file_as_written;
  std::string section;       ///< non-empty: `.lib FILE SECTION` instead of `.include FILE`
  std::string subckt;        ///< subcircuit name as written
  std::vector<PinTie> pins;  ///< empty for generic models (d g s)
  bool positional = false;   ///< pins given in subcircuit order without names
  std::string params;        ///< "name=value ..." added to the instance line
  SourceLocation where, file_where, subckt_where, pins_where;
};

}  // namespace zvsmap
