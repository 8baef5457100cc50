// The phase-shift-modulated full bridge's hand calculation (netlists/references.md
// section 4).
#pragma once

#include "handcalc/topology_model.h"

namespace zvsmap {

/// The built-in model "fullbridge_psm": a phase-shift-modulated full bridge
/// (ideal transformer n = Np/Ns, series inductance Lr, magnetising inductance
/// Lm, transformer capacitance C_TR across the bridge output, full-wave
/// rectifier, output inductor Lo) in continuous conduction, linear Coss, equal
/// switches. It describes one leg per cell: a cell whose name contains "lag"
/// is the lagging leg (ends the freewheeling interval, driven by Lr alone),
/// any other cell the leading leg (ends the power interval, driven by the
/// reflected load current). Inputs (template parameters of the same name
/// unless bound): vin, vout, iout, fsw, n, lr, lm, lo, coss, optional ctr
/// (default 0), optional d (commanded effective duty; default n*vout/vin plus
/// the duty-cycle loss) and td (the leg's dead time; default the cell's
/// high_dead).
const TopologyModel& FullBridgePsmModel();

}  // namespace zvsmap
