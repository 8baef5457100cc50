#include "report/waveform_plot.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>
#include <vector>

#include "core/spice_number.h"
#include "netlist/cell_vectors.h"
#include "report/svg_canvas.h"

namespace zvsmap {

namespace {

constexpr double kWidth = 820, kLeft = 90, kRight = 170, kTop = 50, kPanel = 170, kGap = 34,
                 kBottom = 56;

struct Trace {
  std::string label;
  std::string colour;
  std::vector<double> y;  // on the window's time samples
  bool dashed = false;
};

// A node voltage on the window's samples, from its vector (see CellVectors:
// "" is ground, which reads 0 V); false when the data lack it.
bool NodeVoltage(const Waveforms& w, const std::string& vector, std::vector<double>* out) {
  if (vector.empty()) {
    out->assign(w.time().size(), 0.0);
    return true;
  }
  if (!w.Has(vector)) return false;
  *out = w.Get(vector);
  return true;
}

// plus - minus; false when `plus` is not named or missing, `minus` missing reads 0 V.
bool Difference(const Waveforms& w, const std::string& plus, const std::string& minus,
                std::vector<double>* out) {
  std::vector<double> a, b;
  if (plus.empty() || !NodeVoltage(w, plus, &a)) return false;
  if (!NodeVoltage(w, minus, &b)) b.assign(a.size(), 0.0);
  out->resize(a.size());
  for (size_t i = 0; i < a.size(); ++i) (*out)[i] = a[i] - b[i];
  return true;
}

std::string Eng(double v) { return FormatEngineering(v, 3); }

// Round tick values (1, 2 or 5 times a power of ten apart) inside [lo, hi],
// about `count` of them.
std::vector<double> Ticks(double lo, double hi, int count) {
  std::vector<double> out;
  double raw = (hi - lo) / std::max(1, count - 1);
  if (!(raw > 0) || !std::isfinite(raw)) return out;
  double base = std::pow(10, std::floor(std::log10(raw)));
  double step = base;
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    step = m * base;
    if (step >= raw) break;
  }
  for (double v = std::ceil(lo / step) * step; v <= hi + step * 1e-9; v += step) {
    out.push_back(std::fabs(v) < step * 1e-9 ? 0.0 : v);
  }
  return out;
}

void DrawPanel(SvgCanvas& svg, double top, const std::vector<double>& t_ns, double x_lo,
               double x_hi, const std::vector<Trace>& traces, const std::string& y_label,
               const std::vector<std::pair<double, std::string>>& markers_ns) {
  double plot_w = kWidth - kLeft - kRight;
  double y_lo = std::numeric_limits<double>::infinity(), y_hi = -y_lo;
  for (const Trace& tr : traces) {
    for (double v : tr.y) {
      if (!std::isfinite(v)) continue;
      y_lo = std::min(y_lo, v);
      y_hi = std::max(y_hi, v);
    }
  }
  PadAxisRange(&y_lo, &y_hi);
  auto px = [&](double x) { return kLeft + (x - x_lo) / (x_hi - x_lo) * plot_w; };
  auto py = [&](double v) { return top + (y_hi - v) / (y_hi - y_lo) * kPanel; };

  svg.Line(kLeft, top + kPanel, kLeft + plot_w, top + kPanel, "#000000", 1);
  svg.Line(kLeft, top, kLeft, top + kPanel, "#000000", 1);
  for (double v : Ticks(y_lo, y_hi, 6)) {
    svg.Line(kLeft, py(v), kLeft + plot_w, py(v), "#e6e6e6", 1);
    svg.Text(kLeft - 6, py(v) + 4, Eng(v), "end", 11);
  }
  for (double x : Ticks(x_lo, x_hi, 7)) {
    svg.Line(px(x), top + kPanel, px(x), top + kPanel + 4, "#000000", 1);
    svg.Text(px(x), top + kPanel + 16, Eng(x), "middle", 10);
  }
  if (y_lo < 0 && y_hi > 0) svg.Line(kLeft, py(0), kLeft + plot_w, py(0), "#999999", 1, true);
  for (const auto& [x, label] : markers_ns) {
    svg.Line(px(x), top, px(x), top + kPanel, "#D55E00", 1, true);
    svg.Text(px(x) + 3, top + 11, label, "start", 10);
  }
  svg.Text(28, top + kPanel / 2, y_label, "middle", 12, -90);

  double ly = top + 14;
  for (const Trace& tr : traces) {
    std::vector<std::pair<double, double>> pts;
    // Window() keeps one sample either side: draw to the frame's edge only.
    size_t n = std::min(t_ns.size(), tr.y.size());
    for (size_t i = 0; i < n; ++i) {
      double x = t_ns[i], y = tr.y[i];
      if (x < x_lo || x > x_hi) {
        size_t j = x < x_lo ? i + 1 : i - 1;  // the neighbour inside
        if (j >= n || t_ns[j] == x) continue;
        double edge = x < x_lo ? x_lo : x_hi;
        y += (tr.y[j] - y) * (edge - x) / (t_ns[j] - x);
        x = edge;
      }
      if (std::isfinite(y)) pts.emplace_back(px(x), py(y));
    }
    svg.Polyline(pts, tr.colour, tr.dashed ? 1 : 2, tr.dashed);
    double lx = kWidth - kRight + 14;
    svg.Line(lx, ly - 4, lx + 18, ly - 4, tr.colour, 2, tr.dashed);
    svg.Text(lx + 24, ly, tr.label, "start", 11);
    ly += 18;
  }
}

}  // namespace

void EdgePlotWindow(const Waveforms& waves, const EdgeTiming& timing, double* t0_s, double* t1_s) {
  const std::vector<double>& t = waves.time();
  double span = t.empty() ? 0 : t.back() - t.front();
  double dead = std::max(timing.t_on_s - timing.t_off_s, 0.0);
  double before = std::max(dead, 0.002 * span);
  double after = std::max(2 * dead, 0.004 * span);
  *t0_s = timing.t_off_s - before;
  *t1_s = timing.t_on_s + after;
  if (timing.t_end_s > timing.t_on_s) *t1_s = std::min(*t1_s, timing.t_end_s);
  if (!t.empty()) {
    *t0_s = std::max(*t0_s, t.front());
    *t1_s = std::min(*t1_s, t.back());
  }
  if (*t1_s < *t0_s) *t1_s = *t0_s;
}

Plot EdgeWaveformPlot(const Waveforms& waves, const CellSpec& cell, const EdgeTiming& timing,
                      const std::string& title, const std::string& file) {
  double t0 = 0, t1 = 0;
  EdgePlotWindow(waves, timing, &t0, &t1);
  Waveforms w = waves.Window(t0, t1);
  std::vector<double> t_ns;
  for (double t : w.time()) t_ns.push_back((t - timing.t_off_s) * 1e9);
  double x_lo = (t0 - timing.t_off_s) * 1e9, x_hi = (t1 - timing.t_off_s) * 1e9;
  if (x_hi <= x_lo) x_hi = x_lo + 1;

  std::vector<Trace> node, gates, current;
  const CellVectors v = CellVectorsFor(cell);
  std::vector<double> y;
  if (!v.node.empty() && NodeVoltage(w, v.node, &y)) node.push_back({v.node, "#0072B2", y});
  for (const std::string* rail : {&v.rail_high, &v.rail_low}) {
    if (!rail->empty() && NodeVoltage(w, *rail, &y)) node.push_back({*rail, "#777777", y, true});
  }
  std::string gate_label = "gate-source (V)";
  if (Difference(w, v.high_gate, v.high_source, &y)) {
    gates.push_back({"v_gs " + cell.high, "#009E73", y});
  }
  if (Difference(w, v.low_gate, v.low_source, &y)) {
    gates.push_back({"v_gs " + cell.low, "#CC79A7", y});
  }
  if (gates.empty()) {
    gate_label = "command (V)";
    if (Difference(w, v.high_cmd, "", &y)) gates.push_back({"cmd " + cell.high, "#009E73", y});
    if (Difference(w, v.low_cmd, "", &y)) gates.push_back({"cmd " + cell.low, "#CC79A7", y});
  }
  if (w.Has(v.current)) current.push_back({v.current, "#E69F00", w.Get(v.current)});

  std::vector<std::pair<double, std::string>> markers = {
      {0.0, "off"}, {(timing.t_on_s - timing.t_off_s) * 1e9, "on"}};
  double height = kTop + 3 * kPanel + 2 * kGap + kBottom;
  SvgCanvas svg(kWidth, height, title);
  svg.Text(kWidth / 2, 26, title, "middle", 14);
  double top = kTop;
  DrawPanel(svg, top, t_ns, x_lo, x_hi, node, "switch node (V)", markers);
  top += kPanel + kGap;
  DrawPanel(svg, top, t_ns, x_lo, x_hi, gates, gate_label, markers);
  top += kPanel + kGap;
  DrawPanel(svg, top, t_ns, x_lo, x_hi, current, "commutated current (A)", markers);
  svg.Text(kLeft + (kWidth - kLeft - kRight) / 2, height - 14,
           "time from the turn-off command (ns)", "middle", 12);

  Plot plot;
  plot.file = file;
  plot.caption = title;
  plot.svg = svg.ToString();
  return plot;
}

}  // namespace zvsmap
