#include "analysis/dead_time_window.h"

#include <algorithm>
#include <cmath>

#include "analysis/commutation.h"
#include "analysis/edge_finder.h"
#include "netlist/cell_vectors.h"

namespace zvsmap {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// Reverse conduction: v_ds below this (as t_reverse_s; common practice, no source).
constexpr double kReverseThresholdV = -0.1;

// The samples of (t, v) within [t0, t1] with interpolated end points.
void Window(const std::vector<double>& t, const std::vector<double>& v, double t0, double t1,
            std::vector<double>* wt, std::vector<double>* wv) {
  wt->clear();
  wv->clear();
  wt->push_back(t0);
  wv->push_back(Interpolate(t, v, t0));
  for (size_t i = 0; i < t.size(); ++i) {
    if (t[i] > t0 && t[i] < t1) {
      wt->push_back(t[i]);
      wv->push_back(v[i]);
    }
  }
  wt->push_back(t1);
  wv->push_back(Interpolate(t, v, t1));
}

// The first time within [t0, t1] with v <= level (t0 itself when it starts there).
double FirstAtOrBelow(const std::vector<double>& t, const std::vector<double>& v, double level,
                      double t0, double t1) {
  if (Interpolate(t, v, t0) <= level) return t0;
  std::vector<double> c = Crossings(t, v, level, false, t0, t1);
  return c.empty() ? kNaN : c.front();
}

// Integral of f over [t0, t1] (trapezoids on the window's samples).
double Integral(const std::vector<double>& t, const std::vector<double>& f, double t0,
                double t1) {
  if (!(t1 > t0)) return 0;
  std::vector<double> wt, wf;
  Window(t, f, t0, t1, &wt, &wf);
  double sum = 0;
  for (size_t i = 1; i < wt.size(); ++i) sum += 0.5 * (wf[i] + wf[i - 1]) * (wt[i] - wt[i - 1]);
  return sum;
}

// Time within [t0, t1] with v below `level` (linear between samples).
double TimeBelow(const std::vector<double>& t, const std::vector<double>& v, double level,
                 double t0, double t1) {
  if (!(t1 > t0)) return 0;
  std::vector<double> wt, wv;
  Window(t, v, t0, t1, &wt, &wv);
  double sum = 0;
  for (size_t i = 1; i < wt.size(); ++i) {
    double a = wv[i - 1] - level, b = wv[i] - level, dt = wt[i] - wt[i - 1];
    if (a < 0 && b < 0) {
      sum += dt;
    } else if (a < 0 || b < 0) {
      double frac = a / (a - b);
      sum += a < 0 ? frac * dt : (1 - frac) * dt;
    }
  }
  return sum;
}

// The capacitance C of Ecap(v) = C*v^2: the cell's Coss, else half the charge
// the helping current moved into the node from t_off to `t_to` over the swing.
double CapacitiveLossCoefficient(const std::vector<double>& t, const std::vector<double>& vds,
                                 const std::vector<double>& i_help, double coss_f, double t_off,
                                 double t_to) {
  if (std::isfinite(coss_f)) return coss_f;
  if (!(t_to > t_off)) return kNaN;
  double swing = Interpolate(t, vds, t_off) - Interpolate(t, vds, t_to);
  double charge = Integral(t, i_help, t_off, t_to);
  if (!(swing > 0) || !(charge > 0)) return kNaN;
  return 0.5 * charge / swing;
}

// The loss-optimal dead time over the window's samples (see the header block).
void LossOptimum(const std::vector<double>& t, const std::vector<double>& vds,
                 const std::vector<double>& i_cell, double c, double t_off, double t_end,
                 DeadTimeWindow* out) {
  if (!std::isfinite(c)) return;
  std::vector<double> wt, wv, wi;
  Window(t, vds, t_off, t_end, &wt, &wv);
  wi.reserve(wt.size());
  for (double tk : wt) wi.push_back(Interpolate(t, i_cell, tk));
  double diode = 0, best = kNaN;
  for (size_t k = 0; k < wt.size(); ++k) {
    if (k > 0) {
      double p0 = std::max(0.0, -wv[k - 1]) * std::fabs(wi[k - 1]);
      double p1 = std::max(0.0, -wv[k]) * std::fabs(wi[k]);
      diode += 0.5 * (p0 + p1) * (wt[k] - wt[k - 1]);
    }
    double v = std::max(0.0, wv[k]);
    double e = c * v * v + diode;
    if (!(e >= best)) {
      best = e;
      out->t_dead_optimal_s = wt[k] - t_off;
    }
  }
  out->e_dead_optimal_j = best;
}

void SetMetric(EdgeMeasurement* edge, const char* name, double value) {
  for (Metric& m : edge->metrics) {
    if (m.column == name) {
      m.value = value;
      return;
    }
  }
  edge->metrics.push_back({name, value});
}

}  // namespace

DeadTimeCurve CompactCurve(const std::vector<double>& t, const std::vector<double>& v,
                           const std::vector<double>& levels, size_t max_samples) {
  DeadTimeCurve curve;
  if (t.size() < 2 || t.size() != v.size() || max_samples < 2) return curve;
  // The data with each level crossing inserted as a sample of its own.
  std::vector<double> dt = {t.front()}, dv = {v.front()};
  for (size_t i = 1; i < t.size(); ++i) {
    std::vector<std::pair<double, double>> cuts;
    for (double level : levels) {
      double a = v[i - 1] - level, b = v[i] - level;
      if ((a < 0) != (b < 0) && a != b) {
        cuts.emplace_back(t[i - 1] + a / (a - b) * (t[i] - t[i - 1]), level);
      }
    }
    std::sort(cuts.begin(), cuts.end());
    for (const auto& c : cuts) {
      if (c.first > dt.back() && c.first < t[i]) {
        dt.push_back(c.first);
        dv.push_back(c.second);
      }
    }
    if (t[i] > dt.back()) {
      dt.push_back(t[i]);
      dv.push_back(v[i]);
    }
  }
  const size_t n = dt.size();
  std::vector<bool> keep(n, false);
  keep.front() = keep.back() = true;
  size_t kept = 2;
  // Level crossings first (the class changes there), as many as fit in half.
  for (size_t i = 1; i + 1 < n && kept < max_samples / 2; ++i) {
    if (std::find(levels.begin(), levels.end(), dv[i]) != levels.end()) {
      keep[i] = true;
      ++kept;
    }
  }
  // Then greedily the sample furthest from the interpolation of those kept.
  std::vector<size_t> next(n);
  while (kept < max_samples) {
    for (size_t i = n - 1, right = n - 1; i-- > 0;) {
      next[i] = right;
      if (keep[i]) right = i;
    }
    double worst = 0;
    size_t at = n;
    size_t left = 0;
    for (size_t i = 1; i < n; ++i) {
      if (keep[i]) {
        left = i;
        continue;
      }
      size_t right = next[i];
      double frac = (dt[i] - dt[left]) / (dt[right] - dt[left]);
      double err = std::fabs(dv[i] - (dv[left] + frac * (dv[right] - dv[left])));
      if (err > worst) {
        worst = err;
        at = i;
      }
    }
    if (at == n || worst <= 0) break;
    keep[at] = true;
    ++kept;
  }
  for (size_t i = 0; i < n; ++i) {
    if (!keep[i]) continue;
    curve.t_dead_s.push_back(dt[i]);
    curve.v_ds_v.push_back(dv[i]);
  }
  return curve;
}

bool AnalyseProbe(const CellSpec& cell, const Waveforms& waves, const ProbeInput& in,
                  DeadTimeWindow* out, std::string* why) {
  *out = DeadTimeWindow();
  const auto& t = waves.time();
  const bool up = in.incoming_high;
  if (t.size() < 2) {
    *why = "the probe run returned no data";
    return false;
  }
  // The outgoing turn-off command as this run has it.
  const std::string out_cmd = NodeVoltageVector(up ? cell.low_cmd : cell.high_cmd);
  double t_off = in.t_off_hint_s;
  if (!out_cmd.empty() && waves.Has(out_cmd)) {
    double tol = 0.25 * in.bound_s;
    double best = kNaN;
    for (double c : Crossings(t, waves.Get(out_cmd), 0.5, false, in.t_off_hint_s - tol,
                              in.t_off_hint_s + tol)) {
      if (!(std::fabs(c - in.t_off_hint_s) >= std::fabs(best - in.t_off_hint_s))) best = c;
    }
    if (std::isfinite(best)) t_off = best;
  }
  double t_end = std::min(t_off + in.bound_s, t.back());
  if (!(t_end > t_off)) {
    *why = "the probe run ends before the outgoing turn-off command";
    return false;
  }
  std::vector<double> vds = IncomingSwitchVoltage(cell, waves, up);
  const std::vector<double>& i_cell = waves.Get(SourceCurrentVector(cell.current));
  std::vector<double> i_help(i_cell.size()), p_diode(i_cell.size());
  for (size_t k = 0; k < i_cell.size(); ++k) {
    i_help[k] = up ? -i_cell[k] : i_cell[k];
    p_diode[k] = std::max(0.0, -vds[k]) * std::fabs(i_cell[k]);
  }
  auto rel = [&](double tc) { return std::isfinite(tc) ? tc - t_off : kNaN; };
  out->bound_s = t_end - t_off;

  double t_min = FirstAtOrBelow(t, vds, in.limit_v, t_off, t_end);
  double t_rail = FirstAtOrBelow(t, vds, 0.0, t_off, t_end);
  double t_max = kNaN;
  if (std::isfinite(t_min)) {
    std::vector<double> exits = Crossings(t, vds, in.limit_v, true, t_min, t_end);
    t_max = exits.empty() ? t_end : exits.front();
    out->max_at_bound = exits.empty() ? 1 : 0;
    if (std::isfinite(t_rail) && t_rail <= t_max) {
      out->t_diode_s = TimeBelow(t, vds, kReverseThresholdV, t_rail, t_max);
      out->e_diode_j = Integral(t, p_diode, t_rail, t_max);
    } else {
      out->t_diode_s = 0;
      out->e_diode_j = 0;
    }
  }
  out->t_min_s = rel(t_min);
  out->t_rail_s = rel(t_rail);
  out->t_max_s = rel(t_max);

  std::vector<double> wt, wv;
  Window(t, vds, t_off, t_end, &wt, &wv);
  for (size_t k = 0; k < wt.size(); ++k) {
    if (!(wv[k] >= out->v_valley_v)) {
      out->v_valley_v = wv[k];
      out->t_valley_s = wt[k] - t_off;
    }
  }
  double t_charge = std::isfinite(t_rail) ? t_rail : t_off + out->t_valley_s;
  double c = CapacitiveLossCoefficient(t, vds, i_help, in.coss_f, t_off, t_charge);
  LossOptimum(t, vds, i_cell, c, t_off, t_end, out);

  TimingMargins m = CriterionTiming(t, vds, in.limit_v, t_off, t_off + in.t_dead_s, t_end);
  out->margin_early_s = m.early;
  out->margin_late_s = m.late;
  if (std::isfinite(m.early) && std::isnan(m.late)) out->margin_late_s = t_end - t_off - in.t_dead_s;

  for (double& tk : wt) tk -= t_off;
  out->curve = CompactCurve(wt, wv, {in.limit_v, 0.5 * in.rail_v}, DeadTimeCurve::kMaxSamples);
  return true;
}

void ApplyDeadTimeWindow(const DeadTimeWindow& w, EdgeMeasurement* edge) {
  SetMetric(edge, "zvs_timing_margin_early_s", w.margin_early_s);
  SetMetric(edge, "zvs_timing_margin_late_s", w.margin_late_s);
  SetMetric(edge, "probe_t_min_s", w.t_min_s);
  SetMetric(edge, "probe_t_rail_s", w.t_rail_s);
  SetMetric(edge, "probe_t_max_s", w.t_max_s);
  SetMetric(edge, "probe_bound_s", w.bound_s);
  SetMetric(edge, "probe_max_at_bound", w.max_at_bound);
  SetMetric(edge, "probe_t_diode_s", w.t_diode_s);
  SetMetric(edge, "probe_e_diode_j", w.e_diode_j);
  SetMetric(edge, "probe_t_valley_s", w.t_valley_s);
  SetMetric(edge, "probe_v_valley_v", w.v_valley_v);
  SetMetric(edge, "t_dead_optimal_s", w.t_dead_optimal_s);
  SetMetric(edge, "e_dead_optimal_j", w.e_dead_optimal_j);
  edge->probe_curve = w.curve;
}

}  // namespace zvsmap
