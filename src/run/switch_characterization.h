// Characterising one switch model in ngspice: output capacitance, charge and
// energy against the drain-source voltage, and the reverse-conduction curve
// with the gate held off. A designer checks a model with it before trusting a
// ZVS map built on it.
#pragma once

#include <string>
#include <vector>

#include "netlist/device_models.h"
#include "sim/simulator.h"

namespace zvsmap {

/// How the model is driven.
struct CharacterizeOptions {
  double v_max_v = 48;           ///< highest drain-source voltage of the table
  int table_rows = 24;           ///< rows at v_max * k / rows, k = 1..rows
  double ramp_s = 10e-6;         ///< duration of the voltage ramp up (and of the ramp down)
  double v_gate_off_v = 0;       ///< gate-source voltage that holds the switch off
  double i_reverse_max_a = 10;   ///< highest reverse current of the diode curve
  int reverse_rows = 20;         ///< rows at i_max * k / rows
  double reverse_ramp_s = 1e-3;  ///< duration of the (slow) reverse-current ramp
  double reltol = 1e-5;
};

/// One row of the output-capacitance table.
struct CossRow {
  double v_v = 0;      ///< drain-source voltage
  double c_f = 0;      ///< small-signal Coss(V) = dQ/dV
  double q_c = 0;      ///< Qoss(V) = integral_0^V C du
  double e_j = 0;      ///< Eoss(V) = integral_0^V u C du
  double co_tr_f = 0;  ///< Q/V
  double co_er_f = 0;  ///< 2E/V^2
};

/// One row of the reverse-conduction curve (gate off): current from source to
/// drain and the source-drain voltage it takes.
struct ReverseRow {
  double i_a = 0;
  double v_v = 0;
};

struct Characterization {
  std::vector<CossRow> coss;
  std::vector<ReverseRow> reverse;
  std::string netlist_coss, netlist_reverse;  ///< what was simulated
};

/// The output-capacitance measurement: the drain is driven by a voltage ramp
/// 0 -> v_max -> 0 (source grounded, gate held off). At each voltage the
/// current on the way up is C dV/dt + I_leak and on the way down -C dV/dt +
/// I_leak, so half their difference is the capacitance current with the
/// off-state leakage cancelled. Q and E integrate it over the up-ramp's own
/// time samples (dQ = i dt, dE = v i dt); C = i / (dV/dt).
std::string CossNetlist(const ResolvedDevice& device, const CharacterizeOptions& options);
/// The reverse curve: a slow current ramp pulled out of the drain (source
/// grounded, gate held off); the table reads -v(d) at each current.
std::string ReverseNetlist(const ResolvedDevice& device, const CharacterizeOptions& options);

/// Runs both measurements. False with `error` when ngspice fails.
bool CharacterizeSwitch(Simulator& simulator, const ResolvedDevice& device,
                        const CharacterizeOptions& options, Characterization* out,
                        std::string* error);

}  // namespace zvsmap
