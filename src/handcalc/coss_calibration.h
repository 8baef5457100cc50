// Calibrating a generic output-capacitance form from datasheet-style numbers:
// the charge- and energy-equivalent capacitances at one voltage (or Qoss and
// Eoss there), optionally a small-signal capacitance at some voltage.
// Analytic (no simulation), so it lives beside the hand calculation's Coss forms.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "handcalc/output_capacitance.h"

namespace zvsmap {

/// C(V) = k * V^-g (V > 0): Q = k V^(1-g)/(1-g), E = k V^(2-g)/(2-g). g < 1.
std::unique_ptr<OutputCapacitance> MakePowerLawCapacitance(double k, double g);

/// What a datasheet gives. Co(tr) and Co(er) at `v_rated_v` are required
/// (fill them from Qoss and Eoss with FromCharges); `c_at_v_f` at `c_v_v`
/// is optional (0 = not given).
struct CossDatasheet {
  double v_rated_v = 0;  ///< the voltage of Co(tr) and Co(er), > 0
  double co_tr_f = 0;    ///< charge-equivalent capacitance Q(V)/V
  double co_er_f = 0;    ///< energy-equivalent capacitance 2 E(V)/V^2
  double c_at_v_f = 0;   ///< small-signal C at c_v_v (0: not given)
  double c_v_v = 0;

  /// Co(tr) = Qoss/V, Co(er) = 2 Eoss/V^2 (netlists/references.md section 6 conventions).
  static CossDatasheet FromCharges(double v_v, double qoss_c, double eoss_j);
};

/// One datasheet number against what the calibrated form gives.
struct Reproduction {
  std::string what;  ///< "Co(tr)(48 V)", ...
  double given = 0;
  double model = 0;
  /// (model - given) / given.
  double RelativeError() const { return (model - given) / given; }
};

/// Power law calibrated from r = Co(tr)/Co(er): g = (2r - 2)/(2r - 1),
/// k = Co(tr) (1 - g) V^g (netlists/references.md section 6). Both numbers are met
/// exactly; the small-signal C, when given, is only reported.
struct PowerLawFit {
  double k = 0;  ///< F * V^g
  double g = 0;
  double ratio = 0;  ///< r = Co(tr)/Co(er)
  std::vector<Reproduction> reproduced;
};

/// Junction form C0/(1 + V/Vj)^m. Without a small-signal C, m is held at the
/// given value and Vj, C0 meet Co(tr) and Co(er); with one, m is solved too
/// (0 < m < 1) so all three are met where the form can reach them.
struct JunctionFit {
  double c0_f = 0;
  double vj_v = 0;
  double m = 0;
  std::vector<Reproduction> reproduced;
};

/// Fits the power law. Fails (message in `error`) when the numbers are not
/// positive or r <= 1/2 (no power law has that ratio).
bool FitPowerLaw(const CossDatasheet& data, PowerLawFit* fit, std::string* error);

/// Fits the junction form; `m_fixed` is used when no small-signal C is given.
/// Fails when r lies outside what the form can reach (1 < r < (2-m)/(2(1-m))).
bool FitJunction(const CossDatasheet& data, double m_fixed, JunctionFit* fit, std::string* error);

}  // namespace zvsmap
