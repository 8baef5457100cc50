#include "report/tolerance_maps.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdio>
#include <map>

#include "core/spice_number.h"
#include "report/csv_writer.h"
#include "report/svg_canvas.h"
#include "report/units.h"

namespace zvsmap {

namespace {

// Okabe & Ito's palette (2008), as the class map, so that the colours stay
// apart for the common forms of colour blindness.
const char* kNotMeasured = "#bbbbbb";
const char* kLow = "#D55E00";   // vermillion: negative margins
const char* kHigh = "#009E73";  // bluish green: positive margins

std::string Safe(const std::string& s) {
  std::string out;
  for (char c : s) out += std::isalnum(static_cast<unsigned char>(c)) ? c : '_';
  return out;
}

std::string Percent(double fraction) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f %%", fraction * 100);
  return buf;
}

std::string DimValue(const GridDim& dim, size_t i) {
  if (dim.Categorical() && i < dim.labels.size()) return dim.labels[i];
  return FormatQuantity(dim.values[i], ParamUnit(dim.param));
}

std::string DimLabel(const GridDim& dim) {
  std::string label = AxisLabel(dim.param, ParamUnit(dim.param));
  for (const std::string& a : dim.also) label += " (with " + a + ")";
  return label;
}

// The held dimensions as "L=1u" (file names) or "L = 1 µH" (titles).
std::string Slice(const Grid& grid, const std::vector<int>& fixed, size_t x_dim, size_t y_dim,
                  bool title) {
  std::string out;
  for (size_t d = 0; d < grid.dims.size(); ++d) {
    if (d == x_dim || d == y_dim || grid.dims[d].values.size() < 2 || fixed[d] < 0) continue;
    size_t at = static_cast<size_t>(fixed[d]);
    out += (out.empty() ? "" : ", ") + grid.dims[d].param +
           (title ? " = " + DimValue(grid.dims[d], at)
                  : "=" + FormatEngineering(grid.dims[d].values[at], 3));
  }
  return out;
}

// A colour between white and `end` at `t` in [0, 1].
std::string Blend(const char* end, double t) {
  unsigned r = 0, g = 0, b = 0;
  std::sscanf(end + 1, "%2x%2x%2x", &r, &g, &b);
  t = std::max(0.0, std::min(1.0, t));
  auto mix = [&](unsigned c) { return static_cast<unsigned>(std::lround(255 + (c - 255.0) * t)); };
  char buf[8];
  std::snprintf(buf, sizeof buf, "#%02x%02x%02x", mix(r), mix(g), mix(b));
  return buf;
}

// Diverging around 0: white at 0, full colour at |value| >= span. A light
// tint (t >= 0.15) keeps a small margin's sign visible.
std::string MarginColour(double value, double span) {
  if (std::isnan(value)) return kNotMeasured;
  double t = span > 0 ? std::fabs(value) / span : 1;
  return Blend(value < 0 ? kLow : kHigh, 0.15 + 0.85 * std::min(1.0, t));
}

// What one cell shows.
struct Cell {
  bool point = false;  // a nominal point sits here
  const EdgeTolerance* t = nullptr;
  size_t index = 0;
  std::string describe;
};

double ValueOf(const EdgeTolerance& t, ToleranceView view) {
  switch (view) {
    case ToleranceView::kYield:
      return t.yield;
    case ToleranceView::kWorstEnergy:
      return t.worst_energy_margin;
    case ToleranceView::kWorstTiming:
      return t.worst_timing_margin_s;
  }
  return NAN;
}

const char* ViewUnit(ToleranceView view) { return view == ToleranceView::kWorstTiming ? "s" : ""; }

std::string ValueText(double v, ToleranceView view) {
  if (std::isnan(v)) return "n/a";
  return view == ToleranceView::kYield ? Percent(v) : FormatQuantity(v, ViewUnit(view));
}

std::string Tooltip(const Cell& c, ToleranceView view, const ToleranceSummary& s) {
  std::string tip = "point " + std::to_string(c.index) + " (" + c.describe + "): ";
  const EdgeTolerance* t = c.t;
  if (!t) return tip + "edge not measured by any variant";
  if (view == ToleranceView::kYield) {
    if (t->samples == 0) return tip + "no sample measured the edge";
    tip += "yield " + std::to_string(t->passes) + " of " + std::to_string(t->samples) +
           " samples = " + Percent(t->yield) + " (pass: " + PassName(s.pass) + "), " +
           Percent(s.confidence) + " Wilson interval " + Percent(t->interval.low) + " to " +
           Percent(t->interval.high);
    if (t->unmeasured > 0) tip += ", " + std::to_string(t->unmeasured) + " samples unmeasured";
    if (t->worst_sample >= 0) {
      tip += "; worst sample " + std::to_string(t->worst_sample) + " (" + s.margin.label + " " +
             FormatQuantity(t->worst_sample_margin,
                            s.margin.column.empty() ? s.margin.unit : MetricUnit(s.margin.column)) +
             ")";
    }
    return tip;
  }
  double v = ValueOf(*t, view);
  if (std::isnan(v)) return tip + "no corner measured this margin";
  const std::string& corner =
      view == ToleranceView::kWorstEnergy ? t->worst_energy_corner : t->worst_timing_corner;
  return tip + "worst over " + std::to_string(t->corners) + " corners " + ValueText(v, view) +
         " at corner " + corner;
}

SvgCanvas::DataAttributes DataOf(const Cell& c, ToleranceView view) {
  SvgCanvas::DataAttributes data = {{"point", std::to_string(c.index)}};
  if (!c.t) return data;
  data.emplace_back("value", CsvNumber(ValueOf(*c.t, view)));
  if (view == ToleranceView::kYield) {
    data.emplace_back("passes", std::to_string(c.t->passes));
    data.emplace_back("samples", std::to_string(c.t->samples));
    if (c.t->samples > 0) {
      data.emplace_back("low", CsvNumber(c.t->interval.low));
      data.emplace_back("high", CsvNumber(c.t->interval.high));
    }
  } else {
    data.emplace_back("corner", view == ToleranceView::kWorstEnergy ? c.t->worst_energy_corner
                                                                    : c.t->worst_timing_corner);
  }
  return data;
}

// The legend right of the plot: the yield's bands, or the margin scale's
// steps from -span to +span.
void Legend(SvgCanvas* svg, double x, double y, ToleranceView view, double span) {
  if (view == ToleranceView::kYield) {
    for (const YieldBand& b : YieldBands()) {
      svg->Rect(x, y - 11, 14, 14, b.colour);
      svg->Text(x + 20, y, b.label, "start", 12);
      y += 20;
    }
  } else {
    const int kSteps = 7;
    for (int k = kSteps - 1; k >= 0; --k) {
      double v = span * (2.0 * k / (kSteps - 1) - 1);
      svg->Rect(x, y - 11, 14, 14, MarginColour(v, span));
      svg->Text(x + 20, y, (v > 0 ? "+" : "") + FormatQuantity(v, ViewUnit(view)), "start", 12);
      y += 20;
    }
  }
  svg->Rect(x, y - 11, 14, 14, kNotMeasured);
  svg->Text(x + 20, y, "not measured", "start", 12);
}

std::string ViewTitle(ToleranceView view, const ToleranceSummary& s) {
  switch (view) {
    case ToleranceView::kYield:
      return std::string("ZVS yield (pass: ") + PassName(s.pass) + ")";
    case ToleranceView::kWorstEnergy:
      return "worst-case energy margin over the corners";
    case ToleranceView::kWorstTiming:
      return "worst-case timing margin over the corners";
  }
  return "";
}

}  // namespace

const std::vector<YieldBand>& YieldBands() {
  static const std::vector<YieldBand> bands = {{0.99, "#009E73", "99 % or more"},
                                               {0.95, "#56B4E9", "95 % to 99 %"},
                                               {0.90, "#F0E442", "90 % to 95 %"},
                                               {0.50, "#E69F00", "50 % to 90 %"},
                                               {0.0, "#D55E00", "below 50 %"}};
  return bands;
}

std::string YieldColour(double yield) {
  if (std::isnan(yield)) return kNotMeasured;
  for (const YieldBand& b : YieldBands()) {
    if (yield >= b.low) return b.colour;
  }
  return YieldBands().back().colour;
}

const char* ToleranceViewStem(ToleranceView view) {
  switch (view) {
    case ToleranceView::kYield:
      return "yield_";
    case ToleranceView::kWorstEnergy:
      return "worst_energy_";
    case ToleranceView::kWorstTiming:
      return "worst_timing_";
  }
  return "yield_";
}

Plot ToleranceMapPlot(const ReportBasis& input, const EdgeKey& key, ToleranceView view,
                      size_t x_dim, size_t y_dim, const std::vector<int>& fixed) {
  const Grid& grid = input.grid;
  const GridDim& xd = grid.dims[x_dim];
  bool one_row = y_dim == kOneRow;
  size_t nx = xd.values.size(), ny = one_row ? 1 : grid.dims[y_dim].values.size();
  const double cw = std::max(64.0, std::min(110.0, 620.0 / nx));
  const double ch = std::max(26.0, std::min(60.0, 420.0 / ny));
  const double kLeft = 110, kRight = 190, kTop = 50, kBottom = 80;
  const double plot_w = cw * nx, plot_h = ch * ny;
  const double width = kLeft + plot_w + kRight, height = std::max(kTop + plot_h + kBottom, 320.0);
  std::string slice_title = Slice(grid, fixed, x_dim, y_dim, true);
  std::string title = key.Label() + ": " + ViewTitle(view, input.tolerance) + " over " + xd.param +
                      (one_row ? "" : " and " + grid.dims[y_dim].param) +
                      (slice_title.empty() ? "" : " (" + slice_title + ")");
  SvgCanvas svg(width, height, title);
  svg.Text(kLeft + plot_w / 2, 24, title, "middle", 15);

  // The cells from the nominal points on this slice.
  std::vector<Cell> cells(nx * ny);
  double span = 0;
  for (size_t i = 0; i < input.points.size() && i < grid.coords.size(); ++i) {
    const std::vector<int>& c = grid.coords[i];
    bool on_slice = !c.empty();
    for (size_t d = 0; d < c.size() && on_slice; ++d) {
      if (d != x_dim && d != y_dim && grid.dims[d].values.size() > 1) on_slice = c[d] == fixed[d];
    }
    if (!on_slice || c[x_dim] < 0 || (!one_row && c[y_dim] < 0)) continue;
    size_t cx = static_cast<size_t>(c[x_dim]), cy = one_row ? 0 : static_cast<size_t>(c[y_dim]);
    Cell& cell = cells[cx * ny + cy];
    cell.point = true;
    cell.index = input.points[i].index;
    cell.describe = input.points[i].Describe();
    const PointTolerance* pt = input.tolerance.Find(cell.index);
    cell.t = pt ? pt->Find(key.cell, key.edge) : nullptr;
    double v = cell.t ? ValueOf(*cell.t, view) : NAN;
    if (std::isfinite(v)) span = std::max(span, std::fabs(v));
  }
  auto left = [&](size_t i) { return kLeft + i * cw; };
  auto top = [&](size_t j) { return kTop + (ny - 1 - j) * ch; };
  for (size_t i = 0; i < nx; ++i) {
    for (size_t j = 0; j < ny; ++j) {
      const Cell& c = cells[i * ny + j];
      if (!c.point) {
        svg.Rect(left(i), top(j), cw, ch, "#ffffff", "no point");
        continue;
      }
      double v = c.t ? ValueOf(*c.t, view) : NAN;
      std::string fill = view == ToleranceView::kYield ? YieldColour(v) : MarginColour(v, span);
      svg.Rect(left(i), top(j), cw, ch, fill, Tooltip(c, view, input.tolerance), DataOf(c, view));
      svg.Text(left(i) + cw / 2, top(j) + ch / 2 + 4, ValueText(v, view), "middle", 10);
    }
  }
  for (size_t i = 0; i <= nx; ++i) svg.Line(left(i), kTop, left(i), kTop + plot_h, "#ffffff", 1);
  for (size_t j = 0; j <= ny; ++j) {
    svg.Line(kLeft, kTop + j * ch, kLeft + plot_w, kTop + j * ch, "#ffffff", 1);
  }
  svg.Line(kLeft, kTop + plot_h, kLeft + plot_w, kTop + plot_h, "#000000", 1);
  svg.Line(kLeft, kTop, kLeft, kTop + plot_h, "#000000", 1);
  for (size_t i = 0; i < nx; ++i) {
    svg.Text(left(i) + cw / 2, kTop + plot_h + 18, DimValue(xd, i), "middle", 11);
  }
  if (!one_row) {
    const GridDim& yd = grid.dims[y_dim];
    for (size_t j = 0; j < ny; ++j) {
      svg.Text(kLeft - 8, top(j) + ch / 2 + 4, DimValue(yd, j), "end", 11);
    }
    svg.Text(28, kTop + plot_h / 2, DimLabel(yd), "middle", 13, -90);
  }
  svg.Text(kLeft + plot_w / 2, kTop + plot_h + 42, DimLabel(xd), "middle", 13);
  svg.Text(kLeft + plot_w / 2, kTop + plot_h + 62,
           view == ToleranceView::kYield
               ? "hover a cell: the yield's " + Percent(input.tolerance.confidence) +
                     " Wilson interval and the worst sample"
               : std::string("hover a cell: the corner that gives the worst margin"),
           "middle", 11);
  Legend(&svg, kLeft + plot_w + 20, kTop + 14, view, span);

  Plot plot;
  std::string slice = Slice(grid, fixed, x_dim, y_dim, false);
  plot.file = ToleranceViewStem(view) + Safe(key.cell) + "_" + Safe(key.edge);
  if (!slice.empty()) plot.file += "_" + Safe(slice);
  plot.file += ".svg";
  plot.caption = title;
  plot.svg = svg.ToString();
  return plot;
}

namespace {

// The views some point of the summary has a value for, for edge `key`.
std::vector<ToleranceView> ViewsWithValues(const ToleranceSummary& s, const EdgeKey& key) {
  std::vector<ToleranceView> out;
  for (ToleranceView view :
       {ToleranceView::kYield, ToleranceView::kWorstEnergy, ToleranceView::kWorstTiming}) {
    bool any = std::any_of(s.points.begin(), s.points.end(), [&](const PointTolerance& p) {
      const EdgeTolerance* t = p.Find(key.cell, key.edge);
      return t && !std::isnan(ValueOf(*t, view));
    });
    if (any) out.push_back(view);
  }
  return out;
}

}  // namespace

std::vector<Plot> MakeToleranceMaps(const ReportBasis& input) {
  std::vector<Plot> plots;
  if (!input.tolerance.used) return plots;
  const Grid& grid = input.grid;
  std::vector<size_t> swept = grid.SweptDims();
  if (swept.empty()) return plots;
  // As the class maps: the second swept dimension across, the first up.
  size_t x_dim = swept.size() == 1 ? swept[0] : swept[1];
  size_t y_dim = swept.size() == 1 ? kOneRow : swept[0];
  std::vector<size_t> further;
  if (swept.size() > 2) further.assign(swept.begin() + 2, swept.end());
  constexpr int kMaxMapsPerEdge = 16;
  for (const EdgeKey& key : input.edges) {
    for (ToleranceView view : ViewsWithValues(input.tolerance, key)) {
      std::vector<int> at(grid.dims.size(), 0);
      for (int n = 0; n < kMaxMapsPerEdge; ++n) {
        plots.push_back(ToleranceMapPlot(input, key, view, x_dim, y_dim, at));
        if (!grid.NextSlice(further, &at)) break;
      }
    }
  }
  return plots;
}

}  // namespace zvsmap
