#include "report/html_index.h"

#include "report/html_tables.h"

namespace zvsmap {

namespace {

// Sorts every table.sortable by a clicked (or Enter/Space) header: by the
// cells' data-value as a number when present, else their text (digits by
// value); a click cycles ascending, descending and the report's own order.
// Empty values ("n/a", "-") sort last either way. Inline: the page stays one
// offline file.
constexpr const char* kSortScript = R"(<script>
(function () {
  function key(row, c) {
    var td = row.cells[c];
    if (!td) return null;
    var v = td.getAttribute("data-value");
    if (v !== null) return v === "" || isNaN(Number(v)) ? null : Number(v);
    var t = td.textContent.trim();
    return t === "" || t === "-" || t === "n/a" ? null : t;
  }
  function compare(a, b) {
    if (typeof a === "number" && typeof b === "number") return a - b;
    return String(a).localeCompare(String(b), undefined, {numeric: true});
  }
  function order(row) { return Number(row.getAttribute("data-order")); }
  function sortBy(table, c) {
    var heads = table.tHead.rows[0].cells, body = table.tBodies[0];
    var state = heads[c].getAttribute("aria-sort");
    var next = state === "ascending" ? "descending" : state === "descending" ? "none" : "ascending";
    var sign = next === "descending" ? -1 : 1;
    var rows = Array.prototype.slice.call(body.rows);
    rows.sort(function (x, y) {
      if (next !== "none") {
        var a = key(x, c), b = key(y, c);
        if (a === null || b === null) {
          if (a !== b) return a === null ? 1 : -1;
        } else {
          var r = sign * compare(a, b);
          if (r) return r;
        }
      }
      return order(x) - order(y);
    });
    for (var k = 0; k < heads.length; k++) heads[k].removeAttribute("aria-sort");
    if (next !== "none") heads[c].setAttribute("aria-sort", next);
    for (k = 0; k < rows.length; k++) body.appendChild(rows[k]);
  }
  var tables = document.querySelectorAll("table.sortable");
  Array.prototype.forEach.call(tables, function (table) {
    if (!table.tHead || !table.tBodies.length) return;
    Array.prototype.forEach.call(table.tBodies[0].rows, function (row, i) {
      row.setAttribute("data-order", i);
    });
    Array.prototype.forEach.call(table.tHead.rows[0].cells, function (th, c) {
      th.tabIndex = 0;
      th.title = "Sort by this column; again to reverse, a third time for the report's order";
      th.addEventListener("click", function () { sortBy(table, c); });
      th.addEventListener("keydown", function (e) {
        if (e.key === "Enter" || e.key === " ") { e.preventDefault(); sortBy(table, c); }
      });
    });
  });
})();
</script>
)";

}  // namespace

std::string HtmlEscape(const std::string& text) {
  std::string out;
  for (char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

std::string BuildHtmlIndex(const ReportBasis& input,
                           const std::vector<RequirementVerdict>& verdicts,
                           const std::vector<Plot>& plots, const std::vector<std::string>& files) {
  int ran = 0, not_run = 0, req_failed = 0;
  for (const PointResult& r : input.results) (r.status == PointStatus::kOk ? ran : not_run)++;
  for (const RequirementVerdict& v : verdicts) req_failed += v.held ? 0 : 1;

  std::string verdict_class = "pass", verdict;
  if (req_failed > 0) {
    verdict_class = "fail";
    verdict = std::to_string(req_failed) + " of " + std::to_string(verdicts.size()) +
              " requirements did not hold";
  } else if (verdicts.empty()) {
    verdict = "No requirements declared";
  } else {
    verdict = "Every requirement held (" + std::to_string(verdicts.size()) + ")";
  }
  if (not_run > 0) {
    if (verdict_class == "pass") verdict_class = "warn";
    verdict += "; " + std::to_string(not_run) + " points failed or did not settle";
  } else {
    verdict += "; every point ran";
  }

  std::string h;
  h += "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
  h += "<title>zvsmap: " + HtmlEscape(input.spec.path) + "</title>\n";
  h += R"(<style>
body { font-family: sans-serif; margin: 2em auto; max-width: 1100px; color: #222; }
table { border-collapse: collapse; margin: 1em 0; }
th, td { border: 1px solid #bbb; padding: 4px 8px; text-align: left; vertical-align: top; }
th { background: #eee; }
.verdict { padding: 0.6em 1em; font-size: 1.2em; font-weight: bold; border-radius: 4px; }
.pass { background: #d8f0e4; } .warn { background: #fbe9c8; } .fail { background: #f6d3c4; }
.held { color: #006644; font-weight: bold; } .broken { color: #a33000; font-weight: bold; }
.caution { border-left: 6px solid #D55E00; background: #fff4ec; padding: 0.5em 1em; }
figure { margin: 1.5em 0; } img { max-width: 100%; border: 1px solid #ddd; }
pre { margin: 0; white-space: pre-wrap; font-size: 0.85em; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
section.edge { border-top: 2px solid #ccc; margin-top: 2em; }
.slot { color: #555; font-style: italic; }
table.sortable th { cursor: pointer; user-select: none; }
table.sortable th::after { content: " \2195"; color: #999; }
table.sortable th[aria-sort="ascending"]::after { content: " \25B2"; color: #222; }
table.sortable th[aria-sort="descending"]::after { content: " \25BC"; color: #222; }
p.hint { color: #555; font-size: 0.9em; }
</style>
</head>
<body>
)";
  h += "<h1>zvsmap report</h1>\n<table>\n";
  h += "<tr><th>Sweep file</th><td>" + HtmlEscape(input.spec.path) + "</td></tr>\n";
  h += "<tr><th>Template</th><td>" + HtmlEscape(input.spec.template_path) + "</td></tr>\n";
  h += "<tr><th>Points</th><td>" + std::to_string(input.points.size()) + " (" +
       std::to_string(ran) + " ran, " + std::to_string(not_run) +
       " failed or unsettled)</td></tr>\n";
  h += "<tr><th>ZVS criterion</th><td>" + HtmlEscape(input.spec.zvs.Describe()) + "</td></tr>\n";
  h += "<tr><th>zvsmap version</th><td>" ZVSMAP_VERSION "</td></tr>\n</table>\n";
  h +=
      "<p class=\"verdict " + verdict_class + "\" id=\"verdict\">" + HtmlEscape(verdict) + "</p>\n";

  h += HtmlAtAGlance(input);
  h += "<h2>Requirements</h2>\n";
  if (verdicts.empty()) {
    h += "<p>The sweep file declares no requirements.</p>\n";
  } else {
    h += "<table id=\"requirements\">\n<tr><th>Requirement</th><th>Result</th><th>Checked</th>"
         "<th>Details</th></tr>\n";
    for (const RequirementVerdict& v : verdicts) {
      h += "<tr><td>" + HtmlEscape(v.title) + "</td><td class=\"" +
           (v.held ? "held\">held" : "broken\">failed") + "</td><td>" + std::to_string(v.checked) +
           " of " + std::to_string(v.covered) + "</td><td>" + HtmlEscape(v.message);
      if (!v.details.empty()) {
        h += "<pre>";
        for (const std::string& d : v.details) h += HtmlEscape(d) + "\n";
        h += "</pre>";
      }
      h += "</td></tr>\n";
    }
    h += "</table>\n";
  }

  std::vector<bool> placed;
  std::string edges = HtmlEdgeSections(input, plots, &placed);
  if (!edges.empty()) {
    h += "<p class=\"hint\">Click a column header to sort its table; click again to reverse, a "
         "third time for the report's own order.</p>\n";
  }
  h += edges;
  h += HtmlRecommendedDeadTime(input);
  h += HtmlFailedPoints(input);
  h += HtmlSolverAids(input);
  h += HtmlSettings(input);

  h += "<h2>Plots</h2>\n";
  if (plots.empty()) h += "<p>No plots: the sweep has no swept axis or no measured edge.</p>\n";
  bool any_left = false;
  for (size_t k = 0; k < plots.size(); ++k) {
    if (placed[k]) continue;
    const Plot& p = plots[k];
    any_left = true;
    h += "<figure><img src=\"" + HtmlEscape(p.file) + "\" alt=\"" + HtmlEscape(p.caption) +
         "\"><figcaption>" + HtmlEscape(p.caption) + "</figcaption></figure>\n";
  }
  if (!plots.empty() && !any_left) h += "<p>Every plot is shown in its edge's section above.</p>\n";

  h += "<h2>Files</h2>\n<ul>\n";
  for (const std::string& f : files) {
    h += "<li><a href=\"" + HtmlEscape(f) + "\">" + HtmlEscape(f) + "</a></li>\n";
  }
  h += "</ul>\n";

  h += R"(<h2>Cautions</h2>
<div class="caution">
<p><strong>High voltage and stored energy.</strong> Power converters work at hazardous voltages and store dangerous energy in capacitors and
inductors, which can stay charged after the supply is removed. Only qualified people should build,
test or service them.</p>
<p>These results come from simulated models with idealised parts and layouts. They support, and
never replace, the judgement of a qualified engineer, measurements on real hardware, and the
codes, standards and licensed practice that apply where the equipment is built and used.</p>
</div>
)";
  h += kSortScript;
  h += "</body>\n</html>\n";
  return h;
}

}  // namespace zvsmap
