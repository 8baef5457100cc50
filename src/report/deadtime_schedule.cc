#include "report/deadtime_schedule.h"

#include "report/csv_writer.h"
#include "report/units.h"

namespace zvsmap {

namespace {

std::string SpanValue(const GridDim& dim, int at) {
  if (dim.Categorical()) return dim.labels[at];
  return CsvNumber(dim.values[at]);
}

std::string PointNumber(const ReportInput& input, size_t i) {
  return std::to_string(i < input.points.size() ? input.points[i].index : i);
}

}  // namespace

std::string DescribeSpan(const Grid& grid, const ScheduleBin::Span& span) {
  const GridDim& dim = grid.dims[span.dim];
  auto value = [&](int at) {
    return dim.Categorical() ? dim.labels[at]
                             : FormatQuantity(dim.values[at], ParamUnit(dim.param));
  };
  std::string out = dim.param + " " + value(span.first);
  if (span.last != span.first) out += " \u2013 " + value(span.last);
  return out;
}

void WriteDeadTimeScheduleCsv(std::ostream& out, const ReportBasis& input) {
  const DeadTimeEnvelope& envelope = input.envelope;
  if (!envelope.available) return;
  out << "cell,edge,bin";
  for (size_t d : input.grid.SweptDims()) {
    const std::string& p = input.grid.dims[d].param;
    out << "," << CsvField(p + "_from") << "," << CsvField(p + "_to");
  }
  out << ",points,impossible,single_value,t_dead_earliest_s,t_dead_latest_s,late_end,"
         "t_dead_recommended_s,choice,timing_margin_early_s,timing_margin_late_s,early_point,"
         "late_point\r\n";
  for (const EdgeEnvelope& env : envelope.edges) {
    for (size_t b = 0; b < env.schedule.size(); ++b) {
      const ScheduleBin& bin = env.schedule[b];
      const WindowIntersection& w = bin.window;
      out << CsvField(env.key.cell) << "," << CsvField(env.key.edge) << "," << b;
      for (const ScheduleBin::Span& s : bin.spans) {
        const GridDim& dim = input.grid.dims[s.dim];
        out << "," << CsvField(SpanValue(dim, s.first)) << ","
            << CsvField(SpanValue(dim, s.last));
      }
      bool any = w.windows > 0;
      out << "," << bin.points << "," << bin.impossible << "," << (w.Holds() ? 1 : 0) << ","
          << CsvNumber(w.lo) << "," << CsvNumber(w.hi) << ","
          << (any ? (w.hi_at_bound ? "probe-bound" : "ring-back") : "") << ","
          << CsvNumber(w.recommended) << "," << (w.Holds() ? DeadTimeChoiceName(w.choice) : "")
          << "," << CsvNumber(w.margin_early) << "," << CsvNumber(w.margin_late) << ","
          << (any ? PointNumber(input, w.lo_point) : "") << ","
          << (any ? PointNumber(input, w.hi_point) : "") << "\r\n";
    }
  }
}

}  // namespace zvsmap
