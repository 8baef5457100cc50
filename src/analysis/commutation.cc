#include "analysis/commutation.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>

#include "netlist/cell_vectors.h"

namespace zvsmap {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// Reverse conduction: incoming v_ds below this (common practice, no source).
constexpr double kReverseThresholdV = -0.1;

// A node voltage vector, or zeros for ground.
std::vector<double> NodeVoltage(const Waveforms& waves, const std::string& node) {
  const std::string vector = NodeVoltageVector(node);
  if (vector.empty()) return std::vector<double>(waves.time().size(), 0.0);
  return waves.Get(vector);
}

double Lookup(const Variables& vars, const std::string& name) {
  if (name.empty()) return kNaN;
  auto it = vars.find(name);
  return it == vars.end() ? kNaN : it->second;
}

// Samples of (t, v) restricted to [t0, t1], with interpolated end points.
struct Segment {
  std::vector<double> t, v;
};
Segment Slice(const std::vector<double>& t, const std::vector<double>& v, double t0, double t1) {
  Segment s;
  if (!(t1 >= t0) || t.empty()) return s;
  s.t.push_back(t0);
  s.v.push_back(Interpolate(t, v, t0));
  for (size_t i = 0; i < t.size(); ++i) {
    if (t[i] > t0 && t[i] < t1) {
      s.t.push_back(t[i]);
      s.v.push_back(v[i]);
    }
  }
  s.t.push_back(t1);
  s.v.push_back(Interpolate(t, v, t1));
  return s;
}

double Trapezoid(const Segment& s) {
  double sum = 0;
  for (size_t i = 1; i < s.t.size(); ++i)
    sum += 0.5 * (s.v[i] + s.v[i - 1]) * (s.t[i] - s.t[i - 1]);
  return sum;
}

// Time within the segment with v below `level` (linear between samples).
double TimeBelow(const Segment& s, double level) {
  double sum = 0;
  for (size_t i = 1; i < s.t.size(); ++i) {
    double a = s.v[i - 1] - level, b = s.v[i] - level, dt = s.t[i] - s.t[i - 1];
    if (a < 0 && b < 0) {
      sum += dt;
    } else if (a < 0 || b < 0) {
      double frac = a / (a - b);  // where the line crosses the level
      sum += a < 0 ? frac * dt : (1 - frac) * dt;
    }
  }
  return sum;
}

double First(const std::vector<double>& v) { return v.empty() ? kNaN : v.front(); }

}  // namespace

TimingMargins CriterionTiming(const std::vector<double>& t, const std::vector<double>& vds,
                              double limit, double t_off, double t_on, double t_end) {
  TimingMargins out;
  if (!(t_end >= t_off) || t.empty()) return out;
  // Stretches [a, b] of the window with vds <= limit (entries are falling
  // crossings, exits rising ones); b NaN when still inside at t_end.
  std::vector<std::pair<double, bool>> events;  // (time, is an entry)
  for (double c : Crossings(t, vds, limit, false, t_off, t_end)) events.emplace_back(c, true);
  for (double c : Crossings(t, vds, limit, true, t_off, t_end)) events.emplace_back(c, false);
  std::sort(events.begin(), events.end());
  std::vector<std::pair<double, double>> inside;
  bool in = Interpolate(t, vds, t_off) <= limit;
  double a = in ? t_off : kNaN;
  for (const auto& [when, entry] : events) {
    if (entry && !in) {
      a = when;
      in = true;
    } else if (!entry && in) {
      inside.emplace_back(a, when);
      in = false;
    }
  }
  if (in) inside.emplace_back(a, kNaN);
  if (inside.empty()) return out;
  // The stretch holding t_on, else the last one that ends before it, else the first after it.
  const std::pair<double, double>* pick = nullptr;
  for (const auto& s : inside) {
    if (s.first <= t_on && (std::isnan(s.second) || s.second >= t_on)) pick = &s;
  }
  if (!pick) {
    for (const auto& s : inside)
      if (s.second < t_on) pick = &s;
  }
  if (!pick) pick = &inside.front();
  out.early = t_on - pick->first;
  out.late = pick->second - t_on;  // NaN when the stretch is open at the window's end
  return out;
}

EdgeParams EdgeParamsFor(const CellSpec& cell, const Variables& resolved) {
  EdgeParams p;
  p.high_vth_v = Lookup(resolved, cell.high_vth);
  p.low_vth_v = Lookup(resolved, cell.low_vth);
  p.inductance_h = Lookup(resolved, cell.inductance);
  p.coss_f = Lookup(resolved, cell.coss);
  return p;
}

std::vector<double> IncomingSwitchVoltage(const CellSpec& cell, const Waveforms& waves,
                                          bool incoming_high) {
  std::vector<double> sw = NodeVoltage(waves, cell.node);
  std::vector<double> rail = NodeVoltage(waves, incoming_high ? cell.rail_high : cell.rail_low);
  std::vector<double> vds(sw.size());
  for (size_t i = 0; i < sw.size(); ++i) {
    vds[i] = incoming_high ? rail[i] - sw[i] : sw[i] - rail[i];
  }
  return vds;
}

EdgeMeasurement MeasureEdge(const CellSpec& cell, const Waveforms& waves, const EdgeTiming& e,
                            const ZvsCriterion& criterion, const EdgeParams& params) {
  const auto& t = waves.time();
  std::vector<double> sw = NodeVoltage(waves, cell.node);
  std::vector<double> lo = NodeVoltage(waves, cell.rail_low);
  const bool up = e.incoming_high;

  double v_hi = Interpolate(t, NodeVoltage(waves, cell.rail_high), e.t_off_s);
  double v_lo = Interpolate(t, lo, e.t_off_s);
  double rail = v_hi - v_lo;
  double current = Interpolate(t, waves.Get(SourceCurrentVector(cell.current)), e.t_off_s);
  std::vector<double> vds_in = IncomingSwitchVoltage(cell, waves, up);
  std::vector<double> vds_out = IncomingSwitchVoltage(cell, waves, !up);
  double v_on = Interpolate(t, vds_in, e.t_on_s);
  double limit = criterion.Limit(rail);
  double band = std::max(0.01 * std::fabs(rail), 0.1);

  // The incoming channel's turn-on: gate threshold crossing, else the command.
  double vth = up ? params.high_vth_v : params.low_vth_v;
  const std::string& gate = up ? cell.high_gate : cell.low_gate;
  const std::string& source = up ? cell.high_source : cell.low_source;
  double t_vth = kNaN;
  const std::string gate_v = NodeVoltageVector(gate), source_v = NodeVoltageVector(source);
  if (std::isfinite(vth) && !gate_v.empty() && waves.Has(gate_v) &&
      (source_v.empty() || waves.Has(source_v))) {
    std::vector<double> g = NodeVoltage(waves, gate);
    std::vector<double> s = NodeVoltage(waves, source);
    for (size_t i = 0; i < g.size(); ++i) g[i] -= s[i];
    // Search from the start of the command edge: a drive may cross early.
    t_vth = First(Crossings(t, g, vth, true, e.t_off_s, e.t_end_s));
  }
  double t_ch = std::isfinite(t_vth) ? t_vth : e.t_on_s;
  double v_at_vth = std::isfinite(t_vth) ? Interpolate(t, vds_in, t_vth) : kNaN;

  // Transition 10 % -> 90 % toward the incoming switch's rail, as a fraction
  // of the swing (common practice for rise/fall times).
  double t_transition = kNaN;
  if (rail > 0) {
    std::vector<double> progress(sw.size());
    for (size_t i = 0; i < sw.size(); ++i) {
      double frac = (sw[i] - v_lo) / rail;
      progress[i] = up ? frac : 1.0 - frac;
    }
    auto c10 = Crossings(t, progress, 0.1, true, e.t_off_s, e.t_end_s);
    if (!c10.empty()) {
      auto c90 = Crossings(t, progress, 0.9, true, c10.front(), e.t_end_s);
      if (!c90.empty()) t_transition = c90.front() - c10.front();
    }
  }

  // Dead-time window [t_off, t_ch].
  double t_clamp = First(Crossings(t, vds_in, limit, false, e.t_off_s, t_ch));
  double t_zvs = First(Crossings(t, vds_in, 0.0, false, e.t_off_s, t_ch));
  Segment dead = Slice(t, vds_in, e.t_off_s, t_ch);
  double t_reverse = TimeBelow(dead, kReverseThresholdV);
  double v_min = kNaN, t_min = kNaN;
  for (size_t i = 0; i < dead.t.size(); ++i) {
    if (!(dead.v[i] >= v_min)) {
      v_min = dead.v[i];
      t_min = dead.t[i];
    }
  }

  // Ring-back.
  double ringback = 0, t_ringback = kNaN, v_ringback = kNaN;
  auto max_after = [&](double from) {
    double m = kNaN;
    for (size_t i = 0; i < dead.t.size(); ++i)
      if (dead.t[i] >= from && !(dead.v[i] <= m)) m = dead.v[i];
    return m;
  };
  if (std::isfinite(t_zvs)) {
    auto above = Crossings(t, vds_in, band, true, t_zvs, t_ch);
    if (!above.empty()) {
      // The reversal: the commutated current changes direction while the
      // node sits at the rail (it then leaves the clamp).
      const auto& i_cell = waves.Get(SourceCurrentVector(cell.current));
      auto reversals = Crossings(t, i_cell, 0.0, up, t_zvs, above.front());
      auto zeros = Crossings(t, vds_in, 0.0, true, t_zvs, above.front());
      t_ringback = !reversals.empty() ? reversals.front()
                   : zeros.empty()    ? above.front()
                                      : zeros.back();
      ringback = 1;
    }
  } else if (!dead.v.empty() && std::isfinite(v_min) && v_min < dead.v.front() - band &&
             max_after(t_min) > v_min + band) {
    t_ringback = t_min;
    ringback = 1;
  }
  if (ringback > 0) v_ringback = max_after(t_ringback);

  // Switching energies from the channel currents.
  double e_on = kNaN, e_off = kNaN;
  double t_on_done = e.t_end_s;
  if (!(v_on <= band)) {
    double c = First(Crossings(t, vds_in, band, false, e.t_on_s, e.t_end_s));
    if (std::isfinite(c)) t_on_done = c;
  } else {
    t_on_done = e.t_on_s;
  }
  const std::string& in_sw = up ? cell.high : cell.low;
  const std::string& out_sw = up ? cell.low : cell.high;
  const std::string in_ch = ChannelCurrentVector(in_sw);
  const std::string out_ch = ChannelCurrentVector(out_sw);
  const auto& cmd_in = waves.Get(NodeVoltageVector(up ? cell.high_cmd : cell.low_cmd));
  const auto& cmd_out = waves.Get(NodeVoltageVector(up ? cell.low_cmd : cell.high_cmd));
  if (!in_sw.empty() && waves.Has(in_ch)) {
    auto starts = Crossings(t, cmd_in, 0.05, true, e.t_off_s, e.t_on_s);
    double t0 = starts.empty() ? e.t_on_s : starts.back();
    std::vector<double> p(t.size());
    const auto& i_ch = waves.Get(in_ch);
    for (size_t i = 0; i < t.size(); ++i) p[i] = vds_in[i] * i_ch[i];
    e_on = Trapezoid(Slice(t, p, t0, std::max(t0, t_on_done)));
  }
  if (!out_sw.empty() && waves.Has(out_ch)) {
    auto starts = Crossings(t, cmd_out, 0.95, false, t.front(), e.t_off_s);
    double t0 = starts.empty() ? e.t_off_s : starts.back();
    std::vector<double> p(t.size());
    const auto& i_ch = waves.Get(out_ch);
    for (size_t i = 0; i < t.size(); ++i) p[i] = vds_out[i] * i_ch[i];
    e_off = Trapezoid(Slice(t, p, t0, e.t_on_s));
  }

  // Peak dv/dt from t_off to the end of the turn-on.
  double dvdt = kNaN;
  for (size_t i = 1; i < t.size(); ++i) {
    if (t[i] <= e.t_off_s || t[i - 1] >= t_on_done) continue;
    double dt = t[i] - t[i - 1];
    if (dt <= 0) continue;
    double s = std::fabs(sw[i] - sw[i - 1]) / dt;
    if (!(s <= dvdt)) dvdt = s;
  }

  // Energy view of ZVS (equal linear switches; netlists/references.md sec. 2 and 3).
  double e_cap = kNaN, e_avail = kNaN, e_need = kNaN, margin = kNaN;
  if (std::isfinite(params.coss_f)) e_cap = params.coss_f * std::pow(std::max(v_on, 0.0), 2);
  double i_help = up ? -current : current;
  if (std::isfinite(params.inductance_h)) {
    e_avail = 0.5 * params.inductance_h * i_help * std::fabs(i_help);
  }
  if (std::isfinite(params.coss_f) && t.size() > 1) {
    std::vector<double> rel(t.size());
    for (size_t i = 0; i < t.size(); ++i) rel[i] = sw[i] - lo[i];
    const double from = params.period_s > 0 && t.back() - params.period_s >= t.front()
                            ? t.back() - params.period_s
                            : t.front();
    double vo = Trapezoid(Slice(t, rel, from, t.back())) / (t.back() - from);
    double qoss = params.coss_f * rail;
    e_need = up ? qoss * (rail - 2 * vo) : qoss * (2 * vo - rail);
    if (std::isfinite(e_avail) && qoss * rail > 0) margin = (e_avail - e_need) / (qoss * rail);
  }

  TimingMargins timing =
      CriterionTiming(t, vds_in, limit, e.t_off_s, e.t_on_s, std::max(t_ch, e.t_on_s));

  EdgeMeasurement m;
  m.cell = cell.name;
  m.edge = e.edge;
  m.criterion = criterion.Describe();
  m.zvs = ClassifyTurnOn(v_on, limit, rail);
  auto rel = [&](double tc) { return std::isfinite(tc) ? tc - e.t_off_s : kNaN; };
  m.metrics = {
      {"rail_v", rail},
      {"i_commutated_a", current},
      {"t_dead_s", e.t_on_s - e.t_off_s},
      {"v_turn_on_v", v_on},
      {"v_at_vth_v", v_at_vth},
      {"v_residual_limit_v", limit},
      {"t_transition_s", t_transition},
      {"t_clamp_s", rel(t_clamp)},
      {"t_zvs_s", rel(t_zvs)},
      {"dvdt_peak_v_per_s", dvdt},
      {"t_reverse_s", t_reverse},
      {"v_ds_min_v", v_min},
      {"ringback", ringback},
      {"t_ringback_s", rel(t_ringback)},
      {"v_ringback_v", v_ringback},
      {"e_on_j", e_on},
      {"e_off_j", e_off},
      {"e_cap_est_j", e_cap},
      {"e_available_j", e_avail},
      {"e_needed_j", e_need},
      {"zvs_energy_margin", margin},
      {"zvs_timing_margin_early_s", timing.early},
      {"zvs_timing_margin_late_s", timing.late},
  };
  // The probe run's window (analysis/dead_time_window.h) fills these.
  for (const char* name : kProbeMetricNames) m.metrics.push_back({name, kNaN});
  return m;
}

}  // namespace zvsmap
