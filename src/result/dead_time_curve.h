// The incoming switch's v_ds against dead time, as a probe run sees it.
#pragma once

#include <cstddef>
#include <vector>

namespace zvsmap {

/// ZVS class of a turn-on, by the sweep's criterion (see README "ZVS class").
enum class ZvsClass { kFull, kPartial, kHard, kUnknown };

/// "full", "partial", "hard", "unknown".
const char* ZvsClassName(ZvsClass c);

/// The class of a turn-on against `v_ds_v` volts: full when v_ds <= `limit_v`,
/// partial when above the limit but below half of `rail_v`, hard otherwise,
/// unknown when v_ds is NaN (the one rule every class in zvsmap follows).
ZvsClass ClassifyTurnOn(double v_ds_v, double limit_v, double rail_v);

/// A compact v_ds(t_dead) curve of one edge: the incoming switch's
/// drain-source voltage in a run where its turn-on is withheld, against the
/// time since the outgoing switch's turn-off command (so each abscissa is a
/// dead time). Piecewise linear between the samples; at most kMaxSamples.
/// Empty when no probe ran.
struct DeadTimeCurve {
  static constexpr size_t kMaxSamples = 128;
  std::vector<double> t_dead_s;  ///< strictly increasing, from 0 to the probe's bound
  std::vector<double> v_ds_v;    ///< same length

  bool empty() const { return t_dead_s.empty(); }
  /// v_ds at dead time `t_dead_s` (linear between samples); NaN outside the
  /// curve or when it is empty.
  double At(double t_dead) const;
};

/// The class of a turn-on at dead time `t_dead_s` read off the curve:
/// ClassifyTurnOn(curve.At(t_dead_s), limit_v, rail_v). Unknown beyond the
/// curve's end (the probe did not see that far) or when it is empty.
ZvsClass ClassAtDeadTime(const DeadTimeCurve& curve, double t_dead_s, double limit_v,
                         double rail_v);

}  // namespace zvsmap
