#include "analysis/commutation.h"

#include <cmath>
#include <limits>

namespace zvsmap {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// A node voltage vector, or zeros for ground.
std::vector<double> NodeVoltage(const Waveforms& waves, const std::string& node) {
  if (node.empty() || node == "0" || node == "gnd") {
    return std::vector<double>(waves.time().size(), 0.0);
  }
  return waves.Get("v(" + node + ")");
}

}  // namespace

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
                            const ZvsCriterion& criterion) {
  const auto& t = waves.time();
  std::vector<double> sw = NodeVoltage(waves, cell.node);
  std::vector<double> hi = NodeVoltage(waves, cell.rail_high);
  std::vector<double> lo = NodeVoltage(waves, cell.rail_low);

  double v_hi = Interpolate(t, hi, e.t_off_s);
  double v_lo = Interpolate(t, lo, e.t_off_s);
  double rail = v_hi - v_lo;
  double current = Interpolate(t, waves.Get("i(" + cell.current + ")"), e.t_off_s);
  std::vector<double> vds = IncomingSwitchVoltage(cell, waves, e.incoming_high);
  double v_on = Interpolate(t, vds, e.t_on_s);
  double limit = criterion.Limit(rail);

  // Transition 10 % -> 90 % toward the incoming switch's rail, as a fraction
  // of the swing (common practice for rise/fall times).
  double t_transition = kNaN;
  if (rail > 0) {
    std::vector<double> progress(sw.size());
    for (size_t i = 0; i < sw.size(); ++i) {
      double frac = (sw[i] - v_lo) / rail;
      progress[i] = e.incoming_high ? frac : 1.0 - frac;
    }
    auto c10 = Crossings(t, progress, 0.1, true, e.t_off_s, e.t_end_s);
    if (!c10.empty()) {
      auto c90 = Crossings(t, progress, 0.9, true, c10.front(), e.t_end_s);
      if (!c90.empty()) t_transition = c90.front() - c10.front();
    }
  }

  EdgeMeasurement m;
  m.cell = cell.name;
  m.edge = e.edge;
  if (!std::isfinite(v_on)) {
    m.zvs = ZvsClass::kUnknown;
  } else if (v_on <= limit) {
    m.zvs = ZvsClass::kFull;
  } else if (v_on < 0.5 * rail) {
    m.zvs = ZvsClass::kPartial;
  } else {
    m.zvs = ZvsClass::kHard;
  }
  m.metrics = {
      {"rail_v", rail},
      {"i_commutated_a", current},
      {"t_dead_s", e.t_on_s - e.t_off_s},
      {"v_turn_on_v", v_on},
      {"v_residual_limit_v", limit},
      {"t_transition_s", t_transition},
  };
  return m;
}

}  // namespace zvsmap
