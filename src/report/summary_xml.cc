#include "report/summary_xml.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>

#include "report/solver_aid_use.h"
#include "report/zvs_boundary.h"

namespace zvsmap {

namespace {

void AddAt(pugi::xml_node parent, const std::string& param, double value) {
  pugi::xml_node at = parent.append_child("at");
  at.append_attribute("param") = param.c_str();
  at.append_attribute("value") = XmlNumber(value).c_str();
}

// The measured range of one column over the points that ran.
void AddRange(pugi::xml_node edge_node, const char* quantity, const std::string& column,
              const ReportInput& input, const EdgeKey& key) {
  if (column.empty()) return;
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  int count = 0;
  for (const PointResult& r : input.results) {
    if (r.status != PointStatus::kOk) continue;
    const EdgeMeasurement* e = FindEdge(r, key);
    double v = e ? e->Get(column) : std::nan("");
    if (std::isnan(v)) continue;
    lo = std::min(lo, v);
    hi = std::max(hi, v);
    ++count;
  }
  pugi::xml_node range = edge_node.append_child("range");
  range.append_attribute("quantity") = quantity;
  range.append_attribute("column") = column.c_str();
  range.append_attribute("points") = count;
  if (count > 0) {
    range.append_attribute("min") = XmlNumber(lo).c_str();
    range.append_attribute("max") = XmlNumber(hi).c_str();
  }
}

// A point number as the CSV and the failed-points list give it.
unsigned long long PointNumber(const ReportInput& input, size_t i) {
  return static_cast<unsigned long long>(i < input.points.size() ? input.points[i].index : i);
}

void AddIntersection(pugi::xml_node parent, const ReportInput& input,
                     const WindowIntersection& w) {
  if (w.windows == 0) return;
  pugi::xml_node n = parent.append_child("intersection");
  n.append_attribute("earliest") = XmlNumber(w.lo).c_str();
  n.append_attribute("latest") = XmlNumber(w.hi).c_str();
  n.append_attribute("early-point") = PointNumber(input, w.lo_point);
  n.append_attribute("late-point") = PointNumber(input, w.hi_point);
  n.append_attribute("late-end") = w.hi_at_bound ? "probe-bound" : "ring-back";
  if (!w.Holds()) return;
  pugi::xml_node r = parent.append_child("recommended");
  r.append_attribute("value") = XmlNumber(w.recommended).c_str();
  r.append_attribute("choice") = DeadTimeChoiceName(w.choice);
  r.append_attribute("margin-early") = XmlNumber(w.margin_early).c_str();
  r.append_attribute("margin-late") = XmlNumber(w.margin_late).c_str();
}

// <dead-time-envelope>: the intersection of the probe windows over every
// point, the recommendation or the points that empty it, the impossible
// points and the schedule.
void AddEnvelope(pugi::xml_node edge_node, const ReportInput& input, const Grid& grid,
                 const EdgeEnvelope& env) {
  pugi::xml_node n = edge_node.append_child("dead-time-envelope");
  n.append_attribute("measured") = env.measured;
  n.append_attribute("windows") = env.all.windows;
  n.append_attribute("impossible") = static_cast<unsigned long long>(env.impossible.size());
  n.append_attribute("unprobed") = env.unprobed;
  n.append_attribute("single-value") = env.all.Holds();
  n.append_attribute("conflicts") = env.conflicts_total;
  AddIntersection(n, input, env.all);
  for (const WindowConflict& c : env.conflicts) {
    pugi::xml_node x = n.append_child("conflict");
    x.append_attribute("early-point") = PointNumber(input, c.early);
    x.append_attribute("t-min") = XmlNumber(c.t_min).c_str();
    x.append_attribute("late-point") = PointNumber(input, c.late);
    x.append_attribute("t-max") = XmlNumber(c.t_max).c_str();
  }
  for (const ImpossiblePoint& p : env.impossible) {
    pugi::xml_node x = n.append_child("impossible");
    x.append_attribute("point") = PointNumber(input, p.point);
    x.append_attribute("valley-time") = XmlNumber(p.t_valley).c_str();
    x.append_attribute("valley-voltage") = XmlNumber(p.v_valley).c_str();
    if (p.point < input.points.size()) {
      for (const ParamValue& v : input.points[p.point].values) AddAt(x, v.name, v.value);
    }
  }
  pugi::xml_node schedule = n.append_child("schedule");
  schedule.append_attribute("bins") = static_cast<unsigned long long>(env.schedule.size());
  schedule.append_attribute("off-grid") = env.off_grid;
  for (const ScheduleBin& bin : env.schedule) {
    pugi::xml_node b = schedule.append_child("bin");
    b.append_attribute("points") = bin.points;
    b.append_attribute("impossible") = bin.impossible;
    b.append_attribute("single-value") = bin.window.Holds();
    for (const ScheduleBin::Span& span : bin.spans) {
      const GridDim& dim = grid.dims[span.dim];
      pugi::xml_node sp = b.append_child("span");
      sp.append_attribute("param") = dim.param.c_str();
      sp.append_attribute("from") = XmlNumber(dim.values[span.first]).c_str();
      sp.append_attribute("to") = XmlNumber(dim.values[span.last]).c_str();
      if (dim.Categorical()) {  // a device axis: the values index the device names
        sp.append_attribute("from-device") = dim.labels[span.first].c_str();
        sp.append_attribute("to-device") = dim.labels[span.last].c_str();
      }
    }
    AddIntersection(b, input, bin.window);
  }
}

void AddEdge(pugi::xml_node root, const ReportInput& input, const Grid& grid, const EdgeKey& key,
             const MarginSource& margin, const WindowColumns& window,
             const EdgeEnvelope* envelope) {
  pugi::xml_node node = root.append_child("edge");
  node.append_attribute("cell") = key.cell.c_str();
  node.append_attribute("name") = key.edge.c_str();

  int full = 0, partial = 0, hard = 0, unknown = 0, failed = 0, unsettled = 0, missing = 0;
  double worst = std::numeric_limits<double>::infinity();
  size_t worst_i = 0;
  for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
    const PointResult& r = input.results[i];
    if (r.status == PointStatus::kFailed || r.status == PointStatus::kNotRun) {
      ++failed;
      continue;
    }
    if (r.status == PointStatus::kUnsettled) {
      ++unsettled;
      continue;
    }
    const EdgeMeasurement* e = FindEdge(r, key);
    if (!e) {
      ++missing;
      continue;
    }
    switch (e->zvs) {
      case ZvsClass::kFull:
        ++full;
        break;
      case ZvsClass::kPartial:
        ++partial;
        break;
      case ZvsClass::kHard:
        ++hard;
        break;
      case ZvsClass::kUnknown:
        ++unknown;
        break;
    }
    double m = MarginOf(*e, margin);
    if (!std::isnan(m) && m < worst) {
      worst = m;
      worst_i = i;
    }
  }
  pugi::xml_node counts = node.append_child("counts");
  counts.append_attribute("full") = full;
  counts.append_attribute("partial") = partial;
  counts.append_attribute("hard") = hard;
  counts.append_attribute("unknown") = unknown;
  counts.append_attribute("failed") = failed;
  counts.append_attribute("unsettled") = unsettled;
  counts.append_attribute("not-measured") = missing;

  pugi::xml_node region = node.append_child("zvs-region");
  region.append_attribute("located-on") = margin.description.c_str();
  region.append_attribute("interpolation") = "linear";
  for (const Boundary& b : FindBoundaries(grid, input.results, key, margin)) {
    pugi::xml_node bn = region.append_child("boundary");
    bn.append_attribute("along") = grid.dims[b.dim].param.c_str();
    bn.append_attribute("value") = XmlNumber(b.value).c_str();
    bn.append_attribute("between") = XmlNumber(b.lower).c_str();
    bn.append_attribute("and") = XmlNumber(b.upper).c_str();
    bn.append_attribute("method") = b.interpolated ? "margin-zero" : "midpoint";
    bn.append_attribute("zvs-side") = b.zvs_above ? "above" : "below";
    for (size_t d = 0; d < grid.dims.size(); ++d) {
      if (b.at[d] >= 0 && grid.dims[d].values.size() > 1) {
        AddAt(bn, grid.dims[d].param, grid.dims[d].values[b.at[d]]);
      }
    }
  }

  if (std::isfinite(worst)) {
    pugi::xml_node w = node.append_child("worst-margin");
    w.append_attribute("value") = XmlNumber(worst).c_str();
    w.append_attribute("point") = static_cast<unsigned long long>(input.points[worst_i].index);
    for (const ParamValue& v : input.points[worst_i].values) AddAt(w, v.name, v.value);
  }
  AddRange(node, "t-zvs", FindColumnWithPrefix(input.results, "t_zvs"), input, key);
  if (window.found()) {
    AddRange(node, "dead-time-window-start", window.start, input, key);
    AddRange(node, "dead-time-window-end", window.end, input, key);
  }
  if (envelope) AddEnvelope(node, input, grid, *envelope);
}

}  // namespace

std::string XmlNumber(double value) {
  // xs:double spells the special values NaN, INF and -INF.
  if (std::isnan(value)) return "NaN";
  if (std::isinf(value)) return value > 0 ? "INF" : "-INF";
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.9g", value);
  return buf;
}

namespace {

// <solver-aids setting="auto" aided="N"><aid name="rshunt" points="2"/>...:
// how many points needed each aid of the convergence ladder.
void AddSolverAids(pugi::xml_node root, const std::string& setting,
                   const std::vector<PointResult>& results) {
  pugi::xml_node aids = root.append_child("solver-aids");
  aids.append_attribute("setting") = setting.c_str();
  int aided = 0;
  for (const auto& [name, n] : CountSolverAids(results)) {
    pugi::xml_node aid = aids.append_child("aid");
    aid.append_attribute("name") = name.c_str();
    aid.append_attribute("points") = n;
    aided += n;
  }
  aids.append_attribute("aided") = aided;
}

// <refinement>: adaptive refinement was used, how far it got, per axis its
// resolution and halvings, per round the points it added.
void AddRefinement(pugi::xml_node root, const ReportBasis& input) {
  const RefinementOutcome& o = input.refinement;
  if (!o.used) return;
  pugi::xml_node node = root.append_child("refinement");
  node.append_attribute("rounds-planned") = o.rounds_planned;
  node.append_attribute("rounds-run") = o.rounds_run;
  node.append_attribute("complete") = o.complete;
  node.append_attribute("points") = static_cast<unsigned long long>(input.points.size());
  node.append_attribute("fine-grid-points") = static_cast<unsigned long long>(o.fine_grid_points);
  if (!o.pending.empty()) node.append_attribute("pending") = o.pending.c_str();
  for (const RefineSpec& r : input.spec.refine) {
    pugi::xml_node a = node.append_child("axis");
    a.append_attribute("param") = r.param.c_str();
    a.append_attribute("resolution") = XmlNumber(r.resolution).c_str();
    a.append_attribute("halvings") = r.levels;
  }
  for (size_t k = 0; k < o.points_per_round.size(); ++k) {
    pugi::xml_node round = node.append_child("round");
    round.append_attribute("index") = static_cast<unsigned long long>(k);
    round.append_attribute("points") = static_cast<unsigned long long>(o.points_per_round[k]);
  }
}

// Sets attribute `name` when `value` is a number.
void SetNumber(pugi::xml_node node, const char* name, double value) {
  if (!std::isnan(value)) node.append_attribute(name) = XmlNumber(value).c_str();
}

// The settled operating point of every point that has one, and over all of
// them the loop, the worst regulation error and the efficiency range.
void AddOperatingPoints(pugi::xml_node root, const ReportBasis& input) {
  const RegulationSpec& reg = input.tmpl.regulation;
  double worst = 0, eta_min = NAN, eta_max = NAN;
  std::vector<size_t> settled;
  for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
    const OperatingPoint& op = input.results[i].operating;
    if (op.loop == LoopKind::kNotSettled) continue;
    settled.push_back(i);
    double e = op.RegulationError();
    if (std::fabs(e) > std::fabs(worst)) worst = e;
    double eta = op.Efficiency();
    if (!std::isnan(eta)) {
      eta_min = std::isnan(eta_min) ? eta : std::min(eta_min, eta);
      eta_max = std::isnan(eta_max) ? eta : std::max(eta_max, eta);
    }
  }
  if (settled.empty()) return;
  pugi::xml_node node = root.append_child("operating-points");
  node.append_attribute("loop") = LoopKindName(input.results[settled[0]].operating.loop);
  if (reg.declared()) {
    node.append_attribute("control") = reg.param.c_str();
    node.append_attribute("regulated") = reg.vector.c_str();
    node.append_attribute("set-point") = reg.target.c_str();
    SetNumber(node, "worst-regulation-error", worst);
  }
  SetNumber(node, "efficiency-min", eta_min);
  SetNumber(node, "efficiency-max", eta_max);
  for (size_t i : settled) {
    const OperatingPoint& op = input.results[i].operating;
    pugi::xml_node p = node.append_child("point");
    p.append_attribute("index") = PointNumber(input, i);
    SetNumber(p, "control", op.control);
    SetNumber(p, "regulated-avg", op.regulated_avg);
    SetNumber(p, "set-point", op.set_point);
    SetNumber(p, "p-in-w", op.p_in_w);
    SetNumber(p, "p-out-w", op.p_out_w);
    SetNumber(p, "efficiency", op.Efficiency());
    for (const VectorAverage& a : op.averages) {
      pugi::xml_node av = p.append_child("average");
      av.append_attribute("vector") = a.vector.c_str();
      av.append_attribute("value") = XmlNumber(a.value).c_str();
    }
  }
}

// <tolerances>: per nominal point and edge the worst corners and the yield.
void AddTolerances(pugi::xml_node root, const ReportBasis& input) {
  const ToleranceSummary& s = input.tolerance;
  if (!s.used) return;
  const ToleranceSpec& spec = input.spec.tolerances;
  pugi::xml_node node = root.append_child("tolerances");
  node.append_attribute("seed") = static_cast<unsigned long long>(spec.seed);
  node.append_attribute("samples") = spec.samples;
  node.append_attribute("confidence") = XmlNumber(s.confidence).c_str();
  node.append_attribute("pass") = PassName(s.pass);
  for (const VarySpec& v : spec.vary) {
    pugi::xml_node x = node.append_child("vary");
    x.append_attribute("param") = v.param.c_str();
    if (v.OnDevice()) x.append_attribute("device") = v.device.c_str();
    x.append_attribute("within") = XmlNumber(v.within).c_str();
    x.append_attribute("relative") = v.relative;
    x.append_attribute("spread") = SpreadName(v.spread);
    if (v.spread == VarySpec::Spread::kNormal) {
      x.append_attribute("sigma") = XmlNumber(v.sigma).c_str();
    }
  }
  for (const PointTolerance& p : s.points) {
    pugi::xml_node pn = node.append_child("point");
    pn.append_attribute("index") = static_cast<unsigned long long>(p.nominal);
    if (p.point) {
      for (const ParamValue& v : p.point->values) AddAt(pn, v.name, v.value);
    }
    for (const EdgeTolerance& t : p.edges) {
      pugi::xml_node e = pn.append_child("edge");
      e.append_attribute("name") = t.key.Label().c_str();
      e.append_attribute("corners") = t.corners;
      if (!std::isnan(t.worst_energy_margin)) {
        e.append_attribute("worst-energy-margin") = XmlNumber(t.worst_energy_margin).c_str();
        e.append_attribute("worst-energy-corner") = t.worst_energy_corner.c_str();
      }
      if (!std::isnan(t.worst_timing_margin_s)) {
        e.append_attribute("worst-timing-margin-s") = XmlNumber(t.worst_timing_margin_s).c_str();
        e.append_attribute("worst-timing-corner") = t.worst_timing_corner.c_str();
      }
      e.append_attribute("samples") = t.samples;
      e.append_attribute("passes") = t.passes;
      e.append_attribute("unmeasured") = t.unmeasured;
      if (t.samples > 0) {
        e.append_attribute("yield") = XmlNumber(t.yield).c_str();
        e.append_attribute("yield-low") = XmlNumber(t.interval.low).c_str();
        e.append_attribute("yield-high") = XmlNumber(t.interval.high).c_str();
      }
      if (t.worst_sample >= 0) {
        e.append_attribute("worst-sample") = t.worst_sample;
        e.append_attribute("worst-sample-margin") = XmlNumber(t.worst_sample_margin).c_str();
      }
    }
  }
}

}  // namespace

void BuildSummaryXml(const ReportBasis& input, const std::vector<RequirementVerdict>& verdicts,
                     pugi::xml_document* doc) {
  doc->reset();
  pugi::xml_node decl = doc->append_child(pugi::node_declaration);
  decl.append_attribute("version") = "1.0";
  decl.append_attribute("encoding") = "UTF-8";
  pugi::xml_node root = doc->append_child("zvs-summary");
  root.append_attribute("format") = 1;
  root.append_attribute("tool-version") = ZVSMAP_VERSION;

  int ran = 0, failed = 0, unsettled = 0;
  for (const PointResult& r : input.results) {
    if (r.status == PointStatus::kOk) ++ran;
    if (r.status == PointStatus::kFailed || r.status == PointStatus::kNotRun) ++failed;
    if (r.status == PointStatus::kUnsettled) ++unsettled;
  }
  pugi::xml_node run = root.append_child("run");
  run.append_attribute("sweep") = input.spec.path.c_str();
  run.append_attribute("template") = input.spec.template_path.c_str();
  run.append_attribute("points") = static_cast<unsigned long long>(input.points.size());
  run.append_attribute("ran") = ran;
  run.append_attribute("failed") = failed;
  run.append_attribute("unsettled") = unsettled;
  run.append_attribute("zvs-criterion") = input.spec.zvs.Describe().c_str();
  AddSolverAids(root, input.spec.simulation.solver_aid, input.results);

  const Grid& grid = input.grid;
  pugi::xml_node grid_node = root.append_child("grid");
  for (const GridDim& dim : grid.dims) {
    pugi::xml_node d = grid_node.append_child("dimension");
    d.append_attribute("param") = dim.param.c_str();
    d.append_attribute("count") = static_cast<unsigned long long>(dim.values.size());
    if (!dim.values.empty()) {
      d.append_attribute("first") = XmlNumber(dim.values.front()).c_str();
      d.append_attribute("last") = XmlNumber(dim.values.back()).c_str();
    }
    for (const std::string& also : dim.also) {
      d.append_child("moves-with").append_attribute("param") = also.c_str();
    }
  }

  AddRefinement(root, input);
  AddOperatingPoints(root, input);

  const MarginSource& margin = input.margin;
  pugi::xml_node m = root.append_child("margin");
  m.append_attribute("source") = margin.column.empty() ? "voltage-difference" : "column";
  m.append_attribute("definition") = margin.description.c_str();
  if (!margin.unit.empty()) m.append_attribute("unit") = margin.unit.c_str();
  m.append_attribute("positive-means") = margin.positive_means.c_str();

  for (const EdgeKey& key : input.edges) {
    AddEdge(root, input, grid, key, margin, input.window, input.envelope.Find(key));
  }

  AddTolerances(root, input);

  pugi::xml_node failed_node = root.append_child("failed-points");
  failed_node.append_attribute("count") = failed + unsettled;
  for (size_t i = 0; i < input.results.size() && i < input.points.size(); ++i) {
    const PointResult& r = input.results[i];
    if (r.status == PointStatus::kOk) continue;
    pugi::xml_node p = failed_node.append_child("point");
    p.append_attribute("index") = static_cast<unsigned long long>(input.points[i].index);
    p.append_attribute("status") = PointStatusName(r.status);
    p.append_attribute("reason") = r.reason.c_str();
    for (const ParamValue& v : input.points[i].values) AddAt(p, v.name, v.value);
  }

  int failing = 0;
  for (const RequirementVerdict& v : verdicts) failing += v.held ? 0 : 1;
  pugi::xml_node reqs = root.append_child("requirements");
  reqs.append_attribute("total") = static_cast<unsigned long long>(verdicts.size());
  reqs.append_attribute("failed") = failing;
  for (const RequirementVerdict& v : verdicts) {
    pugi::xml_node r = reqs.append_child("requirement");
    r.append_attribute("title") = v.title.c_str();
    r.append_attribute("held") = v.held;
    r.append_attribute("line") = v.spec.where.line;
    r.append_attribute("covered") = v.covered;
    r.append_attribute("checked") = v.checked;
    r.append_attribute("failing") = v.failing;
    r.append_attribute("unchecked") = v.unchecked;
    r.append_attribute("message") = v.message.c_str();
    for (const std::string& detail : v.details) {
      r.append_child("detail").text() = detail.c_str();
    }
  }
}

}  // namespace zvsmap
