#include "report/html_tables.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdio>
#include <optional>

#include "core/spice_number.h"
#include "core/text.h"
#include "report/html_index.h"
#include "report/solver_aid_use.h"
#include "report/units.h"
#include "report/zvs_boundary.h"

namespace zvsmap {

namespace {

constexpr size_t kWorstPoints = 5;
constexpr size_t kDisagreements = 12;

std::string Raw(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.9g", v);
  return buf;
}

// A table cell holding a number: text with units, raw value for machines
// (empty for n/a, which sorts last).
std::string Num(double v, const std::string& unit) {
  if (std::isnan(v)) return "<td class=\"num\" data-value=\"\">n/a</td>";
  return "<td class=\"num\" data-value=\"" + Raw(v) + "\">" + HtmlEscape(FormatQuantity(v, unit)) +
         "</td>";
}

std::string Td(const std::string& text) { return "<td>" + HtmlEscape(text) + "</td>"; }

// A count of simulated periods, which a measured run's tail makes fractional.
std::string PeriodCount(double periods) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3g", periods);
  return buf;
}

// The opening of a table: its header row in <thead>, then <tbody>; close
// with kTableEnd. `sortable`: the page's script sorts it by a clicked header.
std::string TableStart(const std::string& cls, std::initializer_list<const char*> names,
                       bool sortable = true) {
  std::string h = "<table class=\"" + cls + (sortable ? " sortable" : "") + "\">\n<thead><tr>";
  for (const char* n : names) h += std::string("<th>") + n + "</th>";
  return h + "</tr></thead>\n<tbody>\n";
}

constexpr const char* kTableEnd = "</tbody></table>\n";

// ---- Accessors: the only places that know how results name things. ----

// The value a point gives a parameter, if the point names it.
bool PointValue(const Point& p, const std::string& param, double* value) {
  for (const ParamValue& v : p.values) {
    if (SameName(v.name, param)) {
      *value = v.value;
      return true;
    }
  }
  return false;
}

// Where a point sits, in the units' own symbols: the swept dimensions only
// ("L = 3.3 µH, Iout = 2 A"; the fixed values are in the settings table).
std::string OperatingPointText(const Grid& grid, size_t i, const Point& p) {
  std::string out;
  for (size_t d : grid.SweptDims()) {
    const GridDim& dim = grid.dims[d];
    int at = i < grid.coords.size() && d < grid.coords[i].size() ? grid.coords[i][d] : -1;
    std::string text;
    double v = NAN;
    if (dim.Categorical()) {
      if (at >= 0 && static_cast<size_t>(at) < dim.labels.size()) text = dim.labels[at];
    } else if (PointValue(p, dim.param, &v)) {
      text = FormatQuantity(v, ParamUnit(dim.param), 4);
    } else if (at >= 0 && static_cast<size_t>(at) < dim.values.size()) {
      text = FormatQuantity(dim.values[at], ParamUnit(dim.param), 4);
    }
    if (text.empty()) continue;
    out += (out.empty() ? "" : ", ") + dim.param + " = " + text;
  }
  return out.empty() ? "the single point" : out;
}

// The point-number and operating-point cells of a row; both sort in the
// sweep's order (the point's index).
std::string PointCells(const ReportInput& input, const Grid& grid, size_t i) {
  const Point& p = input.points[i];
  std::string index = std::to_string(p.index);
  return "<td class=\"num\" data-value=\"" + index + "\">" + index + "</td><td data-value=\"" +
         index + "\">" + HtmlEscape(OperatingPointText(grid, i, p)) + "</td>";
}

// ---- Edge sections ----

// Plot file names as plots.cc makes them: every other character than a
// letter or digit becomes '_'.
std::string FileSafe(const std::string& s) {
  std::string out;
  for (char c : s) out += std::isalnum(static_cast<unsigned char>(c)) ? c : '_';
  return out;
}

std::string Capitalised(std::string s) {
  if (!s.empty()) s[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(s[0])));
  return s;
}

// The figures of `plots` whose file is `stem` ".svg" or `stem` "_…", marked
// in `placed` so that the index does not show them twice.
std::string EdgeFigures(const std::vector<Plot>& plots, const std::string& stem,
                        std::vector<bool>* placed) {
  std::string h;
  for (size_t k = 0; k < plots.size(); ++k) {
    const std::string& f = plots[k].file;
    if ((*placed)[k] || f.compare(0, stem.size(), stem) != 0 || f.size() <= stem.size()) continue;
    if (f[stem.size()] != '.' && f[stem.size()] != '_') continue;
    (*placed)[k] = true;
    h += "<figure><img src=\"" + HtmlEscape(f) + "\" alt=\"" + HtmlEscape(plots[k].caption) +
         "\"><figcaption>" + HtmlEscape(plots[k].caption) + "</figcaption></figure>\n";
  }
  return h;
}

std::string BoundaryTable(const ReportInput& input, const Grid& grid, const EdgeKey& key,
                          const MarginSource& margin) {
  std::vector<Boundary> bounds = FindBoundaries(grid, input.results, key, margin);
  if (bounds.empty())
    return "<p>No boundary: the class does not change between neighbouring points.</p>\n";
  std::string h = TableStart(
      "boundaries", {"along", "boundary at", "between", "and", "where", "method", "full ZVS at"},
      bounds.size() > 1);
  for (const Boundary& b : bounds) {
    const GridDim& dim = grid.dims[b.dim];
    std::string unit = ParamUnit(dim.param), where;
    for (size_t d = 0; d < grid.dims.size(); ++d) {
      if (d == b.dim || b.at[d] < 0 || grid.dims[d].values.size() < 2) continue;
      where += (where.empty() ? "" : ", ") + grid.dims[d].param + " = " +
               FormatQuantity(grid.dims[d].values[b.at[d]], ParamUnit(grid.dims[d].param));
    }
    h += "<tr>" + Td(dim.param) + Num(b.value, unit) + Num(b.lower, unit) + Num(b.upper, unit) +
         Td(where) +
         Td(b.interpolated ? "margin zero, interpolated" : "midpoint (no sign change)") +
         Td((b.zvs_above ? "larger " : "smaller ") + dim.param) + "</tr>\n";
  }
  return h + kTableEnd;
}

std::string WorstPoints(const ReportInput& input, const Grid& grid, const EdgeKey& key,
                        const MarginSource& margin, const std::string& unit) {
  std::vector<std::pair<double, size_t>> ranked;
  for (size_t i = 0; i < input.results.size(); ++i) {
    const PointResult& r = input.results[i];
    const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
    if (e && std::isfinite(MarginOf(*e, margin))) ranked.emplace_back(MarginOf(*e, margin), i);
  }
  std::sort(ranked.begin(), ranked.end());
  if (ranked.empty()) return "<p>No point measured this edge.</p>\n";
  std::string h =
      TableStart("worst", {"point", "operating point", "class", "margin", "turn-on voltage"},
                 ranked.size() > 1);
  for (size_t k = 0; k < ranked.size() && k < kWorstPoints; ++k) {
    size_t i = ranked[k].second;
    const EdgeMeasurement* e = FindEdge(input.results[i], key);
    h += "<tr>" + PointCells(input, grid, i) + Td(ZvsClassName(e->zvs)) +
         Num(ranked[k].first, unit) + Num(e->Get("v_turn_on_v"), "V") + "</tr>\n";
  }
  return h + kTableEnd;
}

// Range of a metric over the points that measured it: min, max, count.
struct Range {
  double lo = INFINITY, hi = -INFINITY;
  int n = 0;
};

Range RangeOf(const ReportInput& input, const EdgeKey& key, const std::string& column) {
  Range r;
  if (column.empty()) return r;
  for (const PointResult& p : input.results) {
    const EdgeMeasurement* e = p.status == PointStatus::kOk ? FindEdge(p, key) : nullptr;
    double v = e ? e->Get(column) : NAN;
    if (!std::isfinite(v)) continue;
    r.lo = std::min(r.lo, v);
    r.hi = std::max(r.hi, v);
    ++r.n;
  }
  return r;
}

std::string WindowTable(const ReportBasis& input, const EdgeKey& key) {
  const WindowColumns& w = input.window;
  std::string h =
      TableStart("window", {"quantity", "column", "points", "shortest", "longest"}, false);
  auto row = [&](const std::string& what, const std::string& column) {
    Range r = RangeOf(input, key, column);
    h += "<tr>" + Td(what) + Td(column.empty() ? "(not measured)" : column) +
         Td(std::to_string(r.n)) + Num(r.n ? r.lo : NAN, "s") + Num(r.n ? r.hi : NAN, "s") +
         "</tr>\n";
  };
  row("dead time set", "t_dead_s");
  row("window start: shortest dead time for ZVS", w.start);
  row("window end: longest before ring-back", w.end);
  h += kTableEnd;
  Range start = RangeOf(input, key, w.start), end = RangeOf(input, key, w.end);
  if (input.envelope.Find(key)) {
    h += "<p>Across the envelope: see <a href=\"#recommended-dead-time\">Recommended dead "
         "time</a>.</p>\n";
  } else if (start.n > 0 && end.n > 0) {
    bool fits = start.hi <= end.lo;
    h += "<p>One dead time serves every point " +
         std::string(fits ? "between " + FormatQuantity(start.hi, "s") + " and " +
                                FormatQuantity(end.lo, "s")
                          : "nowhere: the longest start exceeds the shortest end") +
         " (netlists/references.md sec. 10).</p>\n";
  } else if (start.n > 0) {
    h += "<p>The window's end was not reached within the dead time at any point: a dead time of at "
         "least " +
         FormatQuantity(start.hi, "s") + " reaches ZVS wherever it is reached.</p>\n";
  }
  return h;
}

// Per paired prediction (metric, tag) on this edge: the point where the hand
// calculation is furthest off, and at how many points it is beyond its
// tolerance; the largest first. The class flag (zvs_full) is left to the maps.
std::string Disagreements(const ReportInput& input, const Grid& grid, const EdgeKey& key) {
  struct Row {
    const Comparison* c = nullptr;
    double simulated = NAN;
    size_t point = 0;
    int compared = 0, beyond = 0;
  };
  std::vector<Row> rows;
  for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
    const PointResult& r = input.results[i];
    const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
    if (!e) continue;
    for (const Comparison& c : e->comparisons) {
      if (!c.Paired() || c.metric == "zvs_full") continue;
      auto it = std::find_if(rows.begin(), rows.end(), [&](const Row& row) {
        return row.c->metric == c.metric && row.c->tag == c.tag;
      });
      if (it == rows.end()) it = rows.insert(rows.end(), Row{&c, e->Get(c.metric), i, 0, 0});
      if (c.beyond_tolerance) {
        ++it->compared;
        it->beyond += *c.beyond_tolerance ? 1 : 0;
      }
      if (std::isfinite(c.relative_difference) &&
          (!std::isfinite(it->c->relative_difference) ||
           std::fabs(c.relative_difference) > std::fabs(it->c->relative_difference))) {
        it->c = &c;
        it->simulated = e->Get(c.metric);
        it->point = i;
      }
    }
  }
  rows.erase(std::remove_if(rows.begin(), rows.end(),
                            [](const Row& r) { return !std::isfinite(r.c->relative_difference); }),
             rows.end());
  if (rows.empty()) return "<p>No hand-calculation comparison on this edge.</p>\n";
  std::sort(rows.begin(), rows.end(), [](const Row& a, const Row& b) {
    return std::fabs(a.c->relative_difference) > std::fabs(b.c->relative_difference);
  });
  std::string h = TableStart("disagreements",
                             {"metric", "prediction", "point", "operating point", "simulated",
                              "hand calculation", "relative difference", "beyond tolerance"},
                             rows.size() > 1);
  for (size_t k = 0; k < rows.size() && k < kDisagreements; ++k) {
    const Row& r = rows[k];
    std::string unit = MetricUnit(r.c->metric);
    char rel[32];
    std::snprintf(rel, sizeof rel, "%+.1f %%", 100 * r.c->relative_difference);
    std::string beyond =
        r.compared > 0 ? std::to_string(r.beyond) + " of " + std::to_string(r.compared) + " points"
                       : "-";
    h += "<tr>" + Td(r.c->metric) + Td(r.c->tag) + PointCells(input, grid, r.point) +
         Num(r.simulated, unit) + Num(r.c->predicted, unit) + "<td class=\"num\" data-value=\"" +
         Raw(r.c->relative_difference) + "\">" + rel + "</td><td data-value=\"" +
         std::to_string(r.beyond) + "\">" + beyond + "</td></tr>\n";
  }
  return h + kTableEnd;
}

}  // namespace

std::string HtmlEdgeSections(const ReportBasis& input, const std::vector<Plot>& plots,
                             std::vector<bool>* placed) {
  const Grid& grid = input.grid;
  const MarginSource& margin = input.margin;
  std::string unit = margin.column.empty() ? margin.unit : MetricUnit(margin.column);
  placed->assign(plots.size(), false);
  std::string h;
  for (const EdgeKey& key : input.edges) {
    h += "<section class=\"edge\" id=\"edge-" + HtmlEscape(key.cell + "-" + key.edge) +
         "\" data-cell=\"" + HtmlEscape(key.cell) + "\" data-edge=\"" + HtmlEscape(key.edge) +
         "\">\n<h2>" + HtmlEscape(key.Label()) + "</h2>\n";
    h += "<h3>ZVS boundaries</h3>\n" + BoundaryTable(input, grid, key, margin);
    h += EdgeFigures(plots, "map_" + FileSafe(key.cell) + "_" + FileSafe(key.edge), placed);
    std::string tolerance;
    for (const char* stem : {"yield_", "worst_energy_", "worst_timing_"}) {
      tolerance += EdgeFigures(plots, stem + FileSafe(key.cell) + "_" + FileSafe(key.edge), placed);
    }
    if (!tolerance.empty()) {
      h +=
          "<h3>Tolerances (yield and worst case; hover a cell for its interval)</h3>\n" + tolerance;
    }
    h += "<h3>Worst points (lowest margin: " + HtmlEscape(AxisLabel(margin.description, unit)) +
         ")</h3>\n" + WorstPoints(input, grid, key, margin, unit);
    h += "<h3>Dead-time window</h3>\n" + WindowTable(input, key);
    h += EdgeFigures(plots, "deadtime_" + FileSafe(key.cell) + "_" + FileSafe(key.edge), placed);
    h += "<h3>Largest hand-calculation disagreements</h3>\n" + Disagreements(input, grid, key);
    h += "</section>\n";
  }
  return h;
}

std::string HtmlAtAGlance(const ReportBasis& input) {
  const std::vector<EdgeKey>& keys = input.edges;
  if (keys.empty()) return "";
  const Grid& grid = input.grid;
  const MarginSource& margin = input.margin;
  std::string unit = margin.column.empty() ? margin.unit : MetricUnit(margin.column);
  const WindowColumns& w = input.window;
  std::string h =
      "<h2 id=\"at-a-glance\">At a glance</h2>\n" +
      TableStart("glance",
                 {"edge", "full ZVS at", "lowest margin", "where", "dead time set",
                  "ZVS from (longest window start)", "largest hand-calculation difference"},
                 false);
  for (const EdgeKey& key : keys) {
    int full = 0, measured = 0;
    double worst = INFINITY, largest = NAN;
    size_t worst_at = 0;
    std::string largest_what;
    for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
      const PointResult& r = input.results[i];
      const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
      if (!e) continue;
      ++measured;
      full += e->zvs == ZvsClass::kFull ? 1 : 0;
      double m = MarginOf(*e, margin);
      if (std::isfinite(m) && m < worst) {
        worst = m;
        worst_at = i;
      }
      for (const Comparison& c : e->comparisons) {
        if (!c.Paired() || c.metric == "zvs_full" || !std::isfinite(c.relative_difference))
          continue;
        if (std::isnan(largest) || std::fabs(c.relative_difference) > std::fabs(largest)) {
          largest = c.relative_difference;
          largest_what = c.Name();
        }
      }
    }
    Range dead = RangeOf(input, key, "t_dead_s"), start = RangeOf(input, key, w.start);
    std::string dead_text =
        dead.n == 0          ? "-"
        : dead.lo == dead.hi ? FormatQuantity(dead.lo, "s")
                             : FormatQuantity(dead.lo, "s") + " to " + FormatQuantity(dead.hi, "s");
    std::string diff = "-";
    if (std::isfinite(largest)) {
      char rel[32];
      std::snprintf(rel, sizeof rel, "%+.1f %%", 100 * largest);
      diff = std::string(rel) + " (" + largest_what + ")";
    }
    std::string anchor = "#edge-" + key.cell + "-" + key.edge;
    h += "<tr><td><a href=\"" + HtmlEscape(anchor) + "\">" + HtmlEscape(key.Label()) + "</a></td>" +
         Td(std::to_string(full) + " of " + std::to_string(measured) + " points") +
         Num(std::isfinite(worst) ? worst : NAN, unit) +
         (std::isfinite(worst) ? Td(OperatingPointText(grid, worst_at, input.points[worst_at]))
                               : Td("-")) +
         Td(dead_text) + Num(start.n ? start.hi : NAN, "s") + Td(diff) + "</tr>\n";
  }
  return h + kTableEnd;
}

std::string HtmlFailedPoints(const ReportBasis& input) {
  const Grid& grid = input.grid;
  std::string rows;
  int n = 0;
  for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
    const PointResult& r = input.results[i];
    if (r.status == PointStatus::kOk) continue;
    ++n;
    std::string settle =
        r.settle.method == SettleMethod::kNotAttempted ? "-" : SettleMethodName(r.settle.method);
    if (r.settle.periods > 0) settle += ", " + PeriodCount(r.settle.periods) + " periods";
    rows += "<tr>" + PointCells(input, grid, i) + Td(PointStatusName(r.status)) + Td(r.reason) +
            Td(settle) + Td(r.solver_aid.empty() ? "-" : r.solver_aid) + "</tr>\n";
  }
  std::string h = "<h2 id=\"failed-points\">Failed points</h2>\n";
  if (rows.empty()) return h + "<p>Every point ran.</p>\n";
  return h +
         TableStart(
             "failed",
             {"point", "operating point", "status", "reason", "settling tried", "solver aid"},
             n > 1) +
         rows + kTableEnd;
}

std::string HtmlSolverAids(const ReportInput& input) {
  std::vector<std::pair<std::string, int>> counts = CountSolverAids(input.results);
  std::string h = "<h2 id=\"solver-aids\">Solver aids</h2>\n<p>" +
                  HtmlEscape(Capitalised(DescribeSolverAidUse(input.results))) +
                  ". A point that needed one converged only with the aid's change to the "
                  "simulation; compare it with its neighbours.</p>\n";
  if (counts.empty()) return h;
  h += TableStart("solver-aids", {"solver aid", "points", "which"}, counts.size() > 1);
  for (const auto& [name, count] : counts) {
    std::string which;
    for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
      if (input.results[i].solver_aid != name) continue;
      which += (which.empty() ? "" : ", ") + std::to_string(input.points[i].index);
    }
    h += "<tr>" + Td(name) + "<td class=\"num\" data-value=\"" + std::to_string(count) + "\">" +
         std::to_string(count) + "</td>" + Td(which) + "</tr>\n";
  }
  return h + kTableEnd;
}

std::string HtmlSettings(const ReportInput& input) {
  const SweepSpec& spec = input.spec;
  std::string h = "<h2 id=\"settings\">Fixed parameters and settings</h2>\n" +
                  TableStart("settings", {"name", "value", "from"}, false);
  for (const FixedValue& f : spec.fixed) {
    h += "<tr>" + Td(f.param) + Num(f.value, ParamUnit(f.param)) + Td("sweep file, fixed") +
         "</tr>\n";
  }
  for (const DerivedValue& d : spec.derived) {
    h += "<tr>" + Td(d.param) + Td("{" + d.expression + "}") + Td("sweep file, derived per point") +
         "</tr>\n";
  }
  // The dead times each cell uses: the sweep's value, else the template's default.
  for (const CellSpec& c : input.tmpl.cells) {
    for (const auto& [edge, param] :
         {std::make_pair("high_on", c.high_dead), std::make_pair("low_on", c.low_dead)}) {
      if (param.empty()) continue;
      double v = NAN;
      bool swept = !input.points.empty() && PointValue(input.points.front(), param, &v);
      std::string name = "dead time " + c.name + "." + edge + " (" + param + ")";
      if (swept) {
        bool varies = false;
        for (const Point& p : input.points) {
          double w;
          varies = varies || (PointValue(p, param, &w) && w != v);
        }
        h += "<tr>" + Td(name) + (varies ? Td("varies per point") : Num(v, "s")) +
             Td("sweep file") + "</tr>\n";
      } else if (const ParamDecl* decl = input.tmpl.FindParam(param)) {
        std::optional<double> number = ParseSpiceNumber(decl->expression);
        h += "<tr>" + Td(name) + (number ? Num(*number, "s") : Td("{" + decl->expression + "}")) +
             Td("template default") + "</tr>\n";
      }
    }
  }
  const SimulationSettings& s = spec.simulation;
  h += "<tr>" + Td("settling") +
       Td(std::string(SettleMethodName(s.settle_method)) + ", tolerance " +
          FormatQuantity(s.settle_tolerance, "") + ", at most " + std::to_string(s.max_periods) +
          " periods") +
       Td("<simulation>") + "</tr>\n";
  const double lead = MeasureLead(spec, input.tmpl);
  const char* lead_from = !std::isnan(s.measure_lead)               ? "<simulation>"
                          : lead == input.tmpl.measure_lead ? "template *@ measure"
                                                                    : "default";
  h += "<tr>" + Td("lead before the measured period") + Td(PeriodCount(lead) + " periods") +
       Td(lead_from) + "</tr>\n";
  h += "<tr>" + Td("max-step") + (s.max_step_s > 0 ? Num(s.max_step_s, "s") : Td("derived")) +
       Td("<simulation>") + "</tr>\n";
  h += "<tr>" + Td("reltol") + Num(s.reltol, "") + Td("<simulation>") + "</tr>\n";
  h += "<tr>" + Td("ZVS criterion") + Td(spec.zvs.Describe()) + Td("<zvs>") + "</tr>\n";
  return h + kTableEnd;
}

std::string HtmlNumberCell(double value, const std::string& unit) { return Num(value, unit); }

std::string HtmlPointCells(const ReportInput& input, const Grid& grid, size_t i) {
  return PointCells(input, grid, i);
}

}  // namespace zvsmap
