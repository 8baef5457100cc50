// index.html's "Recommended dead time": the envelope of report/dead_time_envelope
// in words and tables (declared in html_tables.h).
#include <cmath>

#include "report/deadtime_schedule.h"
#include "report/html_index.h"
#include "report/html_tables.h"
#include "report/units.h"

namespace zvsmap {

namespace {

std::string Td(const std::string& text) { return "<td>" + HtmlEscape(text) + "</td>"; }

std::string Q(double v) { return HtmlEscape(FormatQuantity(v, "s")); }

std::string Id(const EdgeKey& key) { return "recommended-" + key.cell + "-" + key.edge; }

std::string ChoiceText(const WindowIntersection& w) {
  if (w.choice == DeadTimeChoice::kLossOptimal) {
    return "the latest loss-optimal dead time of the points (no ring-back before the probe's "
           "bound, so a longer dead time only adds body-diode conduction)";
  }
  return "the middle of the intersection (the largest timing margin on the nearer side)";
}

// Which end binds, its value, the margin to it and the point that sets it.
std::string BindingTable(const ReportBasis& input, const WindowIntersection& w) {
  std::string h =
      "<table class=\"binding\">\n<thead><tr><th>side</th><th>end of the intersection</th>"
      "<th>timing margin</th><th>point</th><th>operating point</th></tr></thead>\n<tbody>\n";
  h += "<tr>" + Td("early: shortest dead time that reaches ZVS everywhere") +
       HtmlNumberCell(w.lo, "s") + HtmlNumberCell(w.margin_early, "s") +
       HtmlPointCells(input, input.grid, w.lo_point) + "</tr>\n";
  h += "<tr>" +
       Td(w.hi_at_bound ? "late: where the probe stopped (no ring-back before it; the margin is "
                          "at least this)"
                        : "late: longest dead time before ring-back everywhere") +
       HtmlNumberCell(w.hi, "s") + HtmlNumberCell(w.margin_late, "s") +
       HtmlPointCells(input, input.grid, w.hi_point) + "</tr>\n";
  return h + "</tbody></table>\n";
}

std::string ConflictTable(const ReportBasis& input, const EdgeEnvelope& env) {
  std::string h =
      "<table class=\"conflicts sortable\">\n<thead><tr><th>point</th><th>operating point</th>"
      "<th>its shortest dead time</th><th>point</th><th>operating point</th>"
      "<th>its longest dead time</th></tr></thead>\n<tbody>\n";
  for (const WindowConflict& c : env.conflicts) {
    h += "<tr>" + HtmlPointCells(input, input.grid, c.early) + HtmlNumberCell(c.t_min, "s") +
         HtmlPointCells(input, input.grid, c.late) + HtmlNumberCell(c.t_max, "s") + "</tr>\n";
  }
  h += "</tbody></table>\n";
  if (env.conflicts_total > static_cast<int>(env.conflicts.size())) {
    h += "<p>… and " + std::to_string(env.conflicts_total - env.conflicts.size()) +
         " more pairs (the widest overlaps are listed).</p>\n";
  }
  return h;
}

std::string ScheduleTable(const ReportBasis& input, const EdgeEnvelope& env) {
  std::string h = "<table class=\"schedule\">\n<thead><tr><th>bin</th>";
  for (size_t d : env.schedule_dims) h += "<th>" + HtmlEscape(input.grid.dims[d].param) + "</th>";
  h += "<th>points</th><th>dead time</th><th>window of the bin</th><th>margin early</th>"
       "<th>margin late</th></tr></thead>\n<tbody>\n";
  for (size_t b = 0; b < env.schedule.size(); ++b) {
    const ScheduleBin& bin = env.schedule[b];
    const WindowIntersection& w = bin.window;
    h += "<tr><td class=\"num\">" + std::to_string(b) + "</td>";
    for (const ScheduleBin::Span& s : bin.spans) {
      std::string text = DescribeSpan(input.grid, s);
      h += Td(text.substr(input.grid.dims[s.dim].param.size() + 1));
    }
    std::string points = std::to_string(bin.points);
    if (bin.impossible > 0) points += " (" + std::to_string(bin.impossible) + " impossible)";
    h += Td(points);
    if (w.Holds()) {
      h += HtmlNumberCell(w.recommended, "s") + Td(FormatQuantity(w.lo, "s") + " \u2013 " +
                                                   FormatQuantity(w.hi, "s")) +
           HtmlNumberCell(w.margin_early, "s") + HtmlNumberCell(w.margin_late, "s");
    } else {
      std::string why = w.windows == 0 ? "no window" : "no single value";
      h += "<td class=\"broken\">" + why + "</td>" +
           Td(w.windows == 0 ? "-"
                             : "start " + FormatQuantity(w.lo, "s") + " > end " +
                                   FormatQuantity(w.hi, "s")) +
           "<td>-</td><td>-</td>";
    }
    h += "</tr>\n";
  }
  return h + "</tbody></table>\n";
}

std::string ImpossibleTable(const ReportBasis& input, const EdgeEnvelope& env) {
  std::string h = "<p>" + std::to_string(env.impossible.size()) +
                  " point(s) where ZVS is impossible at any dead time (the node never comes within "
                  "the criterion) are left out of the intersection; the best instant the probe "
                  "saw:</p>\n<table class=\"impossible sortable\">\n<thead><tr><th>point</th>"
                  "<th>operating point</th><th>valley at</th><th>v_ds there</th></tr></thead>\n"
                  "<tbody>\n";
  for (const ImpossiblePoint& p : env.impossible) {
    h += "<tr>" + HtmlPointCells(input, input.grid, p.point) + HtmlNumberCell(p.t_valley, "s") +
         HtmlNumberCell(p.v_valley, "V") + "</tr>\n";
  }
  return h + "</tbody></table>\n";
}

std::string EdgeParagraphs(const ReportBasis& input, const EdgeEnvelope& env) {
  const WindowIntersection& w = env.all;
  std::string h = "<h3>" + HtmlEscape(env.key.Label()) + "</h3>\n<p id=\"" + HtmlEscape(Id(env.key)) +
                  "\">";
  if (w.Holds()) {
    h += "Set <strong>" + Q(w.recommended) + "</strong>: it lies inside the dead-time window at all " +
         std::to_string(w.windows) + " points with a window (their intersection is " + Q(w.lo) +
         " \u2013 " + Q(w.hi) + "), with a timing margin of " + Q(w.margin_early) +
         " early and " + (w.hi_at_bound ? "at least " : "") + Q(w.margin_late) +
         " late. Chosen as " + HtmlEscape(ChoiceText(w)) + ".</p>\n";
    h += BindingTable(input, w);
  } else if (w.windows == 0) {
    h += "No point has a dead-time window for this edge (" + std::to_string(env.measured) +
         " measured, " + std::to_string(env.impossible.size()) + " with ZVS impossible, " +
         std::to_string(env.unprobed) + " without a probe window): no dead time to recommend.</p>\n";
  } else {
    h += "<strong>No single dead time</strong> serves every point: the latest window start, " +
         Q(w.lo) + " (point " + std::to_string(input.points[w.lo_point].index) +
         "), comes after the earliest window end, " + Q(w.hi) + " (point " +
         std::to_string(input.points[w.hi_point].index) +
         "). These pairs empty the intersection (one point's shortest dead time exceeds the "
         "other's longest):</p>\n";
    h += ConflictTable(input, env);
    h += "<p>A schedule a controller can hold as a table: each bin of the swept parameters with "
         "its own intersection and dead time (also in <a href=\"deadtime_schedule.csv\">"
         "deadtime_schedule.csv</a>).</p>\n";
    h += ScheduleTable(input, env);
  }
  if (!env.impossible.empty()) h += ImpossibleTable(input, env);
  if (env.off_grid > 0) {
    h += "<p>" + std::to_string(env.off_grid) +
         " point(s) off the grid are in the intersection but in no bin of the schedule.</p>\n";
  }
  return h;
}

}  // namespace

std::string HtmlRecommendedDeadTime(const ReportBasis& input) {
  std::string h = "<h2 id=\"recommended-dead-time\">Recommended dead time</h2>\n";
  if (!input.envelope.available) {
    return h + "<p class=\"slot\">The results carry no probe window (probe_t_min_s, "
               "probe_t_max_s), so no dead time across the envelope is recommended; the window "
               "per edge, as measured at the dead time set, is above.</p>\n";
  }
  h += "<p>Per edge, the intersection of every point's dead-time window (the probe run from the "
       "settled state: shortest dead time that meets the ZVS criterion to the longest before "
       "ring-back; netlists/references.md sec. 10).</p>\n";
  for (const EdgeEnvelope& env : input.envelope.edges) h += EdgeParagraphs(input, env);
  return h;
}

}  // namespace zvsmap
