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

std::string Safe(const std::string& s) {
  std::string out;
  for (char c : s) out += std::isalnum(static_cast<unsigned char>(c)) ? c : '_';
  return out;
}

// What a grid position of a series shows.
enum class SampleState { kWindow, kNoWindow, kFailed };

// One point of a series: the window and the dead times at one x value.
struct WindowSample {
  SampleState state = SampleState::kFailed;
  size_t position = 0;  // along the x axis
  double x = NAN, start = NAN, end = NAN, set = NAN, recommended = NAN;
  bool end_at_bound = false;  // the end is only where the probe stopped
};

// The window of `key` at the point at `coords`, read through the columns;
// the recommended dead time is that of the envelope's bin holding the point.
WindowSample SampleAt(const ReportBasis& input, const std::map<std::vector<int>, size_t>& index,
                      const std::vector<int>& coords, const EdgeKey& key) {
  WindowSample out;
  auto found = index.find(coords);
  if (found == index.end() || found->second >= input.results.size()) return out;
  const PointResult& r = input.results[found->second];
  const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
  if (!e) return out;
  const WindowColumns& w = input.window;
  out.start = e->Get(w.start);
  out.end = w.end.empty() ? NAN : e->Get(w.end);
  out.set = e->Get("t_dead_s");
  out.end_at_bound = e->Get(kProbeMaxAtBoundColumn) > 0.5;
  out.state = std::isfinite(out.start) ? SampleState::kWindow : SampleState::kNoWindow;
  const EdgeEnvelope* env = input.envelope.Find(key);
  const ScheduleBin* bin = env ? env->BinAt(coords) : nullptr;
  if (bin) out.recommended = bin->window.recommended;
  return out;
}

// Runs of neighbouring grid positions that have a window: a band is drawn
// per run, never across a position without one.
std::vector<std::vector<const WindowSample*>> WindowRuns(const std::vector<WindowSample>& series) {
  std::vector<std::vector<const WindowSample*>> runs;
  for (const WindowSample& s : series) {
    if (s.state != SampleState::kWindow) continue;
    if (runs.empty() || runs.back().back()->position + 1 != s.position) runs.emplace_back();
    runs.back().push_back(&s);
  }
  return runs;
}

// The chart's frame: plot area and scales.
struct Frame {
  double left = 90, top = 50, width = 460, height = 350;
  double x_lo = 0, x_hi = 1, y_lo = 0, y_hi = 1;
  double X(double v) const { return left + (v - x_lo) / (x_hi - x_lo) * width; }
  double Y(double v) const { return top + (y_hi - v) / (y_hi - y_lo) * height; }
  double Bottom() const { return top + height; }
};

void DrawAxes(SvgCanvas* svg, const Frame& f, const GridDim& xd) {
  svg->Line(f.left, f.Bottom(), f.left + f.width, f.Bottom(), "#000000", 1);
  svg->Line(f.left, f.top, f.left, f.Bottom(), "#000000", 1);
  for (double v : NiceTicks(f.y_lo, f.y_hi, 7)) {
    if (v < f.y_lo || v > f.y_hi) continue;
    svg->Line(f.left, f.Y(v), f.left + f.width, f.Y(v), "#e0e0e0", 1);
    svg->Text(f.left - 6, f.Y(v) + 4, FormatQuantity(v, "s"), "end", 11);
  }
  std::string x_unit = ParamUnit(xd.param);
  for (double v : NiceTicks(f.x_lo, f.x_hi, 7)) {
    if (v < f.x_lo || v > f.x_hi) continue;
    svg->Line(f.X(v), f.Bottom(), f.X(v), f.Bottom() + 5, "#000000", 1);
    svg->Text(f.X(v), f.Bottom() + 18, FormatQuantity(v, x_unit), "middle", 11);
  }
  svg->Text(f.left + f.width / 2, f.Bottom() + 44, AxisLabel(xd.param, x_unit), "middle", 13);
  svg->Text(24, f.top + f.height / 2, "dead time [s]", "middle", 13, -90);
}

// What one series drew, for the legend.
struct Drawn {
  bool open_end = false, recommended = false, failed = false, no_window = false;
};

// One series: a band per run of windows (a lone window is a bar, not a bare
// dot), the set dead time dashed, the recommended one solid; a cross on the
// x axis where the point failed or did not measure the edge, a triangle where
// it has no window (ZVS impossible, or not reached).
void DrawSeries(SvgCanvas* svg, const Frame& f, const std::vector<WindowSample>& series,
                const char* colour, Drawn* drawn) {
  for (const auto& run : WindowRuns(series)) {
    std::vector<std::pair<double, double>> lower, upper;
    for (const WindowSample* s : run) {
      // An end not reached within the dead time: open band up to the set dead time.
      double top = std::isfinite(s->end) ? s->end : s->set;
      drawn->open_end = drawn->open_end || !std::isfinite(s->end) || s->end_at_bound;
      lower.emplace_back(f.X(s->x), f.Y(s->start));
      upper.emplace_back(f.X(s->x), f.Y(std::isfinite(top) ? top : s->start));
    }
    if (run.size() == 1) {
      svg->Line(lower[0].first, lower[0].second, upper[0].first, upper[0].second, colour, 6);
    } else {
      std::vector<std::pair<double, double>> band = lower;
      band.insert(band.end(), upper.rbegin(), upper.rend());
      svg->Polygon(band, colour, 0.18);
      svg->Polyline(lower, colour, 2);
      svg->Polyline(upper, colour, 1);
    }
    for (const auto& [x, y] : lower) svg->Circle(x, y, 3.5, colour);
  }
  std::vector<std::pair<double, double>> set_line, rec_line;
  for (const WindowSample& s : series) {
    double x = f.X(s.x), y = f.Bottom();
    if (s.state == SampleState::kFailed) {
      svg->Line(x - 5, y - 5, x + 5, y + 5, colour, 2);
      svg->Line(x - 5, y + 5, x + 5, y - 5, colour, 2);
      drawn->failed = true;
      continue;
    }
    if (s.state == SampleState::kNoWindow) {
      svg->Polygon({{x - 5, y}, {x + 5, y}, {x, y - 9}}, colour, 1);
      drawn->no_window = true;
    }
    if (std::isfinite(s.set)) set_line.emplace_back(x, f.Y(s.set));
    if (std::isfinite(s.recommended)) rec_line.emplace_back(x, f.Y(s.recommended));
  }
  svg->Polyline(set_line, "#000000", 1.5, true);
  svg->Polyline(rec_line, "#000000", 2.5);
  for (const auto& [x, y] : rec_line) svg->Rect(x - 3, y - 3, 6, 6, "#000000");
  drawn->recommended = drawn->recommended || !rec_line.empty();
}

void DrawLegend(SvgCanvas* svg, double lx, double ly, const Drawn& drawn,
                const WindowColumns& w) {
  svg->Line(lx, ly - 4, lx + 18, ly - 4, "#000000", 2);
  svg->Text(lx + 24, ly, "window start (" + w.start + ")", "start", 11);
  ly += 18;
  svg->Text(lx + 24, ly, drawn.open_end ? "band top: window end, or the" : "band top: window end",
            "start", 11);
  if (drawn.open_end) {
    svg->Text(lx + 24, ly += 14, "dead time set / probe bound", "start", 11);
    svg->Text(lx + 24, ly += 14, "where no ring-back was seen", "start", 11);
  }
  ly += 20;
  svg->Line(lx, ly - 4, lx + 18, ly - 4, "#000000", 1.5, true);
  svg->Text(lx + 24, ly, "dead time set (t_dead_s)", "start", 11);
  ly += 20;
  if (drawn.recommended) {
    svg->Line(lx, ly - 4, lx + 18, ly - 4, "#000000", 2.5);
    svg->Text(lx + 24, ly, "recommended (envelope)", "start", 11);
  } else {
    svg->Text(lx, ly, "recommended: none here", "start", 11);
  }
  if (drawn.failed) {
    ly += 20;
    svg->Text(lx + 9, ly, "\u00d7", "middle", 14);
    svg->Text(lx + 24, ly, "point failed / edge not measured", "start", 11);
  }
  if (drawn.no_window) {
    ly += 20;
    svg->Text(lx + 9, ly, "\u25b2", "middle", 12);
    svg->Text(lx + 24, ly, "no window (ZVS not reached)", "start", 11);
  }
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
        WindowSample s = SampleAt(input, index, c, key);
        s.x = xd.values[i];
        s.position = i;
        for (double v : {s.start, s.end, s.set, s.recommended}) {
          if (std::isfinite(v)) y_lo = std::min(y_lo, v), y_hi = std::max(y_hi, v);
        }
        series[k].push_back(s);
      }
    }
    if (!std::isfinite(y_lo)) y_lo = 0, y_hi = 1e-9;
    y_lo = std::min(y_lo, 0.0);
    PadAxisRange(&y_lo, &y_hi);
    y_lo = std::max(y_lo, 0.0);

    const double kWidth = 780, kHeight = 460;
    Frame f;
    f.y_lo = y_lo;
    f.y_hi = y_hi;
    f.x_lo = *std::min_element(xd.values.begin(), xd.values.end());
    f.x_hi = *std::max_element(xd.values.begin(), xd.values.end());
    if (f.x_hi == f.x_lo) f.x_hi = f.x_lo + 1;
    std::string title = key.Label() + ": dead-time window over " + xd.param;
    SvgCanvas svg(kWidth, kHeight, title);
    svg.Text(f.left + f.width / 2, 24, title, "middle", 15);
    DrawAxes(&svg, f, xd);

    Drawn drawn;
    double lx = f.left + f.width + 20, ly = f.top + 14;
    for (size_t k = 0; k < n_series; ++k) {
      const char* colour = kSeries[k];
      DrawSeries(&svg, f, series[k], colour, &drawn);
      std::string label = swept.size() > 1
                              ? grid.dims[swept[1]].param + " = " +
                                    FormatQuantity(grid.dims[swept[1]].values[k],
                                                   ParamUnit(grid.dims[swept[1]].param))
                              : "window";
      bool any = std::any_of(series[k].begin(), series[k].end(),
                             [](const WindowSample& s) { return s.state != SampleState::kFailed; });
      svg.Rect(lx, ly - 11, 14, 14, colour);
      svg.Text(lx + 20, ly, any ? label : label + " (no point ran)", "start", 12);
      ly += 20;
    }
    DrawLegend(&svg, lx, ly + 8, drawn, w);

    Plot plot;
    plot.file = "deadtime_" + Safe(key.cell) + "_" + Safe(key.edge) + ".svg";
    plot.caption = title;
    plot.svg = svg.ToString();
    plots.push_back(std::move(plot));
  }
  return plots;
}

}  // namespace zvsmap
