#include "report/requirements.h"

#include <cctype>
#include <cmath>
#include <cstdio>

#include "core/expression.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "report/zvs_boundary.h"

namespace zvsmap {

namespace {

std::string Place(const SourceLocation& where) {
  std::string out = where.file.empty() ? "sweep" : where.file;
  if (where.line > 0) out += ":" + std::to_string(where.line);
  return out;
}

std::string Num(double v) { return std::isnan(v) ? "not measured" : FormatEngineering(v); }

// The where-expression at one point: 1 covers, 0 does not, -1 error.
int Covers(const RequirementSpec& r, const Point& point, std::string* message) {
  if (r.where_expression.empty()) return 1;
  Variables vars;
  for (const std::string& name : r.where_names) {
    bool found = false;
    for (const ParamValue& v : point.values) {
      if (SameName(v.name, name)) {
        vars[name] = v.value;
        found = true;
      }
    }
    if (!found) {
      *message = "where-expression names '" + name + "', which point " +
                 std::to_string(point.index) + " does not set";
      return -1;
    }
  }
  double value = 0;
  int column = 0;
  if (!EvaluateExpression(r.where_expression, vars, &value, message, &column)) return -1;
  return value != 0 ? 1 : 0;
}

// When the probe found ZVS impossible at this point: why, with its valley.
std::string ImpossibleNote(const EdgeMeasurement& e, const std::string& start_column) {
  if (start_column != kProbeTMinColumn || !std::isnan(e.Get(kProbeTMinColumn))) return "";
  return " (ZVS impossible at any dead time: lowest v_ds " + Num(e.Get(kProbeValleyVoltageColumn)) +
         "V at " + Num(e.Get(kProbeValleyTimeColumn)) + "s)";
}

// dead-time=T within-window="true": T inside [probe_t_min_s, probe_t_max_s].
std::string CheckGivenDeadTime(const RequirementSpec& r, const EdgeMeasurement& e,
                               const std::string& label) {
  double t = r.dead_time_s;
  double start = e.Get(kProbeTMinColumn), end = e.Get(kProbeTMaxColumn);
  if (!std::isnan(start) && !std::isnan(end) && t >= start && t <= end) return "";
  std::string out = label + " dead time " + Num(t) + "s outside [" + kProbeTMinColumn + "=" +
                    Num(start) + ", " + kProbeTMaxColumn + "=" + Num(end) + "]";
  if (!std::isnan(end) && t > end && e.Get(kProbeMaxAtBoundColumn) > 0.5) {
    out += " (beyond where the probe stopped; no ring-back seen before it)";
  }
  return out + ImpossibleNote(e, kProbeTMinColumn);
}

// Checks one measured edge; returns "" when it holds, else what is wrong.
std::string Check(const RequirementSpec& r, const EdgeMeasurement& e, const MarginSource& margin,
                  const WindowColumns& window) {
  std::string label = e.cell + "." + e.edge;
  switch (r.kind) {
    case RequirementSpec::Kind::kClass: {
      bool ok =
          e.zvs == ZvsClass::kFull || (r.min_class == "partial" && e.zvs == ZvsClass::kPartial);
      if (ok) return "";
      return label + " class " + ZvsClassName(e.zvs) +
             " (v_turn_on_v=" + Num(e.Get("v_turn_on_v")) + ", limit " +
             Num(e.Get("v_residual_limit_v")) + ")";
    }
    case RequirementSpec::Kind::kMetric: {
      bool is_margin = r.metric == "zvs_margin";
      double v = is_margin ? MarginOf(e, margin) : e.Get(r.metric);
      std::string name = is_margin ? "zvs_margin (" + margin.description + ")" : r.metric;
      bool ok =
          !std::isnan(v) && (std::isnan(r.min) || v >= r.min) && (std::isnan(r.max) || v <= r.max);
      if (ok) return "";
      return label + " " + name + "=" + Num(v);
    }
    case RequirementSpec::Kind::kDeadTimeWindow: {
      double dead = e.Get("t_dead_s");
      double start = e.Get(window.start), end = e.Get(window.end);
      // A window start of NaN: ZVS not reached within the dead time (too
      // short). An end of NaN: no ring-back seen, so no upper limit applies.
      bool ok = !std::isnan(dead) && !std::isnan(start) && dead >= start &&
                (std::isnan(end) || dead <= end);
      if (ok) return "";
      return label + " t_dead_s=" + Num(dead) + " outside [" + window.start + "=" + Num(start) +
             ", " + window.end + "=" + Num(end) + "]" + ImpossibleNote(e, window.start);
    }
    case RequirementSpec::Kind::kGivenDeadTime:
      return CheckGivenDeadTime(r, e, label);
    case RequirementSpec::Kind::kYield:
    case RequirementSpec::Kind::kWorstMargin:
      break;  // CheckTolerance, on the variants
  }
  return "";
}

// The problems of a requirement at one point's measured edges ("not measured"
// when the point has no such edge).
std::vector<std::string> EdgeProblems(const RequirementSpec& r, const PointResult& result,
                                      const MarginSource& margin, const WindowColumns& window) {
  std::vector<std::string> problems;
  bool any_edge = false;
  for (const EdgeMeasurement& e : result.edges) {
    if (e.edge != r.edge || (!r.cell.empty() && !SameName(e.cell, r.cell))) continue;
    any_edge = true;
    std::string problem = Check(r, e, margin, window);
    if (!problem.empty()) problems.push_back(problem);
  }
  if (!any_edge) {
    problems.push_back("edge " + (r.cell.empty() ? r.edge : r.cell + "." + r.edge) +
                       " not measured");
  }
  return problems;
}

bool IsToleranceKind(RequirementSpec::Kind k) {
  return k == RequirementSpec::Kind::kYield || k == RequirementSpec::Kind::kWorstMargin;
}

// A tolerance requirement at one nominal point's edge; "" when it holds.
std::string CheckTolerance(const RequirementSpec& r, const EdgeTolerance& t, double confidence) {
  std::string label = t.key.Label();
  if (r.kind == RequirementSpec::Kind::kYield) {
    if (t.samples > 0 && t.yield >= r.min) return "";
    char interval[96];
    std::snprintf(interval, sizeof interval, "%.4g%% (%.4g%% to %.4g%% at %.4g%%)",
                  t.yield * 100, t.interval.low * 100, t.interval.high * 100, confidence * 100);
    return label + " yield " + (t.samples > 0 ? interval : "not measured") + " over " +
           std::to_string(t.samples) + " samples, worst sample " +
           std::to_string(t.worst_sample);
  }
  if (!std::isnan(t.worst_energy_margin) && t.worst_energy_margin >= r.min) return "";
  return label + " worst-case zvs_energy_margin=" + Num(t.worst_energy_margin) + " at corner " +
         (t.worst_energy_corner.empty() ? "(none)" : t.worst_energy_corner);
}

// The problems of a tolerance requirement at one nominal point: per matching
// edge, or "not measured" when no variant measured it.
std::vector<std::string> ToleranceProblems(const RequirementSpec& r, const PointTolerance* pt,
                                           double confidence) {
  std::vector<std::string> problems;
  bool any_edge = false;
  for (const EdgeTolerance& t : pt ? pt->edges : std::vector<EdgeTolerance>{}) {
    if (t.key.edge != r.edge || (!r.cell.empty() && !SameName(t.key.cell, r.cell))) continue;
    any_edge = true;
    std::string problem = CheckTolerance(r, t, confidence);
    if (!problem.empty()) problems.push_back(problem);
  }
  if (!any_edge) {
    problems.push_back("edge " + (r.cell.empty() ? r.edge : r.cell + "." + r.edge) +
                       " not measured by any tolerance variant");
  }
  return problems;
}

}  // namespace

std::vector<RequirementVerdict> EvaluateRequirements(const ReportBasis& input) {
  const MarginSource& margin = input.margin;
  const WindowColumns& window = input.window;
  constexpr size_t kMaxDetails = 50;

  std::vector<RequirementVerdict> verdicts;
  for (const RequirementSpec& r : input.spec.requirements) {
    RequirementVerdict v;
    v.spec = r;
    v.title = r.name.empty() ? Place(r.where) + ": " + r.Describe() : r.name;
    std::string error;
    if (r.kind == RequirementSpec::Kind::kDeadTimeWindow && !window.found()) {
      error =
          "the results have no dead-time window columns (looked for probe_t_min*/t_dead_min*/"
          "t_clamp*/"
          "t_zvs* and probe_t_max*/t_dead_max*/t_ringback*/t_ring_back*), so the window cannot "
          "be checked";
    }
    if (r.kind == RequirementSpec::Kind::kGivenDeadTime && !input.envelope.available) {
      error = std::string("the results have no probe window (") + kProbeTMinColumn + ", " +
              kProbeTMaxColumn + "), so a given dead time cannot be judged against the window";
    }
    for (size_t i = 0; error.empty() && i < input.points.size() && i < input.results.size(); ++i) {
      const Point& point = input.points[i];
      const PointResult& result = input.results[i];
      int covers = Covers(r, point, &error);
      if (covers < 0) error = "cannot evaluate where=\"" + r.where_expression + "\": " + error;
      if (covers <= 0) continue;
      ++v.covered;
      if (result.status != PointStatus::kOk) {
        ++v.unchecked;
        continue;
      }
      ++v.checked;
      std::vector<std::string> problems =
          IsToleranceKind(r.kind)
              ? ToleranceProblems(r, input.tolerance.Find(point.index), input.tolerance.confidence)
              : EdgeProblems(r, result, margin, window);
      if (problems.empty()) continue;
      ++v.failing;
      if (v.details.size() < kMaxDetails) {
        std::string line = "point " + std::to_string(point.index) + " (" + point.Describe() + "):";
        for (const std::string& p : problems) line += " " + p + ";";
        line.pop_back();
        v.details.push_back(line);
      }
    }
    if (!error.empty()) {
      v.held = false;
      v.message = Place(r.where) + ": " + error;
    } else if (v.checked == 0) {
      v.held = false;
      v.message = Place(r.where) + ": covers no point that ran (" + std::to_string(v.covered) +
                  " covered, " + std::to_string(v.unchecked) + " did not run)";
    } else if (v.failing > 0) {
      v.held = false;
      v.message = std::to_string(v.failing) + " of " + std::to_string(v.checked) +
                  " checked points break it";
      if (static_cast<size_t>(v.failing) > v.details.size()) {
        v.details.push_back("... and " + std::to_string(v.failing - v.details.size()) + " more");
      }
    } else {
      v.held = true;
      v.message = "held at all " + std::to_string(v.checked) + " checked points";
    }
    if (v.unchecked > 0) {
      v.message += "; " + std::to_string(v.unchecked) + " covered points did not run";
    }
    verdicts.push_back(std::move(v));
  }
  return verdicts;
}

}  // namespace zvsmap
