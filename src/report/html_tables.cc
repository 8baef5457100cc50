#include "report/html_tables.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <optional>

#include "core/spice_number.h"
#include "core/text.h"
#include "report/html_index.h"
#include "report/units.h"
#include "report/zvs_boundary.h"

namespace zvsmap {

namespace {

constexpr size_t kWorstPoints = 5;
constexpr size_t kDisagreements = 8;

std::string Raw(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.9g", v);
  return buf;
}

// A table cell holding a number: text with units, raw value for machines.
std::string Num(double v, const std::string& unit) {
  if (std::isnan(v)) return "<td class=\"num\">n/a</td>";
  return "<td class=\"num\" data-value=\"" + Raw(v) + "\">" + HtmlEscape(FormatQuantity(v, unit)) +
         "</td>";
}

std::string Td(const std::string& text) { return "<td>" + HtmlEscape(text) + "</td>"; }

std::string Header(std::initializer_list<const char*> names) {
  std::string h = "<tr>";
  for (const char* n : names) h += std::string("<th>") + n + "</th>";
  return h + "</tr>\n";
}

// ---- Accessors: the only places that know how results name things. ----

// One pairing of a simulated metric with a prediction.
struct Comparison {
  std::string metric;  // the simulated column
  std::string tag;     // "pred" or a <predict> name
  double simulated = NAN, predicted = NAN, rel_diff = NAN;
};

// The comparisons carried by one measured edge (columns M__TAG__rel_diff).
std::vector<Comparison> ComparisonsOf(const EdgeMeasurement& e) {
  std::vector<Comparison> out;
  const std::string kRel = "__rel_diff";
  for (const Metric& m : e.metrics) {
    if (m.column.size() <= kRel.size() ||
        m.column.compare(m.column.size() - kRel.size(), kRel.size(), kRel) != 0) {
      continue;
    }
    std::string pair = m.column.substr(0, m.column.size() - kRel.size());
    size_t split = pair.find("__");
    if (split == std::string::npos) continue;
    Comparison c;
    c.metric = pair.substr(0, split);
    c.tag = pair.substr(split + 2);
    c.predicted = e.Get(pair);
    c.simulated = c.metric == "zvs_full" ? (e.zvs == ZvsClass::kFull ? 1.0 : 0.0) : e.Get(c.metric);
    c.rel_diff = m.value;
    out.push_back(c);
  }
  return out;
}

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

// ---- Edge sections ----

std::string BoundaryTable(const ReportInput& input, const Grid& grid, const EdgeKey& key,
                          const MarginSource& margin) {
  std::vector<Boundary> bounds = FindBoundaries(grid, input.results, key, margin);
  if (bounds.empty())
    return "<p>No boundary: the class does not change between neighbouring points.</p>\n";
  std::string h = "<table class=\"boundaries\">\n" +
                  Header({"along", "boundary at", "between", "and", "where", "method", "full ZVS"});
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
         Td(b.zvs_above ? "above" : "below") + "</tr>\n";
  }
  return h + "</table>\n";
}

std::string WorstPoints(const ReportInput& input, const EdgeKey& key, const MarginSource& margin,
                        const std::string& unit) {
  std::vector<std::pair<double, size_t>> ranked;
  for (size_t i = 0; i < input.results.size(); ++i) {
    const PointResult& r = input.results[i];
    const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
    if (e && std::isfinite(MarginOf(*e, margin))) ranked.emplace_back(MarginOf(*e, margin), i);
  }
  std::sort(ranked.begin(), ranked.end());
  if (ranked.empty()) return "<p>No point measured this edge.</p>\n";
  std::string h = "<table class=\"worst\">\n" +
                  Header({"point", "operating point", "class", "margin", "v_turn_on"});
  for (size_t k = 0; k < ranked.size() && k < kWorstPoints; ++k) {
    size_t i = ranked[k].second;
    const EdgeMeasurement* e = FindEdge(input.results[i], key);
    h += "<tr>" + Td(std::to_string(input.points[i].index)) + Td(input.points[i].Describe()) +
         Td(ZvsClassName(e->zvs)) + Num(ranked[k].first, unit) + Num(e->Get("v_turn_on_v"), "V") +
         "</tr>\n";
  }
  return h + "</table>\n";
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
  std::string h = "<table class=\"window\">\n" +
                  Header({"quantity", "column", "points", "shortest", "longest"});
  auto row = [&](const std::string& what, const std::string& column) {
    Range r = RangeOf(input, key, column);
    h += "<tr>" + Td(what) + Td(column.empty() ? "(not measured)" : column) +
         Td(std::to_string(r.n)) + Num(r.n ? r.lo : NAN, "s") + Num(r.n ? r.hi : NAN, "s") +
         "</tr>\n";
  };
  row("dead time set", "t_dead_s");
  row("window start: shortest dead time for ZVS", w.start);
  row("window end: longest before ring-back", w.end);
  h += "</table>\n";
  Range start = RangeOf(input, key, w.start), end = RangeOf(input, key, w.end);
  if (start.n > 0 && end.n > 0) {
    bool fits = start.hi <= end.lo;
    h += "<p>One dead time serves every point " +
         std::string(fits ? "between " + FormatQuantity(start.hi, "s") + " and " +
                                FormatQuantity(end.lo, "s")
                          : "nowhere: the longest start exceeds the shortest end") +
         " (docs/references.md sec. 10).</p>\n";
  } else if (start.n > 0) {
    h += "<p>The window's end was not reached within the dead time at any point: a dead time of at "
         "least " +
         FormatQuantity(start.hi, "s") + " reaches ZVS wherever it is reached.</p>\n";
  }
  return h;
}

std::string Disagreements(const ReportInput& input, const EdgeKey& key) {
  struct Row {
    Comparison c;
    size_t point;
  };
  std::vector<Row> rows;
  for (size_t i = 0; i < input.results.size(); ++i) {
    const PointResult& r = input.results[i];
    const EdgeMeasurement* e = r.status == PointStatus::kOk ? FindEdge(r, key) : nullptr;
    if (!e) continue;
    for (const Comparison& c : ComparisonsOf(*e)) {
      if (std::isfinite(c.rel_diff) && c.metric != "zvs_full") rows.push_back({c, i});
    }
  }
  if (rows.empty()) return "<p>No hand-calculation comparison on this edge.</p>\n";
  std::sort(rows.begin(), rows.end(), [](const Row& a, const Row& b) {
    return std::fabs(a.c.rel_diff) > std::fabs(b.c.rel_diff);
  });
  std::string h = "<table class=\"disagreements\">\n" +
                  Header({"metric", "prediction", "point", "operating point", "simulated",
                          "hand calculation", "relative difference"});
  for (size_t k = 0; k < rows.size() && k < kDisagreements; ++k) {
    const Row& r = rows[k];
    std::string unit = MetricUnit(r.c.metric);
    char rel[32];
    std::snprintf(rel, sizeof rel, "%+.1f %%", 100 * r.c.rel_diff);
    h += "<tr>" + Td(r.c.metric) + Td(r.c.tag) + Td(std::to_string(input.points[r.point].index)) +
         Td(input.points[r.point].Describe()) + Num(r.c.simulated, unit) +
         Num(r.c.predicted, unit) + "<td class=\"num\" data-value=\"" + Raw(r.c.rel_diff) + "\">" +
         rel + "</td></tr>\n";
  }
  return h + "</table>\n";
}

}  // namespace

std::string HtmlEdgeSections(const ReportBasis& input) {
  const Grid& grid = input.grid;
  const MarginSource& margin = input.margin;
  std::string unit = margin.column.empty() ? margin.unit : MetricUnit(margin.column);
  std::string h;
  for (const EdgeKey& key : input.edges) {
    h += "<section class=\"edge\" id=\"edge-" + HtmlEscape(key.cell + "-" + key.edge) +
         "\" data-cell=\"" + HtmlEscape(key.cell) + "\" data-edge=\"" + HtmlEscape(key.edge) +
         "\">\n<h2>" + HtmlEscape(key.Label()) + "</h2>\n";
    h += "<h3>ZVS boundaries</h3>\n" + BoundaryTable(input, grid, key, margin);
    h += "<h3>Worst points (lowest margin: " + HtmlEscape(AxisLabel(margin.description, unit)) +
         ")</h3>\n" + WorstPoints(input, key, margin, unit);
    h += "<h3>Dead-time window</h3>\n" + WindowTable(input, key);
    h += "<h3>Largest hand-calculation disagreements</h3>\n" + Disagreements(input, key);
    h += "</section>\n";
  }
  return h;
}

std::string HtmlFailedPoints(const ReportInput& input) {
  std::string rows;
  for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
    const PointResult& r = input.results[i];
    if (r.status == PointStatus::kOk) continue;
    std::string aid = r.settle.method == SettleMethod::kNotAttempted
                          ? "-"
                          : SettleMethodName(r.settle.method);
    if (r.settle.periods > 0) aid += ", " + std::to_string(r.settle.periods) + " periods";
    rows += "<tr>" + Td(std::to_string(input.points[i].index)) + Td(input.points[i].Describe()) +
            Td(PointStatusName(r.status)) + Td(r.reason) + Td(aid) + "</tr>\n";
  }
  std::string h = "<h2 id=\"failed-points\">Failed points</h2>\n";
  if (rows.empty()) return h + "<p>Every point ran.</p>\n";
  return h + "<table class=\"failed\">\n" +
         Header({"point", "operating point", "status", "reason", "settling tried"}) + rows +
         "</table>\n";
}

std::string HtmlSettings(const ReportInput& input) {
  const SweepSpec& spec = input.spec;
  std::string h =
      "<h2 id=\"settings\">Fixed parameters and settings</h2>\n<table class=\"settings\">\n" +
      Header({"name", "value", "from"});
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
       Td(s.settle_method + ", tolerance " + FormatQuantity(s.settle_tolerance, "") + ", at most " +
          std::to_string(s.max_periods) + " periods") +
       Td("<simulation>") + "</tr>\n";
  h += "<tr>" + Td("measured periods") + Td(std::to_string(s.measure_periods)) +
       Td("<simulation>") + "</tr>\n";
  h += "<tr>" + Td("max-step") + (s.max_step_s > 0 ? Num(s.max_step_s, "s") : Td("derived")) +
       Td("<simulation>") + "</tr>\n";
  h += "<tr>" + Td("reltol") + Num(s.reltol, "") + Td("<simulation>") + "</tr>\n";
  h += "<tr>" + Td("ZVS criterion") + Td(spec.zvs.Describe()) + Td("<zvs>") + "</tr>\n";
  return h + "</table>\n";
}

std::string HtmlRecommendedDeadTime(const ReportInput& input) {
  (void)input;
  return "<h2 id=\"recommended-dead-time\">Recommended dead time</h2>\n"
         "<p class=\"slot\">Not computed by this version: the window per edge is above; a "
         "recommended dead time or schedule over the envelope goes here.</p>\n";
}

}  // namespace zvsmap
