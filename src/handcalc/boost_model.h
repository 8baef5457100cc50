// The synchronous boost's hand calculation (netlists/references.md sections 2 and 5).
#pragma once

#include "handcalc/topology_model.h"

namespace zvsmap {

/// The built-in model "boost": a synchronous boost (inductor from the input to
/// the switch node, low switch the main switch) in continuous conduction with
/// ideal switches, linear Coss and a resonant low-side transition, at a fixed
/// frequency or in triangular current mode. Inputs (template parameters of
/// the same name unless bound): vin, vout, iout, l, coss, fsw (the switching
/// frequency used), optional tcm (1: triangular current mode) and ir (its
/// reverse current), optional td_high and td_low (default: the cell's
/// high_dead/low_dead).
const TopologyModel& BoostModel();

}  // namespace zvsmap
