// Synthetic sweeps and results for the report tests (no ngspice): a grid of
// points whose ZVS margin is a known function of the swept values.
#pragma once

#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "netlist/template.h"
#include "report/report_set.h"
#include "sweep/requirement_parser.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {
namespace testing_report {

constexpr double kRail = 48;
constexpr double kLimit = 4.8;  // 10 % of the rail

/// One edge whose voltage margin (limit - v_turn_on) is `margin_v`, classed as
/// the commutation analysis does: full within the limit, partial below half
/// the rail, hard above.
inline EdgeMeasurement MakeEdge(const std::string& cell, const std::string& edge, double margin_v,
                                std::vector<Metric> extra = {}) {
  EdgeMeasurement e;
  e.cell = cell;
  e.edge = edge;
  double v_on = kLimit - margin_v;
  e.zvs = v_on <= kLimit     ? ZvsClass::kFull
          : v_on < kRail / 2 ? ZvsClass::kPartial
                             : ZvsClass::kHard;
  e.metrics = {{"rail_v", kRail},     {"i_commutated_a", -2},         {"t_dead_s", 40e-9},
               {"v_turn_on_v", v_on}, {"v_residual_limit_v", kLimit}, {"t_transition_s", 20e-9}};
  for (const Metric& m : extra) e.metrics.push_back(m);
  return e;
}

/// A synthetic sweep over crossed axes; `margin(values)` gives the voltage
/// margin of edge "leg.high_on" at each point; "leg.low_on" always has +4 V.
struct Synthetic {
  SweepSpec spec;
  Template tmpl;
  std::vector<Point> points;
  std::vector<PointResult> results;

  /// The reports' input with grid, edges, margin and window derived, as
  /// WriteReports hands it to each writer.
  ReportBasis Input() const { return ReportBasis(ReportInput{spec, tmpl, points, results}); }
};

inline Synthetic MakeGrid(
    const std::vector<std::pair<std::string, std::vector<double>>>& axes,
    const std::function<double(const std::vector<double>&)>& margin,
    const std::function<std::vector<Metric>(const std::vector<double>&)>& extra = nullptr) {
  Synthetic s;
  s.spec.path = "sweeps/synthetic.xml";
  s.spec.template_path = "netlists/synthetic.cir";
  for (const auto& [name, values] : axes) {
    AxisGroup g;
    AxisSpec a;
    a.param = name;
    a.values = values;
    g.axes.push_back(a);
    s.spec.groups.push_back(g);
  }
  std::vector<size_t> pos(axes.size(), 0);
  size_t total = 1;
  for (const auto& a : axes) total *= a.second.size();
  for (size_t n = 0; n < total; ++n) {
    // First axis slowest, as ExpandSweep orders points.
    size_t rest = n;
    std::vector<double> values(axes.size());
    for (size_t d = axes.size(); d-- > 0;) {
      values[d] = axes[d].second[rest % axes[d].second.size()];
      rest /= axes[d].second.size();
    }
    Point p;
    p.index = n;
    for (size_t d = 0; d < axes.size(); ++d) p.values.push_back({axes[d].first, values[d]});
    PointResult r;
    r.index = n;
    r.status = PointStatus::kOk;
    r.edges.push_back(
        MakeEdge("leg", "high_on", margin(values), extra ? extra(values) : std::vector<Metric>{}));
    r.edges.push_back(MakeEdge("leg", "low_on", 4));
    s.points.push_back(p);
    s.results.push_back(r);
  }
  return s;
}

/// Adds a requirement parsed from `xml` (one <require/> element) at `line`.
inline void AddRequirement(Synthetic* s, const std::string& xml, int line) {
  pugi::xml_document doc;
  doc.load_string(xml.c_str());
  RequirementSpec r;
  std::string problem;
  bool ok = ParseRequirement(
      doc.first_child(), SourceLocation{s->spec.path, line, 3},
      [&](const char*, const std::string& m) {
        problem = m;
        return false;
      },
      &r);
  if (!ok) throw std::runtime_error("bad requirement in test: " + problem);
  s->spec.requirements.push_back(r);
}

/// A fresh empty folder under the system's temporary folder.
inline std::string TempDir(const std::string& name) {
  std::filesystem::path p = std::filesystem::temp_directory_path() /
                            ("zvsmap_report_test_" + name + "_" + std::to_string(::getpid()));
  std::filesystem::remove_all(p);
  std::filesystem::create_directories(p);
  return p.string();
}

/// Validates `path` against the summary schema with xmllint; returns its exit
/// status (0 = valid).
inline int ValidateSummary(const std::string& path) {
  std::string cmd = "xmllint --noout --schema '" ZVSMAP_SOURCE_DIR
                    "/sweeps/schema/zvsmap-summary.xsd' '" +
                    path + "'";
  return std::system(cmd.c_str());
}

}  // namespace testing_report
}  // namespace zvsmap
