// The synchronous buck's hand calculation (netlists/references.md sections 1-3).
#pragma once

#include "handcalc/topology_model.h"

namespace zvsmap {

/// The built-in model "buck": a synchronous buck in continuous conduction with
/// ideal switches, a large output capacitor (Vo constant over a period) and a
/// resonant dead-time transition of the switch node. Inputs (template
/// parameters of the same name unless the `*@ model` annotation binds others):
/// vin, vout, fsw, l, iout, coss (linear), optional cext (extra node
/// capacitance, default 0), vf (body-diode drop, for the diode loss), td_high
/// and td_low (dead times; default: the cell's high_dead/low_dead), and c0,
/// vj, mj (junction-type Coss, used instead of coss when c0 is bound).
const TopologyModel& BuckModel();

}  // namespace zvsmap
