#include "report/tolerance_report.h"

#include <algorithm>
#include <cmath>
#include <map>

#include "report/csv_writer.h"
#include "sweep/tolerance_expand.h"

namespace zvsmap {

namespace {

constexpr const char* kEnergyMarginColumn = "zvs_energy_margin";

double TimingMargin(const EdgeMeasurement& e) {
  double early = e.Get("zvs_timing_margin_early_s"), late = e.Get("zvs_timing_margin_late_s");
  if (std::isnan(early)) return late;
  if (std::isnan(late)) return early;
  return std::min(early, late);
}

EdgeTolerance& EdgeOf(PointTolerance* p, const EdgeMeasurement& e) {
  for (EdgeTolerance& t : p->edges) {
    if (t.key.cell == e.cell && t.key.edge == e.edge) return t;
  }
  p->edges.push_back({});
  p->edges.back().key = {e.cell, e.edge};
  return p->edges.back();
}

void AddCorner(const ToleranceSpec& spec, unsigned mask, const EdgeMeasurement& e,
               EdgeTolerance* t) {
  ++t->corners;
  double energy = e.Get(kEnergyMarginColumn);
  if (!std::isnan(energy) && !(energy >= t->worst_energy_margin)) {
    t->worst_energy_margin = energy;
    t->worst_energy_corner = DescribeCorner(spec, mask);
  }
  double timing = TimingMargin(e);
  if (!std::isnan(timing) && !(timing >= t->worst_timing_margin_s)) {
    t->worst_timing_margin_s = timing;
    t->worst_timing_corner = DescribeCorner(spec, mask);
  }
}

void AddSample(unsigned number, const EdgeMeasurement& e, const ToleranceSummary& s,
               EdgeTolerance* t) {
  ++t->samples;
  if (SamplePasses(e, s.pass)) ++t->passes;
  double margin = MarginOf(e, s.margin);
  if (!std::isnan(margin) && !(margin >= t->worst_sample_margin)) {
    t->worst_sample_margin = margin;
    t->worst_sample = static_cast<int>(number);
  }
}

}  // namespace

bool SamplePasses(const EdgeMeasurement& e, ToleranceSpec::Pass pass) {
  if (pass == ToleranceSpec::Pass::kClass) return e.zvs == ZvsClass::kFull;
  return e.Get(kEnergyMarginColumn) >= 0;
}

const EdgeTolerance* PointTolerance::Find(const std::string& cell, const std::string& edge) const {
  for (const EdgeTolerance& t : edges) {
    if (t.key.cell == cell && t.key.edge == edge) return &t;
  }
  return nullptr;
}

const PointTolerance* ToleranceSummary::Find(size_t nominal) const {
  for (const PointTolerance& p : points) {
    if (p.nominal == nominal) return &p;
  }
  return nullptr;
}

ToleranceSummary SummarizeTolerances(const ToleranceSpec& spec, const std::vector<Point>& points,
                                     const std::vector<PointResult>& results,
                                     const MarginSource& margin) {
  ToleranceSummary s;
  s.used = spec.used;
  s.confidence = spec.confidence;
  s.pass = spec.pass;
  s.margin = margin;
  if (!spec.used) return s;
  std::map<size_t, const Point*> nominals;
  std::map<size_t, int> samples_expected;
  for (const Point& p : points) {
    if (!p.variant) nominals.emplace(p.index, &p);
  }
  std::map<size_t, PointTolerance> by_nominal;
  for (size_t i = 0; i < points.size() && i < results.size(); ++i) {
    const Point& p = points[i];
    if (!p.variant) continue;
    PointTolerance& pt = by_nominal[p.variant->nominal];
    pt.nominal = p.variant->nominal;
    auto found = nominals.find(pt.nominal);
    pt.point = found == nominals.end() ? nullptr : found->second;
    bool sample = p.variant->kind == VariantTag::Kind::kSample;
    if (sample) ++samples_expected[pt.nominal];
    if (results[i].status != PointStatus::kOk) continue;
    for (const EdgeMeasurement& e : results[i].edges) {
      EdgeTolerance& t = EdgeOf(&pt, e);
      if (sample) {
        AddSample(p.variant->number, e, s, &t);
      } else {
        AddCorner(spec, p.variant->number, e, &t);
      }
    }
  }
  for (auto& [nominal, pt] : by_nominal) {
    for (EdgeTolerance& t : pt.edges) {
      t.unmeasured = samples_expected[nominal] - t.samples;
      if (t.samples > 0) t.yield = static_cast<double>(t.passes) / t.samples;
      t.interval = WilsonInterval(t.passes, t.samples, spec.confidence);
    }
    s.points.push_back(std::move(pt));
  }
  return s;
}

void WriteToleranceCsv(std::ostream& out, const ToleranceSummary& summary) {
  std::vector<std::string> params;
  for (const PointTolerance& p : summary.points) {
    if (!p.point) continue;
    for (const ParamValue& v : p.point->values) {
      if (std::find(params.begin(), params.end(), v.name) == params.end()) {
        params.push_back(v.name);
      }
    }
  }
  out << "point";
  for (const std::string& name : params) out << ',' << CsvField(name);
  out << ",cell,edge,corners,worst_energy_margin,worst_energy_corner,worst_timing_margin_s,"
         "worst_timing_corner,samples,passes,unmeasured,pass_rule,yield,yield_low,yield_high,"
         "confidence,worst_sample,worst_sample_margin\n";
  for (const PointTolerance& p : summary.points) {
    for (const EdgeTolerance& t : p.edges) {
      out << p.nominal;
      for (const std::string& name : params) {
        std::optional<double> v = p.point ? p.point->Get(name) : std::nullopt;
        out << ',' << (v ? CsvNumber(*v) : "");
      }
      out << ',' << CsvField(t.key.cell) << ',' << CsvField(t.key.edge) << ',' << t.corners << ','
          << CsvNumber(t.worst_energy_margin) << ',' << CsvField(t.worst_energy_corner) << ','
          << CsvNumber(t.worst_timing_margin_s) << ',' << CsvField(t.worst_timing_corner) << ','
          << t.samples << ',' << t.passes << ',' << t.unmeasured << ',' << PassName(summary.pass)
          << ',' << CsvNumber(t.yield) << ',' << (t.samples > 0 ? CsvNumber(t.interval.low) : "")
          << ',' << (t.samples > 0 ? CsvNumber(t.interval.high) : "") << ','
          << CsvNumber(summary.confidence) << ','
          << (t.worst_sample >= 0 ? std::to_string(t.worst_sample) : "") << ','
          << CsvNumber(t.worst_sample_margin) << '\n';
    }
  }
}

}  // namespace zvsmap
