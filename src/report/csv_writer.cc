#include "report/csv_writer.h"

#include <cmath>
#include <cstdio>

namespace zvsmap {

std::string CsvField(const std::string& text) {
  if (text.find_first_of(",\"\r\n") == std::string::npos) return text;
  std::string out = "\"";
  for (char c : text) {
    if (c == '"') out += '"';
    out += c;
  }
  out += '"';
  return out;
}

std::string CsvNumber(double value) {
  if (std::isnan(value)) return "";
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.9g", value);
  return buf;
}

namespace {

void AddColumn(const std::string& name, std::vector<std::string>* columns) {
  for (const auto& c : *columns) {
    if (c == name) return;
  }
  columns->push_back(name);
}

// The measured metrics, then the hand-calculation comparisons flattened
// (FlatColumns): each list the union over all rows, in order of first appearance.
std::vector<std::string> ValueColumns(const std::vector<PointResult>& results) {
  std::vector<std::string> metrics, comparisons;
  for (const auto& r : results) {
    for (const auto& e : r.edges) {
      for (const auto& m : e.metrics) AddColumn(m.column, &metrics);
      for (const auto& c : e.comparisons) {
        for (const FlatColumn& f : FlatColumns(c)) AddColumn(f.name, &comparisons);
      }
    }
  }
  for (const auto& c : comparisons) AddColumn(c, &metrics);
  return metrics;
}

// The operating-point columns: the slow states' averages named by vector,
// the union over all results in order of first appearance.
struct OperatingColumns {
  bool any = false;
  std::vector<std::string> averages;
};

OperatingColumns OperatingColumnsOf(const std::vector<PointResult>& results) {
  OperatingColumns c;
  for (const auto& r : results) {
    if (r.operating.loop == LoopKind::kNotSettled) continue;
    c.any = true;
    for (const auto& a : r.operating.averages) AddColumn(a.vector, &c.averages);
  }
  return c;
}

void WriteOperatingHeader(std::ostream& out, const OperatingColumns& c) {
  if (!c.any) return;
  out << ",loop,control_value,regulated_avg,set_point";
  for (const auto& v : c.averages) out << ',' << CsvField("avg_" + v);
  out << ",p_in_w,p_out_w,efficiency";
}

void WriteOperatingFields(std::ostream& out, const OperatingColumns& c, const OperatingPoint& op) {
  if (!c.any) return;
  out << ',' << LoopKindName(op.loop) << ',' << CsvNumber(op.control) << ','
      << CsvNumber(op.regulated_avg) << ',' << CsvNumber(op.set_point);
  for (const auto& v : c.averages) {
    double value = std::nan("");
    for (const auto& a : op.averages) {
      if (a.vector == v) value = a.value;
    }
    out << ',' << CsvNumber(value);
  }
  out << ',' << CsvNumber(op.p_in_w) << ',' << CsvNumber(op.p_out_w) << ','
      << CsvNumber(op.Efficiency());
}

}  // namespace

void WriteEdgesCsv(std::ostream& out, const std::vector<Point>& points,
                   const std::vector<PointResult>& results) {
  std::vector<std::string> params;
  if (!points.empty()) {
    for (const auto& v : points.front().values) params.push_back(v.name);
  }
  std::vector<std::string> metrics = ValueColumns(results);
  const OperatingColumns operating = OperatingColumnsOf(results);

  // "\r\n" line ends, as RFC 4180 specifies.
  const char* eol = "\r\n";
  // A refined sweep (<refine>) says which round added each point.
  bool refined = false;
  for (const Point& p : points) refined = refined || p.refine_round >= 0;
  out << "point";
  if (refined) out << ",refine_round";
  for (const auto& p : params) out << ',' << CsvField(p);
  // Device axes: one column per switch role, holding the device's name.
  std::vector<std::string> roles;
  if (!points.empty()) {
    for (const auto& d : points.front().devices) roles.push_back(d.first);
  }
  for (const auto& r : roles) out << ',' << CsvField(r);
  out << ",cell,edge,zvs_class";
  for (const auto& m : metrics) out << ',' << CsvField(m);
  WriteOperatingHeader(out, operating);
  out << ",status,reason,solver_aid,wall_time_s" << eol;

  for (size_t i = 0; i < points.size() && i < results.size(); ++i) {
    const Point& point = points[i];
    const PointResult& r = results[i];
    auto prefix = [&] {
      out << point.index;
      if (refined) out << ',' << point.refine_round;
      for (const auto& name : params) {
        auto v = point.Get(name);
        out << ',' << (v ? CsvNumber(*v) : "");
      }
      for (size_t k = 0; k < roles.size(); ++k) {
        out << ',' << (k < point.devices.size() ? CsvField(point.devices[k].second) : "");
      }
    };
    auto suffix = [&] {
      WriteOperatingFields(out, operating, r.operating);
      out << ',' << PointStatusName(r.status) << ',' << CsvField(r.reason) << ','
          << CsvField(r.solver_aid) << ',' << CsvNumber(r.wall_s) << eol;
    };
    if (r.edges.empty()) {
      prefix();
      out << ",,,";
      for (size_t k = 0; k < metrics.size(); ++k) out << ',';
      suffix();
      continue;
    }
    for (const auto& e : r.edges) {
      prefix();
      out << ',' << CsvField(e.cell) << ',' << CsvField(e.edge) << ',' << ZvsClassName(e.zvs);
      for (const auto& m : metrics) out << ',' << CsvNumber(e.Get(m));
      suffix();
    }
  }
}

}  // namespace zvsmap
