#include "analysis/edge_finder.h"

#include <algorithm>
#include <cmath>
#include <limits>

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

namespace {

// The two edges' command crossings in the data.
struct EdgeCommands {
  const char* name;
  bool incoming_high;
  std::vector<double> offs;           // outgoing command falls
  std::vector<double> ons;            // incoming command rises
  std::vector<double> incoming_offs;  // incoming command falls
};

std::vector<EdgeCommands> CommandsOf(const CellSpec& cell, const Waveforms& waves) {
  const auto& t = waves.time();
  const CellVectors vectors = CellVectorsFor(cell);
  const auto& high = waves.Get(vectors.high_cmd);
  const auto& low = waves.Get(vectors.low_cmd);
  std::vector<EdgeCommands> out;
  for (bool incoming_high : {true, false}) {
    const auto& outgoing = incoming_high ? low : high;
    const auto& incoming = incoming_high ? high : low;
    EdgeCommands c{incoming_high ? "high_on" : "low_on", incoming_high, {}, {}, {}};
    c.offs = Crossings(t, outgoing, kCommandThreshold, false, t.front(), t.back());
    c.ons = Crossings(t, incoming, kCommandThreshold, true, t.front(), t.back());
    c.incoming_offs = Crossings(t, incoming, kCommandThreshold, false, t.front(), t.back());
    out.push_back(std::move(c));
  }
  return out;
}

// The first crossing in `at` after `t`, or NaN.
double NextAfter(const std::vector<double>& at, double t) {
  auto it = std::upper_bound(at.begin(), at.end(), t);
  return it == at.end() ? std::numeric_limits<double>::quiet_NaN() : *it;
}

// The edge at turn-off `off`, if its turn-on lies `guard_s` inside the data.
// `period_s` > 0 lets the conduction come from the previous period.
bool EdgeAt(const EdgeCommands& c, double off, double t_last, double guard_s, double period_s,
            EdgeTiming* e) {
  const double on = NextAfter(c.ons, off);
  if (!(on <= t_last - guard_s)) return false;
  e->edge = c.name;
  e->incoming_high = c.incoming_high;
  e->t_off_s = off;
  e->t_on_s = on;
  const double next_off = NextAfter(c.incoming_offs, on);
  e->t_end_s = std::isnan(next_off) ? t_last : next_off;
  if (!std::isnan(next_off)) {
    e->conduction_s = next_off - on;
  } else if (period_s > 0) {
    const double before = NextAfter(c.incoming_offs, on - period_s);
    if (before <= t_last) e->conduction_s = before + period_s - on;
  }
  return true;
}

}  // namespace

std::vector<EdgeTiming> FindEdges(const CellSpec& cell, const Waveforms& waves, double guard_s) {
  std::vector<EdgeTiming> out;
  if (waves.time().size() < 2) return out;
  const double t_last = waves.time().back();
  for (const EdgeCommands& c : CommandsOf(cell, waves)) {
    // Latest turn-off whose following turn-on lies inside the data with a guard.
    for (auto it = c.offs.rbegin(); it != c.offs.rend(); ++it) {
      EdgeTiming e;
      if (!EdgeAt(c, *it, t_last, guard_s, 0, &e)) continue;
      out.push_back(e);
      break;
    }
  }
  return out;
}

std::vector<EdgeTiming> FindEdgesFrom(const CellSpec& cell, const Waveforms& waves,
                                      double period_s, double from_s) {
  std::vector<EdgeTiming> out;
  if (waves.time().size() < 2) return out;
  const double t_last = waves.time().back();
  for (const EdgeCommands& c : CommandsOf(cell, waves)) {
    for (auto it = std::lower_bound(c.offs.begin(), c.offs.end(), from_s); it != c.offs.end();
         ++it) {
      EdgeTiming e;
      if (!EdgeAt(c, *it, t_last, kEdgeGuardPeriods * period_s, period_s, &e)) continue;
      out.push_back(e);
      break;
    }
  }
  return out;
}

}  // namespace zvsmap
