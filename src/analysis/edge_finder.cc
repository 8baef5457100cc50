#include "analysis/edge_finder.h"

#include <algorithm>

#include "netlist/cell_vectors.h"

namespace zvsmap {

namespace {

// Logic commands switch at 0.5 V (0 V off, 1 V on; see README "Templates").
constexpr double kCommandThreshold = 0.5;

}  // namespace

std::vector<double> Crossings(const std::vector<double>& t, const std::vector<double>& v,
                              double level, bool rising, double t0, double t1) {
  std::vector<double> out;
  for (size_t i = 1; i < t.size() && i < v.size(); ++i) {
    if (t[i] < t0 || t[i - 1] > t1) continue;
    double a = v[i - 1] - level;
    double b = v[i] - level;
    bool crosses = rising ? (a < 0 && b >= 0) : (a > 0 && b <= 0);
    if (!crosses) continue;
    double frac = (b == a) ? 0.0 : a / (a - b);
    double tc = t[i - 1] + frac * (t[i] - t[i - 1]);
    if (tc >= t0 && tc <= t1) out.push_back(tc);
  }
  return out;
}

std::vector<EdgeTiming> FindEdges(const CellSpec& cell, const Waveforms& waves, double guard_s) {
  const auto& t = waves.time();
  std::vector<EdgeTiming> out;
  if (t.size() < 2) return out;
  double t_first = t.front();
  double t_last = t.back();
  const CellVectors vectors = CellVectorsFor(cell);
  const auto& high = waves.Get(vectors.high_cmd);
  const auto& low = waves.Get(vectors.low_cmd);

  struct Kind {
    const char* name;
    bool incoming_high;
  };
  for (Kind kind : {Kind{"high_on", true}, Kind{"low_on", false}}) {
    const auto& outgoing = kind.incoming_high ? low : high;
    const auto& incoming = kind.incoming_high ? high : low;
    std::vector<double> offs = Crossings(t, outgoing, kCommandThreshold, false, t_first, t_last);
    std::vector<double> ons = Crossings(t, incoming, kCommandThreshold, true, t_first, t_last);
    std::vector<double> incoming_offs =
        Crossings(t, incoming, kCommandThreshold, false, t_first, t_last);
    // Latest turn-off whose following turn-on lies inside the data with a guard.
    for (auto it = offs.rbegin(); it != offs.rend(); ++it) {
      auto on = std::upper_bound(ons.begin(), ons.end(), *it);
      if (on == ons.end() || *on > t_last - guard_s) continue;
      auto next_off = std::upper_bound(incoming_offs.begin(), incoming_offs.end(), *on);
      EdgeTiming e;
      e.edge = kind.name;
      e.incoming_high = kind.incoming_high;
      e.t_off_s = *it;
      e.t_on_s = *on;
      e.t_end_s = next_off == incoming_offs.end() ? t_last : *next_off;
      out.push_back(e);
      break;
    }
  }
  return out;
}

}  // namespace zvsmap
