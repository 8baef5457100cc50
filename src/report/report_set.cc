#include "report/report_set.h"

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <sstream>

#include "core/atomic_file.h"
#include "report/csv_writer.h"
#include "report/deadtime_chart.h"
#include "report/deadtime_schedule.h"
#include "report/html_index.h"
#include "report/junit_xml.h"
#include "report/plots.h"
#include "report/requirements.h"
#include "report/summary_xml.h"
#include "report/tolerance_maps.h"

namespace zvsmap {

namespace {

bool WriteText(const std::string& dir, const std::string& name, const std::string& text,
               ReportOutcome* outcome, std::string* error) {
  std::string path = (std::filesystem::path(dir) / name).string();
  if (!WriteFileAtomically(path, text, error)) return false;
  outcome->files.push_back(path);
  return true;
}

// The names of DIR/waveforms/point_*.{svg,raw}, sorted (none when absent).
std::vector<std::string> WaveformFiles(const std::string& dir) {
  std::vector<std::string> names;
  std::error_code ec;
  std::filesystem::directory_iterator it(std::filesystem::path(dir) / "waveforms", ec);
  if (ec) return names;
  for (const auto& entry : it) {
    std::string name = entry.path().filename().string();
    std::string ext = entry.path().extension().string();
    if (name.rfind("point_", 0) == 0 && (ext == ".svg" || ext == ".raw")) names.push_back(name);
  }
  // By point number, then name (point_2 before point_10).
  auto number = [](const std::string& n) { return std::strtoull(n.c_str() + 6, nullptr, 10); };
  std::sort(names.begin(), names.end(), [&](const std::string& a, const std::string& b) {
    unsigned long long na = number(a), nb = number(b);
    return na != nb ? na < nb : a < b;
  });
  return names;
}

std::string XmlText(const pugi::xml_document& doc) {
  std::ostringstream out;
  doc.save(out, "  ", pugi::format_default, pugi::encoding_utf8);
  return out.str();
}

}  // namespace

ReportBasis::ReportBasis(const ReportInput& input)
    : ReportInput(input),
      grid(BuildGrid(spec, points)),
      edges(MeasuredEdges(results)),
      margin(ChooseMargin(results)),
      window(FindWindowColumns(results)),
      envelope(ComputeDeadTimeEnvelope(grid, results, edges)) {}

bool WriteReports(const ReportInput& raw_input, const std::string& dir, ReportOutcome* outcome,
                  std::string* error) {
  // Tolerance variants are summarized per nominal point; every other report
  // sees the nominal points alone.
  std::vector<Point> nominal_points;
  std::vector<PointResult> nominal_results;
  for (size_t i = 0; i < raw_input.points.size() && i < raw_input.results.size(); ++i) {
    if (raw_input.points[i].variant) continue;
    nominal_points.push_back(raw_input.points[i]);
    nominal_results.push_back(raw_input.results[i]);
  }
  ReportInput nominal{raw_input.spec, raw_input.tmpl, nominal_points, nominal_results,
                      raw_input.refinement};
  ReportBasis input(nominal);
  input.tolerance = SummarizeTolerances(raw_input.spec.tolerances, raw_input.points,
                                        raw_input.results, ChooseMargin(raw_input.results));
  std::ostringstream csv;
  WriteEdgesCsv(csv, input.points, input.results);
  if (!WriteText(dir, "edges.csv", csv.str(), outcome, error)) return false;

  std::vector<RequirementVerdict> verdicts = EvaluateRequirements(input);
  outcome->requirements_total = static_cast<int>(verdicts.size());
  outcome->requirements_failed = 0;
  for (const RequirementVerdict& v : verdicts) outcome->requirements_failed += v.held ? 0 : 1;

  pugi::xml_document summary;
  BuildSummaryXml(input, verdicts, &summary);
  if (!WriteText(dir, "summary.xml", XmlText(summary), outcome, error)) return false;

  pugi::xml_document junit;
  BuildJunitXml(input, verdicts, &junit);
  if (!WriteText(dir, "junit.xml", XmlText(junit), outcome, error)) return false;

  std::vector<Plot> plots = MakePlots(input);
  for (Plot& p : DeadTimeCharts(input)) plots.push_back(std::move(p));
  for (Plot& p : MakeToleranceMaps(input)) plots.push_back(std::move(p));
  for (const Plot& p : plots) {
    if (!WriteText(dir, p.file, p.svg, outcome, error)) return false;
  }

  std::vector<std::string> links = {"edges.csv", "summary.xml", "junit.xml"};
  if (input.tolerance.used) {
    std::ostringstream tolerance;
    WriteToleranceCsv(tolerance, input.tolerance);
    if (!WriteText(dir, "tolerance.csv", tolerance.str(), outcome, error)) return false;
    links.push_back("tolerance.csv");
  }
  if (input.envelope.available) {
    std::ostringstream schedule;
    WriteDeadTimeScheduleCsv(schedule, input);
    if (!WriteText(dir, "deadtime_schedule.csv", schedule.str(), outcome, error)) return false;
    links.push_back("deadtime_schedule.csv");
  }
  for (const Plot& p : plots) links.push_back(p.file);
  // Waveforms saved earlier (`zvsmap waveforms`, `run --waveforms`): their
  // plots shown, the raw files linked.
  std::vector<Plot> shown = plots;
  for (const std::string& name : WaveformFiles(dir)) {
    std::string rel = "waveforms/" + name;
    if (name.size() > 4 && name.compare(name.size() - 4, 4, ".svg") == 0) {
      shown.push_back({rel, "Commutation waveforms: " + name, ""});
    }
    links.push_back(rel);
  }
  return WriteText(dir, "index.html", BuildHtmlIndex(input, verdicts, shown, links), outcome,
                   error);
}

}  // namespace zvsmap
