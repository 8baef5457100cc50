#include "report/plots.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>
#include <map>

#include "core/spice_number.h"
#include "report/svg_canvas.h"
#include "report/units.h"

namespace zvsmap {

namespace {

// Colours chosen to stay apart for the common forms of colour blindness
// (Okabe & Ito palette, 2008).
const char* kFull = "#009E73";
const char* kPartial = "#E69F00";
const char* kHard = "#D55E00";
const char* kUnknown = "#bbbbbb";
const char* kNotRun = "#666666";
const char* kBoundary = "#000000";
const char* kHandBoundary = "#CC79A7";

const char* ClassColour(ZvsClass c) {
  switch (c) {
    case ZvsClass::kFull:
      return kFull;
    case ZvsClass::kPartial:
      return kPartial;
    case ZvsClass::kHard:
      return kHard;
    case ZvsClass::kUnknown:
      return kUnknown;
  }
  return kUnknown;
}

std::string Eng(double v) { return std::isnan(v) ? "n/a" : FormatEngineering(v, 3); }

std::string Safe(const std::string& s) {
  std::string out;
  for (char c : s) out += std::isalnum(static_cast<unsigned char>(c)) ? c : '_';
  return out;
}

std::string DimLabel(const GridDim& dim) {
  std::string label = AxisLabel(dim.param, ParamUnit(dim.param));
  for (const std::string& a : dim.also) label += " (with " + a + ")";
  return label;
}

// A swept value as people read it: "680 nH", "2 A".
std::string DimValue(const GridDim& dim, double v) {
  return FormatQuantity(v, ParamUnit(dim.param));
}

// "L=1u, Vin=48" for the held dimensions.
std::string SliceText(const Grid& grid, const std::vector<int>& fixed,
                      const std::vector<size_t>& free_dims) {
  std::string out;
  for (size_t d = 0; d < grid.dims.size(); ++d) {
    if (std::find(free_dims.begin(), free_dims.end(), d) != free_dims.end()) continue;
    if (grid.dims[d].values.size() < 2 || fixed[d] < 0) continue;
    out +=
        (out.empty() ? "" : ", ") + grid.dims[d].param + "=" + Eng(grid.dims[d].values[fixed[d]]);
  }
  return out;
}

// "L = 1 µH, Vin = 48 V" for the held dimensions (titles; SliceText names files).
std::string SliceTitle(const Grid& grid, const std::vector<int>& fixed,
                       const std::vector<size_t>& free_dims) {
  std::string out;
  for (size_t d = 0; d < grid.dims.size(); ++d) {
    if (std::find(free_dims.begin(), free_dims.end(), d) != free_dims.end()) continue;
    if (grid.dims[d].values.size() < 2 || fixed[d] < 0) continue;
    out += (out.empty() ? "" : ", ") + grid.dims[d].param + " = " +
           DimValue(grid.dims[d], grid.dims[d].values[fixed[d]]);
  }
  return out;
}

// The result index at `coords`, or -1.
std::map<std::vector<int>, size_t> IndexByCoords(const Grid& grid) {
  std::map<std::vector<int>, size_t> out;
  for (size_t i = 0; i < grid.coords.size(); ++i) out.emplace(grid.coords[i], i);
  return out;
}

// The hand calculation's ZVS verdict for a measured edge: 1 full, 0 not,
// NaN when the results carry none (the built-in model's charge-based
// verdict paired with the simulated class).
double PredictedFull(const EdgeMeasurement& e) { return e.Get("zvs_full__pred"); }

// What one map cell shows.
struct MapCell {
  bool measured = false;
  bool ran = false;  // the point ran (status ok)
  ZvsClass zvs = ZvsClass::kUnknown;
  double margin = NAN;
  double predicted_full = NAN;
  std::string tip;
  bool inferred = false;  // no point here (refinement skipped it): the nearest point's class
};

// A refined (sparse) sweep leaves cells without a point: each takes the class
// of the nearest measured cell of the map (index units; the first found on a
// tie), drawn paler and without a margin. Refinement sampled every cell whose
// corners disagree, so an unsampled cell lies where its neighbours agree.
void FillFromNearest(size_t nx, size_t ny, std::vector<MapCell>* cells) {
  std::vector<size_t> measured;
  for (size_t k = 0; k < cells->size(); ++k) {
    if ((*cells)[k].measured) measured.push_back(k);
  }
  if (measured.empty()) return;
  for (size_t k = 0; k < cells->size(); ++k) {
    MapCell& c = (*cells)[k];
    if (!c.tip.empty()) continue;
    long i = static_cast<long>(k / ny), j = static_cast<long>(k % ny);
    size_t best = measured.front();
    long best_d = -1;
    for (size_t m : measured) {
      long di = static_cast<long>(m / ny) - i, dj = static_cast<long>(m % ny) - j;
      long d = di * di + dj * dj;
      if (best_d < 0 || d < best_d) {
        best_d = d;
        best = m;
      }
    }
    c.inferred = true;
    c.zvs = (*cells)[best].zvs;
    c.tip = std::string("no point (not sampled by the refinement): ") + ZvsClassName(c.zvs) +
            " as the nearest point";
  }
  (void)nx;
}

// The legend: only the classes present, then the boundary lines drawn.
void MapLegend(SvgCanvas* svg, double x, double y, const std::vector<MapCell>& cells,
               bool hand_boundary) {
  bool present[5] = {false, false, false, false, false};
  for (const MapCell& c : cells) {
    if (c.inferred) continue;
    if (!c.measured) {
      present[4] = present[4] || !c.tip.empty();
    } else {
      present[static_cast<int>(c.zvs)] = true;
    }
  }
  const std::pair<const char*, const char*> items[] = {{kFull, "full ZVS"},
                                                       {kPartial, "partial"},
                                                       {kHard, "hard"},
                                                       {kUnknown, "unknown"},
                                                       {kNotRun, "did not run"}};
  for (int k = 0; k < 5; ++k) {
    if (!present[k]) continue;
    svg->Rect(x, y - 11, 14, 14, items[k].first);
    svg->Text(x + 20, y, items[k].second, "start", 12);
    y += 20;
  }
  y += 6;
  svg->Line(x, y - 4, x + 14, y - 4, kBoundary, 3);
  svg->Text(x + 20, y, "ZVS boundary:", "start", 12);
  svg->Text(x + 20, y + 15, "cell edges where", "start", 11);
  svg->Text(x + 20, y + 29, "full ZVS begins", "start", 11);
  if (hand_boundary) {
    y += 50;
    svg->Line(x, y - 4, x + 14, y - 4, kHandBoundary, 2.5, true);
    svg->Text(x + 20, y, "hand calculation", "start", 12);
    svg->Text(x + 20, y + 15, "(predicted boundary)", "start", 11);
  }
}

// Tick every k-th label so at most ~10 show.
size_t TickStride(size_t n) { return n <= 10 ? 1 : (n + 9) / 10; }

}  // namespace

Plot ZvsMapPlot(const ReportBasis& input, const EdgeKey& key, size_t x_dim, size_t y_dim,
                const std::vector<int>& fixed) {
  const Grid& grid = input.grid;
  const GridDim& xd = grid.dims[x_dim];
  const GridDim& yd = grid.dims[y_dim];
  size_t nx = xd.values.size(), ny = yd.values.size();
  // The canvas grows with the grid so text keeps its size: cells at least
  // 64 x 26 px (a margin and a tick label fit), at most 110 x 60.
  const double cw = std::max(64.0, std::min(110.0, 620.0 / nx));
  const double ch = std::max(26.0, std::min(60.0, 420.0 / ny));
  const double kLeft = 110, kRight = 190, kTop = 50, kBottom = 80;
  const double plot_w = cw * nx, plot_h = ch * ny;
  const double kWidth = kLeft + plot_w + kRight, kHeight = std::max(kTop + plot_h + kBottom, 320.0);
  std::string slice = SliceText(grid, fixed, {x_dim, y_dim});
  std::string slice_title = SliceTitle(grid, fixed, {x_dim, y_dim});
  std::string title = key.Label() + ": ZVS class over " + xd.param + " and " + yd.param +
                      (slice_title.empty() ? "" : " (" + slice_title + ")");
  SvgCanvas svg(kWidth, kHeight, title);
  svg.Text(kLeft + plot_w / 2, 24, title, "middle", 15);

  const MarginSource& margin = input.margin;
  std::string margin_unit = margin.column.empty() ? margin.unit : MetricUnit(margin.column);
  auto index = IndexByCoords(grid);
  std::vector<MapCell> cells(nx * ny);
  auto at = [&](size_t i, size_t j) -> MapCell& { return cells[i * ny + j]; };
  for (size_t i = 0; i < nx; ++i) {
    for (size_t j = 0; j < ny; ++j) {
      std::vector<int> c = fixed;
      c[x_dim] = static_cast<int>(i);
      c[y_dim] = static_cast<int>(j);
      auto found = index.find(c);
      if (found == index.end() || found->second >= input.results.size()) continue;
      const PointResult& r = input.results[found->second];
      const Point& p = input.points[found->second];
      const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
      MapCell& cell = at(i, j);
      cell.ran = r.status == PointStatus::kOk;
      cell.tip = "point " + std::to_string(p.index) + " (" + p.Describe() + "): ";
      if (!e) {
        cell.tip += cell.ran ? "edge not measured"
                             : std::string(PointStatusName(r.status)) + ", " + r.reason;
        continue;
      }
      cell.measured = true;
      cell.zvs = e->zvs;
      cell.margin = MarginOf(*e, margin);
      cell.predicted_full = PredictedFull(*e);
      cell.tip += std::string(ZvsClassName(e->zvs)) + ", " + margin.label + " " +
                  FormatQuantity(cell.margin, margin_unit);
    }
  }
  bool refined = std::any_of(input.points.begin(), input.points.end(),
                             [](const Point& p) { return p.refine_round >= 0; });
  if (refined) FillFromNearest(nx, ny, &cells);
  auto left = [&](size_t i) { return kLeft + i * cw; };
  auto top = [&](size_t j) { return kTop + (ny - 1 - j) * ch; };
  for (size_t i = 0; i < nx; ++i) {
    for (size_t j = 0; j < ny; ++j) {
      const MapCell& c = at(i, j);
      const char* fill = c.measured || c.inferred ? ClassColour(c.zvs)
                         : c.tip.empty()          ? "#ffffff"
                                                  : kNotRun;
      svg.Rect(left(i), top(j), cw, ch, fill, c.tip.empty() ? "no point" : c.tip);
      if (c.inferred) {
        double x = left(i), y = top(j);
        svg.Polygon({{x, y}, {x + cw, y}, {x + cw, y + ch}, {x, y + ch}}, "#ffffff", 0.55);
      }
      if (c.measured) {
        svg.Text(left(i) + cw / 2, top(j) + ch / 2 + 4, FormatQuantity(c.margin, margin_unit),
                 "middle", 10);
      }
    }
  }
  for (size_t i = 0; i <= nx; ++i) svg.Line(left(i), kTop, left(i), kTop + plot_h, "#ffffff", 1);
  for (size_t j = 0; j <= ny; ++j) {
    svg.Line(kLeft, kTop + j * ch, kLeft + plot_w, kTop + j * ch, "#ffffff", 1);
  }

  // Boundaries along the shared cell edges where full ZVS starts or stops,
  // so the line follows the colours; the hand calculation's dashed on top.
  bool hand = false;
  auto full = [](const MapCell& c) { return c.zvs == ZvsClass::kFull; };
  for (size_t i = 0; i < nx; ++i) {
    for (size_t j = 0; j < ny; ++j) {
      const MapCell& c = at(i, j);
      if (!c.measured) continue;
      for (int dir = 0; dir < 2; ++dir) {
        size_t ni = i + (dir == 0), nj = j + (dir == 1);
        if (ni >= nx || nj >= ny || !at(ni, nj).measured) continue;
        const MapCell& n = at(ni, nj);
        double x1 = dir == 0 ? left(ni) : left(i), x2 = dir == 0 ? left(ni) : left(i) + cw;
        double y1 = dir == 0 ? top(j) : top(j), y2 = dir == 0 ? top(j) + ch : top(j);
        if (full(c) != full(n)) svg.Line(x1, y1, x2, y2, kBoundary, 3);
        if (std::isfinite(c.predicted_full) && std::isfinite(n.predicted_full)) {
          hand = true;
          if ((c.predicted_full > 0.5) != (n.predicted_full > 0.5)) {
            svg.Line(x1, y1, x2, y2, kHandBoundary, 2.5, true);
          }
        }
      }
    }
  }

  // Axes, tick labels (every value while they fit) and names with units.
  svg.Line(kLeft, kTop + plot_h, kLeft + plot_w, kTop + plot_h, "#000000", 1);
  svg.Line(kLeft, kTop, kLeft, kTop + plot_h, "#000000", 1);
  for (size_t i = 0; i < nx; ++i) {
    svg.Text(left(i) + cw / 2, kTop + plot_h + 18, DimValue(xd, xd.values[i]), "middle", 11);
  }
  for (size_t j = 0; j < ny; ++j) {
    svg.Text(kLeft - 8, top(j) + ch / 2 + 4, DimValue(yd, yd.values[j]), "end", 11);
  }
  svg.Text(kLeft + plot_w / 2, kTop + plot_h + 42, DimLabel(xd), "middle", 13);
  svg.Text(28, kTop + plot_h / 2, DimLabel(yd), "middle", 13, -90);
  svg.Text(kLeft + plot_w / 2, kTop + plot_h + 62,
           "cell text: " + margin.label + ", " + AxisLabel(margin.description, margin_unit),
           "middle", 11);
  MapLegend(&svg, kLeft + plot_w + 20, kTop + 14, cells, hand);

  Plot plot;
  plot.file = "map_" + Safe(key.cell) + "_" + Safe(key.edge);
  if (!slice.empty()) plot.file += "_" + Safe(slice);
  plot.file += ".svg";
  plot.caption = title;
  plot.svg = svg.ToString();
  return plot;
}

Plot MetricCurvePlot(const ReportBasis& input, const EdgeKey& key, size_t dim,
                     const std::vector<int>& fixed, const std::string& column) {
  const double kWidth = 720, kHeight = 440, kLeft = 90, kRight = 150, kTop = 50, kBottom = 60;
  const Grid& grid = input.grid;
  const GridDim& xd = grid.dims[dim];
  const MarginSource& margin = input.margin;
  bool is_margin = column == "zvs_margin";
  std::string value_column = is_margin ? margin.column : column;
  std::string pred_column = value_column.empty() ? "" : value_column + "__pred";

  std::string y_unit = is_margin ? (margin.column.empty() ? margin.unit : MetricUnit(margin.column))
                                 : MetricUnit(column);
  bool is_turn_on = column == "v_turn_on_v";
  struct Sample {
    double x, y, pred, limit;
    ZvsClass zvs;
    std::string tip;
  };
  std::vector<Sample> samples;
  auto index = IndexByCoords(grid);
  for (size_t i = 0; i < xd.values.size(); ++i) {
    std::vector<int> c = fixed;
    c[dim] = static_cast<int>(i);
    auto found = index.find(c);
    if (found == index.end() || found->second >= input.results.size()) continue;
    const PointResult& r = input.results[found->second];
    const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
    if (!e) continue;
    double y = is_margin ? MarginOf(*e, margin) : e->Get(column);
    double pred = pred_column.empty() ? std::nan("") : e->Get(pred_column);
    const Point& p = input.points[found->second];
    samples.push_back({xd.values[i], y, pred, e->Get("v_residual_limit_v"), e->zvs,
                       "point " + std::to_string(p.index) + " (" + p.Describe() +
                           "): " + ZvsClassName(e->zvs) + ", " + column + " = " +
                           FormatQuantity(y, y_unit)});
  }

  std::string y_label =
      AxisLabel(is_margin ? margin.label + ": " + margin.description : column, y_unit);
  std::string slice = SliceText(grid, fixed, {dim});
  std::string slice_title = SliceTitle(grid, fixed, {dim});
  std::string title = key.Label() + ": " + (is_margin ? "zvs_margin" : column) + " versus " +
                      xd.param + (slice_title.empty() ? "" : " (" + slice_title + ")");
  SvgCanvas svg(kWidth, kHeight, title);
  svg.Text(kWidth / 2, 24, title, "middle", 15);
  double plot_w = kWidth - kLeft - kRight, plot_h = kHeight - kTop - kBottom;

  double x_lo = xd.values.front(), x_hi = xd.values.front();
  for (double v : xd.values) {
    x_lo = std::min(x_lo, v);
    x_hi = std::max(x_hi, v);
  }
  bool log_x = x_lo > 0 && x_hi / x_lo >= 100;
  auto fx = [&](double v) { return log_x ? std::log10(v) : v; };
  double y_lo = std::numeric_limits<double>::infinity(), y_hi = -y_lo;
  for (const Sample& s : samples) {
    for (double v : {s.y, s.pred, is_turn_on ? s.limit : s.y}) {
      if (!std::isfinite(v)) continue;
      y_lo = std::min(y_lo, v);
      y_hi = std::max(y_hi, v);
    }
  }
  PadAxisRange(&y_lo, &y_hi);
  double xs_lo = fx(x_lo), xs_hi = fx(x_hi);
  if (xs_hi == xs_lo) xs_hi = xs_lo + 1;
  auto px = [&](double v) { return kLeft + (fx(v) - xs_lo) / (xs_hi - xs_lo) * plot_w; };
  auto py = [&](double v) { return kTop + (y_hi - v) / (y_hi - y_lo) * plot_h; };

  // Frame, ticks, zero line.
  svg.Line(kLeft, kTop + plot_h, kLeft + plot_w, kTop + plot_h, "#000000", 1);
  svg.Line(kLeft, kTop, kLeft, kTop + plot_h, "#000000", 1);
  for (double v : NiceTicks(y_lo, y_hi, 7)) {
    if (v < y_lo || v > y_hi) continue;
    svg.Line(kLeft, py(v), kLeft + plot_w, py(v), "#e0e0e0", 1);
    svg.Text(kLeft - 6, py(v) + 4, FormatQuantity(v, y_unit), "end", 11);
  }
  if (y_lo < 0 && y_hi > 0) svg.Line(kLeft, py(0), kLeft + plot_w, py(0), "#777777", 1, true);
  std::vector<double> x_ticks;
  if (log_x) {
    for (size_t i = 0; i < xd.values.size(); i += TickStride(xd.values.size())) {
      x_ticks.push_back(xd.values[i]);
    }
  } else {
    x_ticks = NiceTicks(x_lo, x_hi, 7);
  }
  for (double v : x_ticks) {
    if (v < std::min(x_lo, x_hi) || v > std::max(x_lo, x_hi)) continue;
    svg.Line(px(v), kTop + plot_h, px(v), kTop + plot_h + 5, "#000000", 1);
    svg.Text(px(v), kTop + plot_h + 18, DimValue(xd, v), "middle", 11);
  }
  svg.Text(kLeft + plot_w / 2, kHeight - 16, DimLabel(xd) + (log_x ? " (log scale)" : ""), "middle",
           13);
  svg.Text(24, kTop + plot_h / 2, y_label, "middle", 12, -90);

  std::vector<std::pair<double, double>> line, pred_line, limit_line;
  for (const Sample& s : samples) {
    if (std::isfinite(s.y)) line.emplace_back(px(s.x), py(s.y));
    if (std::isfinite(s.pred)) pred_line.emplace_back(px(s.x), py(s.pred));
    if (is_turn_on && std::isfinite(s.limit)) limit_line.emplace_back(px(s.x), py(s.limit));
  }
  // The ZVS limit: at or below it the turn-on counts as full ZVS.
  svg.Polyline(limit_line, kFull, 1.5);
  svg.Polyline(line, "#0072B2", 2);
  svg.Polyline(pred_line, "#CC79A7", 2, true);
  for (const Sample& s : samples) {
    if (std::isfinite(s.y)) svg.Circle(px(s.x), py(s.y), 5, ClassColour(s.zvs), s.tip);
  }

  double lx = kWidth - kRight + 16, ly = kTop + 14;
  svg.Line(lx, ly - 4, lx + 18, ly - 4, "#0072B2", 2);
  svg.Text(lx + 24, ly, "simulated", "start", 12);
  if (!pred_line.empty()) {
    ly += 20;
    svg.Line(lx, ly - 4, lx + 18, ly - 4, "#CC79A7", 2, true);
    svg.Text(lx + 24, ly, "hand calculation", "start", 12);
  }
  if (limit_line.size() >= 2) {
    ly += 20;
    svg.Line(lx, ly - 4, lx + 18, ly - 4, kFull, 1.5);
    svg.Text(lx + 24, ly, "ZVS limit", "start", 12);
  }
  ly += 26;
  const std::pair<const char*, const char*> items[] = {
      {kFull, "full ZVS"}, {kPartial, "partial"}, {kHard, "hard"}};
  for (const auto& [colour, label] : items) {
    svg.Circle(lx + 7, ly - 4, 5, colour);
    svg.Text(lx + 24, ly, label, "start", 12);
    ly += 20;
  }

  Plot plot;
  plot.file = "curve_" + Safe(key.cell) + "_" + Safe(key.edge) + "_" + Safe(column);
  if (!slice.empty()) plot.file += "_" + Safe(slice);
  plot.file += ".svg";
  plot.caption = title;
  plot.svg = svg.ToString();
  return plot;
}

namespace {

// A refined sweep maps only the slices of the held dimensions that hold
// coarse points (round 0): between them the refinement sampled only the
// cells around the boundary. Every slice of an unrefined sweep counts.
bool CoarseSlice(const ReportBasis& input, const std::vector<size_t>& held,
                 const std::vector<int>& at) {
  bool refined = false;
  for (size_t i = 0; i < input.points.size() && i < input.grid.coords.size(); ++i) {
    const Point& p = input.points[i];
    if (p.refine_round < 0) continue;
    refined = true;
    if (p.refine_round != 0) continue;
    bool in_slice = true;
    for (size_t d : held) in_slice = in_slice && input.grid.coords[i][d] == at[d];
    if (in_slice) return true;
  }
  return !refined;
}

}  // namespace

std::vector<Plot> MakePlots(const ReportBasis& input) {
  std::vector<Plot> plots;
  const Grid& grid = input.grid;
  std::vector<size_t> swept = grid.SweptDims();
  const std::vector<EdgeKey>& edges = input.edges;
  std::vector<int> fixed(grid.dims.size(), 0);
  if (swept.size() == 1) {
    std::vector<std::string> columns = {"zvs_margin", "v_turn_on_v", "i_commutated_a",
                                        "t_transition_s"};
    std::string t_zvs = FindColumnWithPrefix(input.results, "t_zvs");
    if (!t_zvs.empty()) columns.push_back(t_zvs);
    for (const EdgeKey& key : edges) {
      for (const std::string& column : columns) {
        plots.push_back(MetricCurvePlot(input, key, swept[0], fixed, column));
      }
    }
    return plots;
  }
  if (swept.size() < 2) return plots;
  // Maps over the first two swept dimensions; further ones are held, each
  // combination its own map (mixed-radix count over their positions).
  std::vector<size_t> further(swept.begin() + 2, swept.end());
  constexpr int kMaxMapsPerEdge = 16;
  for (const EdgeKey& key : edges) {
    std::vector<int> at(grid.dims.size(), 0);
    for (int n = 0; n < kMaxMapsPerEdge;) {
      if (CoarseSlice(input, further, at)) {
        plots.push_back(ZvsMapPlot(input, key, swept[1], swept[0], at));
        ++n;
      }
      if (!grid.NextSlice(further, &at)) break;
    }
  }
  return plots;
}

}  // namespace zvsmap
