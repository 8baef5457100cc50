// An independent computation of the high-side turn-on's dead-time window of a
// synchronous buck with linear, equal switch capacitances, for the envelope
// tests: the resonant arc of netlists/references.md sec. 2 (same analysis as
// Vorperian, "Quasi-square-wave converters", IEEE Trans. Power Electron.
// 3(2), 1988) with the ripple of sec. 1 (Erickson & Maksimovic 2001, ch. 2).
#pragma once

#include <cmath>
#include <vector>

#include "report_fixture.h"
#include "result/edge_metrics.h"

namespace zvsmap {
namespace testing_report {

/// The window [t_min, t_max] of the high-side turn-on: t_min the time the node
/// needs to reach the rail on the resonant arc v(t) = Vo·(1 - cos wt) +
/// I0·Z·sin wt, t_max = t_min + L·i_end/(Vin - Vo) (sec. 2). `possible` is
/// false when I0 < sqrt(Ceq·Vin·(Vin - 2·Vo)/L); `v_valley` is then the
/// lowest v_ds, Vin - (Vo + sqrt(Vo^2 + (I0·Z)^2)), at t_valley (the arc's peak).
struct ResonantWindow {
  bool possible = false;
  double t_min = NAN, t_max = NAN, t_valley = NAN, v_valley = NAN;
};

inline ResonantWindow BuckHighOnWindow(double vin, double vo, double l, double c_eq, double fs,
                                       double io) {
  double d = vo / vin;
  double ripple = (vin - vo) * d / (l * fs);  // sec. 1
  double i0 = ripple / 2 - io;                // -I_valley, into the node
  double z = std::sqrt(l / c_eq), w = 1 / std::sqrt(l * c_eq);
  ResonantWindow out;
  double need = c_eq * vin * (vin - 2 * vo) / l;  // sec. 2: ZVS iff I0^2 >= need
  if (i0 <= 0 || i0 * i0 < need) {
    double r = std::hypot(vo, i0 * z);
    out.v_valley = vin - (vo + r);
    out.t_valley = (M_PI / 2 - std::atan2(-vo, i0 * z)) / w;  // where the arc peaks
    return out;
  }
  // -Vo·cos x + I0·Z·sin x = R·sin(x + a), a = atan2(-Vo, I0·Z).
  double r = std::hypot(vo, i0 * z), a = std::atan2(-vo, i0 * z);
  out.possible = true;
  out.t_min = (std::asin((vin - vo) / r) - a) / w;
  double i_end = std::sqrt(i0 * i0 - need);  // energy balance over the arc
  out.t_max = out.t_min + l * i_end / (vin - vo);
  return out;
}

/// The probe's columns for such a window (probe_t_max_s is a ring-back, so
/// probe_max_at_bound is 0; impossible: t_min and t_max NaN, the valley given).
inline std::vector<Metric> ProbeMetrics(const ResonantWindow& w) {
  return {{"probe_t_min_s", w.t_min},
          {"probe_t_max_s", w.t_max},
          {"probe_bound_s", 1e-6},
          {"probe_max_at_bound", 0},
          {"probe_t_valley_s", w.possible ? w.t_min : w.t_valley},
          {"probe_v_valley_v", w.possible ? 0.0 : w.v_valley}};
}

/// The invented scenario of README "Dead time across the envelope": a buck to
/// 12 V at 500 kHz, L = 1 µH, 1 nF linear per switch (Ceq = 2 nF), over Vin
/// and Iout, each point's high_on window from BuckHighOnWindow.
inline Synthetic BuckEnvelope(const std::vector<double>& vin, const std::vector<double>& iout) {
  return MakeGrid(
      {{"Vin", vin}, {"Iout", iout}}, [](const auto&) { return 1.0; },
      [](const auto& v) { return ProbeMetrics(BuckHighOnWindow(v[0], 12, 1e-6, 2e-9, 5e5, v[1])); });
}

}  // namespace testing_report
}  // namespace zvsmap
