#include "report/deadtime_chart.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <map>

#include "report/svg_canvas.h"
#include "report/units.h"
#include "report/zvs_boundary.h"

namespace zvsmap {

namespace {

// Okabe & Ito (2008) colours, one per series (netlists/references.md sec. 13).
const char* const kSeries[] = {"#0072B2", "#D55E00", "#009E73", "#CC79A7",
                               "#E69F00", "#56B4E9", "#F0E442", "#000000"};
constexpr const char* kRecommendedColumn = "t_dead_recommended_s";

std::string Safe(const std::string& s) {
  std::string out;
  for (char c : s) out += std::isalnum(static_cast<unsigned char>(c)) ? c : '_';
  return out;
}

// One point of a series: the window and the dead times at one x value.
struct WindowSample {
  double x = NAN, start = NAN, end = NAN, set = NAN, recommended = NAN;
};

// The window of `key` at the point at `coords`, read through the columns.
bool SampleAt(const ReportInput& input, const std::map<std::vector<int>, size_t>& index,
              const std::vector<int>& coords, const EdgeKey& key, const WindowColumns& w,
              WindowSample* out) {
  auto found = index.find(coords);
  if (found == index.end() || found->second >= input.results.size()) return false;
  const PointResult& r = input.results[found->second];
  const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
  if (!e) return false;
  out->start = e->Get(w.start);
  out->end = w.end.empty() ? NAN : e->Get(w.end);
  out->set = e->Get("t_dead_s");
  out->recommended = e->Get(kRecommendedColumn);
  return true;
}

}  // namespace

std::vector<Plot> DeadTimeCharts(const ReportBasis& input) {
  std::vector<Plot> plots;
  const WindowColumns& w = input.window;
  const Grid& grid = input.grid;
  std::vector<size_t> swept = grid.SweptDims();
  if (w.start.empty() || swept.empty()) return plots;
  std::map<std::vector<int>, size_t> index;
  for (size_t i = 0; i < grid.coords.size(); ++i) index.emplace(grid.coords[i], i);
  const GridDim& xd = grid.dims[swept[0]];
  size_t n_series = swept.size() > 1 ? grid.dims[swept[1]].values.size() : 1;
  n_series = std::min<size_t>(n_series, 8);

  for (const EdgeKey& key : input.edges) {
    std::vector<std::vector<WindowSample>> series(n_series);
    double y_lo = INFINITY, y_hi = -INFINITY;
    for (size_t k = 0; k < n_series; ++k) {
      for (size_t i = 0; i < xd.values.size(); ++i) {
        std::vector<int> c(grid.dims.size(), 0);
        c[swept[0]] = static_cast<int>(i);
        if (swept.size() > 1) c[swept[1]] = static_cast<int>(k);
        WindowSample s;
        if (!SampleAt(input, index, c, key, w, &s)) continue;
        s.x = xd.values[i];
        for (double v : {s.start, s.end, s.set, s.recommended}) {
          if (std::isfinite(v)) y_lo = std::min(y_lo, v), y_hi = std::max(y_hi, v);
        }
        series[k].push_back(s);
      }
    }
    y_lo = std::min(y_lo, 0.0);
    PadAxisRange(&y_lo, &y_hi);
    y_lo = std::max(y_lo, 0.0);

    const double kWidth = 780, kHeight = 460, kLeft = 90, kRight = 230, kTop = 50, kBottom = 60;
    double plot_w = kWidth - kLeft - kRight, plot_h = kHeight - kTop - kBottom;
    double x_lo = *std::min_element(xd.values.begin(), xd.values.end());
    double x_hi = *std::max_element(xd.values.begin(), xd.values.end());
    if (x_hi == x_lo) x_hi = x_lo + 1;
    auto px = [&](double v) { return kLeft + (v - x_lo) / (x_hi - x_lo) * plot_w; };
    auto py = [&](double v) { return kTop + (y_hi - v) / (y_hi - y_lo) * plot_h; };
    std::string title = key.Label() + ": dead-time window over " + xd.param;
    SvgCanvas svg(kWidth, kHeight, title);
    svg.Text(kLeft + plot_w / 2, 24, title, "middle", 15);
    svg.Line(kLeft, kTop + plot_h, kLeft + plot_w, kTop + plot_h, "#000000", 1);
    svg.Line(kLeft, kTop, kLeft, kTop + plot_h, "#000000", 1);
    for (double v : NiceTicks(y_lo, y_hi, 7)) {
      if (v < y_lo || v > y_hi) continue;
      svg.Line(kLeft, py(v), kLeft + plot_w, py(v), "#e0e0e0", 1);
      svg.Text(kLeft - 6, py(v) + 4, FormatQuantity(v, "s"), "end", 11);
    }
    std::string x_unit = ParamUnit(xd.param);
    for (double v : NiceTicks(x_lo, x_hi, 7)) {
      if (v < x_lo || v > x_hi) continue;
      svg.Line(px(v), kTop + plot_h, px(v), kTop + plot_h + 5, "#000000", 1);
      svg.Text(px(v), kTop + plot_h + 18, FormatQuantity(v, x_unit), "middle", 11);
    }
    svg.Text(kLeft + plot_w / 2, kHeight - 16, AxisLabel(xd.param, x_unit), "middle", 13);
    svg.Text(24, kTop + plot_h / 2, "dead time [s]", "middle", 13, -90);

    bool open_end = false, any_recommended = false;
    double lx = kLeft + plot_w + 20, ly = kTop + 14;
    for (size_t k = 0; k < n_series; ++k) {
      const char* colour = kSeries[k];
      std::vector<std::pair<double, double>> lower, upper, set_line, rec_line;
      for (const WindowSample& s : series[k]) {
        if (!std::isfinite(s.start)) continue;
        // An end not reached within the dead time: open band up to the set dead time.
        double top = std::isfinite(s.end) ? s.end : s.set;
        open_end = open_end || !std::isfinite(s.end);
        lower.emplace_back(px(s.x), py(s.start));
        upper.emplace_back(px(s.x), py(std::isfinite(top) ? top : s.start));
        if (std::isfinite(s.set)) set_line.emplace_back(px(s.x), py(s.set));
        if (std::isfinite(s.recommended)) rec_line.emplace_back(px(s.x), py(s.recommended));
      }
      std::vector<std::pair<double, double>> band = lower;
      band.insert(band.end(), upper.rbegin(), upper.rend());
      svg.Polygon(band, colour, 0.18);
      svg.Polyline(lower, colour, 2);
      svg.Polyline(upper, colour, 1);
      for (const auto& [x, y] : lower) svg.Circle(x, y, 3.5, colour);
      svg.Polyline(set_line, "#000000", 1.5, true);
      svg.Polyline(rec_line, "#000000", 2.5);
      any_recommended = any_recommended || rec_line.size() >= 2;
      std::string label = swept.size() > 1
                              ? grid.dims[swept[1]].param + " = " +
                                    FormatQuantity(grid.dims[swept[1]].values[k],
                                                   ParamUnit(grid.dims[swept[1]].param))
                              : "window";
      svg.Rect(lx, ly - 11, 14, 14, colour);
      svg.Text(lx + 20, ly, label, "start", 12);
      ly += 20;
    }
    ly += 8;
    svg.Line(lx, ly - 4, lx + 18, ly - 4, "#000000", 2);
    svg.Text(lx + 24, ly, "window start (" + w.start + ")", "start", 11);
    ly += 18;
    svg.Text(lx + 24, ly, open_end ? "band top: window end, or the" : "band top: window end",
             "start", 11);
    if (open_end) svg.Text(lx + 24, ly += 14, "dead time set where no ring-back", "start", 11);
    ly += 20;
    svg.Line(lx, ly - 4, lx + 18, ly - 4, "#000000", 1.5, true);
    svg.Text(lx + 24, ly, "dead time set (t_dead_s)", "start", 11);
    ly += 20;
    svg.Text(lx, ly, any_recommended ? "solid black: recommended" : "recommended: not computed",
             "start", 11);

    Plot plot;
    plot.file = "deadtime_" + Safe(key.cell) + "_" + Safe(key.edge) + ".svg";
    plot.caption = title;
    plot.svg = svg.ToString();
    plots.push_back(std::move(plot));
  }
  return plots;
}

}  // namespace zvsmap
