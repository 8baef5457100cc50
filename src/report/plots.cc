#include "report/plots.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>
#include <map>

#include "core/spice_number.h"
#include "report/svg_canvas.h"

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
  std::string label = dim.param;
  for (const std::string& a : dim.also) label += " (with " + a + ")";
  return label;
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

// The result index at `coords`, or -1.
std::map<std::vector<int>, size_t> IndexByCoords(const Grid& grid) {
  std::map<std::vector<int>, size_t> out;
  for (size_t i = 0; i < grid.coords.size(); ++i) out.emplace(grid.coords[i], i);
  return out;
}

void Legend(SvgCanvas* svg, double x, double y) {
  const std::pair<const char*, const char*> items[] = {{kFull, "full ZVS"},
                                                       {kPartial, "partial"},
                                                       {kHard, "hard"},
                                                       {kUnknown, "unknown"},
                                                       {kNotRun, "did not run"}};
  for (const auto& [colour, label] : items) {
    svg->Rect(x, y - 11, 14, 14, colour);
    svg->Text(x + 20, y, label, "start", 12);
    y += 20;
  }
  svg->Line(x, y - 4, x + 14, y - 4, kBoundary, 3);
  svg->Text(x + 20, y, "boundary", "start", 12);
}

// Tick every k-th label so at most ~10 show.
size_t TickStride(size_t n) { return n <= 10 ? 1 : (n + 9) / 10; }

}  // namespace

Plot ZvsMapPlot(const ReportInput& input, const Grid& grid, const EdgeKey& key, size_t x_dim,
                size_t y_dim, const std::vector<int>& fixed) {
  const double kWidth = 760, kHeight = 520, kLeft = 100, kRight = 150, kTop = 50, kBottom = 70;
  const GridDim& xd = grid.dims[x_dim];
  const GridDim& yd = grid.dims[y_dim];
  size_t nx = xd.values.size(), ny = yd.values.size();
  double plot_w = kWidth - kLeft - kRight, plot_h = kHeight - kTop - kBottom;
  double cw = plot_w / nx, ch = plot_h / ny;
  std::string slice = SliceText(grid, fixed, {x_dim, y_dim});
  std::string title = key.Label() + ": ZVS class over " + xd.param + " and " + yd.param +
                      (slice.empty() ? "" : " (" + slice + ")");
  SvgCanvas svg(kWidth, kHeight, title);
  svg.Text(kWidth / 2, 24, title, "middle", 15);

  MarginSource margin = ChooseMargin(input.results);
  auto index = IndexByCoords(grid);
  auto cell_x = [&](double pos) { return kLeft + (pos + 0.5) * cw; };
  auto cell_y = [&](double pos) { return kTop + (ny - 0.5 - pos) * ch; };
  for (size_t i = 0; i < nx; ++i) {
    for (size_t j = 0; j < ny; ++j) {
      std::vector<int> c = fixed;
      c[x_dim] = static_cast<int>(i);
      c[y_dim] = static_cast<int>(j);
      auto found = index.find(c);
      double x = kLeft + i * cw, y = kTop + (ny - 1 - j) * ch;
      if (found == index.end() || found->second >= input.results.size()) {
        svg.Rect(x, y, cw, ch, "#ffffff", "no point");
        continue;
      }
      const PointResult& r = input.results[found->second];
      const Point& p = input.points[found->second];
      const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
      std::string tip = "point " + std::to_string(p.index) + " (" + p.Describe() + "): ";
      if (!e) {
        tip += r.status == PointStatus::kOk
                   ? "edge not measured"
                   : std::string(PointStatusName(r.status)) + ", " + r.reason;
        svg.Rect(x, y, cw, ch, kNotRun, tip);
        continue;
      }
      double m = MarginOf(*e, margin);
      tip += std::string(ZvsClassName(e->zvs)) + ", margin " + Eng(m);
      svg.Rect(x, y, cw, ch, ClassColour(e->zvs), tip);
      if (cw >= 44 && ch >= 18) svg.Text(x + cw / 2, y + ch / 2 + 4, Eng(m), "middle", 10);
    }
  }
  // Thin grid lines between cells.
  for (size_t i = 0; i <= nx; ++i) {
    svg.Line(kLeft + i * cw, kTop, kLeft + i * cw, kTop + plot_h, "#ffffff", 1);
  }
  for (size_t j = 0; j <= ny; ++j) {
    svg.Line(kLeft, kTop + j * ch, kLeft + plot_w, kTop + j * ch, "#ffffff", 1);
  }

  // The boundary: a segment across the cell row (or column) at the located value.
  for (const Boundary& b : FindBoundaries(grid, input.results, key, margin)) {
    if (b.dim != x_dim && b.dim != y_dim) continue;
    bool in_slice = true;
    for (size_t d = 0; d < grid.dims.size(); ++d) {
      if (d == x_dim || d == y_dim) continue;
      in_slice = in_slice && b.at[d] == fixed[d];
    }
    if (!in_slice) continue;
    if (b.dim == x_dim) {
      double x = cell_x(b.position), yc = cell_y(b.at[y_dim]);
      svg.Line(x, yc - ch / 2, x, yc + ch / 2, kBoundary, 3);
    } else {
      double y = cell_y(b.position), xc = cell_x(b.at[x_dim]);
      svg.Line(xc - cw / 2, y, xc + cw / 2, y, kBoundary, 3);
    }
  }

  // Axes, tick labels and names.
  svg.Line(kLeft, kTop + plot_h, kLeft + plot_w, kTop + plot_h, "#000000", 1);
  svg.Line(kLeft, kTop, kLeft, kTop + plot_h, "#000000", 1);
  for (size_t i = 0; i < nx; i += TickStride(nx)) {
    svg.Text(cell_x(i), kTop + plot_h + 18, Eng(xd.values[i]), "middle", 11);
  }
  for (size_t j = 0; j < ny; j += TickStride(ny)) {
    svg.Text(kLeft - 8, cell_y(j) + 4, Eng(yd.values[j]), "end", 11);
  }
  svg.Text(kLeft + plot_w / 2, kHeight - 20, DimLabel(xd), "middle", 13);
  svg.Text(28, kTop + plot_h / 2, DimLabel(yd), "middle", 13, -90);
  svg.Text(kLeft + plot_w / 2, kHeight - 4,
           "cell text: margin, " + margin.description +
               (margin.unit.empty() ? "" : " [" + margin.unit + "]"),
           "middle", 10);
  Legend(&svg, kWidth - kRight + 16, kTop + 14);

  Plot plot;
  plot.file = "map_" + Safe(key.cell) + "_" + Safe(key.edge);
  if (!slice.empty()) plot.file += "_" + Safe(slice);
  plot.file += ".svg";
  plot.caption = title;
  plot.svg = svg.ToString();
  return plot;
}

Plot MetricCurvePlot(const ReportInput& input, const Grid& grid, const EdgeKey& key, size_t dim,
                     const std::vector<int>& fixed, const std::string& column) {
  const double kWidth = 720, kHeight = 440, kLeft = 90, kRight = 150, kTop = 50, kBottom = 60;
  const GridDim& xd = grid.dims[dim];
  MarginSource margin = ChooseMargin(input.results);
  bool is_margin = column == "zvs_margin";
  std::string value_column = is_margin ? margin.column : column;
  std::string pred_column = value_column.empty() ? "" : value_column + "__pred";

  struct Sample {
    double x, y, pred;
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
    samples.push_back({xd.values[i], y, pred, e->zvs,
                       "point " + std::to_string(p.index) + " (" + p.Describe() +
                           "): " + ZvsClassName(e->zvs) + ", " + column + "=" + Eng(y)});
  }

  std::string y_label = is_margin ? "ZVS margin: " + margin.description +
                                        (margin.unit.empty() ? "" : " [" + margin.unit + "]")
                                  : column;
  std::string slice = SliceText(grid, fixed, {dim});
  std::string title = key.Label() + ": " + (is_margin ? "zvs_margin" : column) + " versus " +
                      xd.param + (slice.empty() ? "" : " (" + slice + ")");
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
    for (double v : {s.y, s.pred}) {
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
  for (int k = 0; k <= 5; ++k) {
    double v = y_lo + (y_hi - y_lo) * k / 5;
    svg.Line(kLeft, py(v), kLeft + plot_w, py(v), "#e0e0e0", 1);
    svg.Text(kLeft - 6, py(v) + 4, Eng(v), "end", 11);
  }
  if (y_lo < 0 && y_hi > 0) svg.Line(kLeft, py(0), kLeft + plot_w, py(0), "#777777", 1, true);
  for (size_t i = 0; i < xd.values.size(); i += TickStride(xd.values.size())) {
    svg.Line(px(xd.values[i]), kTop + plot_h, px(xd.values[i]), kTop + plot_h + 5, "#000000", 1);
    svg.Text(px(xd.values[i]), kTop + plot_h + 18, Eng(xd.values[i]), "middle", 11);
  }
  svg.Text(kLeft + plot_w / 2, kHeight - 16, DimLabel(xd) + (log_x ? " (log scale)" : ""), "middle",
           13);
  svg.Text(24, kTop + plot_h / 2, y_label, "middle", 12, -90);

  std::vector<std::pair<double, double>> line, pred_line;
  for (const Sample& s : samples) {
    if (std::isfinite(s.y)) line.emplace_back(px(s.x), py(s.y));
    if (std::isfinite(s.pred)) pred_line.emplace_back(px(s.x), py(s.pred));
  }
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

std::vector<Plot> MakePlots(const ReportInput& input) {
  std::vector<Plot> plots;
  Grid grid = BuildGrid(input.spec, input.points);
  std::vector<size_t> swept = grid.SweptDims();
  std::vector<EdgeKey> edges = MeasuredEdges(input.results);
  std::vector<int> fixed(grid.dims.size(), 0);
  if (swept.size() == 1) {
    std::vector<std::string> columns = {"zvs_margin", "v_turn_on_v", "i_commutated_a",
                                        "t_transition_s"};
    std::string t_zvs = FindColumnWithPrefix(input.results, "t_zvs");
    if (!t_zvs.empty()) columns.push_back(t_zvs);
    for (const EdgeKey& key : edges) {
      for (const std::string& column : columns) {
        plots.push_back(MetricCurvePlot(input, grid, key, swept[0], fixed, column));
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
    for (int n = 0; n < kMaxMapsPerEdge; ++n) {
      plots.push_back(ZvsMapPlot(input, grid, key, swept[1], swept[0], at));
      size_t k = 0;
      for (; k < further.size(); ++k) {
        size_t d = further[k];
        if (++at[d] < static_cast<int>(grid.dims[d].values.size())) break;
        at[d] = 0;
      }
      if (k == further.size()) break;
    }
  }
  return plots;
}

}  // namespace zvsmap
