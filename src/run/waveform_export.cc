#include "run/waveform_export.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <filesystem>
#include <map>
#include <sstream>
#include <utility>

#include "core/atomic_file.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "report/raw_writer.h"
#include "report/waveform_plot.h"
#include "run/point_evaluator.h"

namespace zvsmap {

namespace {

std::string Safe(const std::string& s) {
  std::string out;
  for (char c : s) out += std::isalnum(static_cast<unsigned char>(c)) ? c : '_';
  return out;
}

// The title of an edge's plot: the point, the edge and what was measured there.
std::string EdgePlotTitle(size_t index, const Point& point, const std::string& cell,
                          const EdgeTiming& timing, const EdgeMeasurement& m) {
  std::string title =
      "point " + std::to_string(index) + " (" + point.Describe() + "), " + cell + " " + timing.edge;
  title += ": ZVS " + std::string(ZvsClassName(m.zvs)) + ", v_turn_on " +
           FormatEngineering(m.Get("v_turn_on_v"), 3) + " V";
  double margin = m.Get("zvs_energy_margin");
  if (std::isfinite(margin)) title += ", margin " + FormatEngineering(margin, 3);
  return title;
}

// One SVG per edge the evaluation measured, at the instants it measured it.
bool WriteEdgePlots(const PreparedSweep& sweep, const PointEvaluation& ev, const std::string& dir,
                    const std::string& stem, WaveformExport* item) {
  const Point& point = sweep.points[item->index];
  for (size_t k = 0; k < ev.edges.size() && k < ev.result.edges.size(); ++k) {
    const CellSpec& cell = sweep.tmpl.cells[ev.edges[k].cell];
    const EdgeTiming& timing = ev.edges[k].timing;
    std::string title = EdgePlotTitle(item->index, point, cell.name, timing, ev.result.edges[k]);
    std::string name = stem + "_" + Safe(cell.name) + "_" + Safe(timing.edge) + ".svg";
    Plot plot = EdgeWaveformPlot(ev.settled, cell, timing, title, name);
    std::string path = (std::filesystem::path(dir) / name).string();
    if (!WriteFileAtomically(path, plot.svg, &item->reason)) return false;
    item->files.push_back(path);
  }
  return true;
}

}  // namespace

std::vector<size_t> WorstPoints(const std::vector<PointResult>& results) {
  // Per (cell, edge): the best candidate by margin and by residual excess.
  struct Worst {
    size_t margin_index = 0, excess_index = 0;
    double margin = std::nan(""), excess = std::nan("");
  };
  std::map<std::pair<std::string, std::string>, Worst> worst;
  for (const PointResult& r : results) {
    if (r.status != PointStatus::kOk) continue;
    for (const EdgeMeasurement& m : r.edges) {
      Worst& w = worst[{m.cell, m.edge}];
      double margin = m.Get("zvs_energy_margin");
      if (std::isfinite(margin) && (std::isnan(w.margin) || margin < w.margin)) {
        w.margin = margin;
        w.margin_index = r.index;
      }
      double excess = m.Get("v_turn_on_v") - m.Get("v_residual_limit_v");
      if (std::isfinite(excess) && (std::isnan(w.excess) || excess > w.excess)) {
        w.excess = excess;
        w.excess_index = r.index;
      }
    }
  }
  std::vector<size_t> out;
  for (const auto& [key, w] : worst) {
    if (!std::isnan(w.margin)) {
      out.push_back(w.margin_index);
    } else if (!std::isnan(w.excess)) {
      out.push_back(w.excess_index);
    }
  }
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

bool ParseWaveformSelection(const std::string& text, bool* worst, std::vector<size_t>* indices,
                            std::string* error) {
  *worst = false;
  indices->clear();
  std::stringstream in(text);
  std::string item;
  while (std::getline(in, item, ',')) {
    item = Trim(item);
    if (item == "worst") {
      *worst = true;
      continue;
    }
    if (item.empty() || item.find_first_not_of("0123456789") != std::string::npos ||
        item.size() > 18) {
      *error =
          "waveform selection '" + text + "': '" + item + "' is neither a point index nor 'worst'";
      return false;
    }
    indices->push_back(std::stoull(item));
  }
  if (!*worst && indices->empty()) {
    *error = "waveform selection is empty (give point indices or 'worst')";
    return false;
  }
  return true;
}

std::string WaveformDir(const std::string& out_dir) {
  return (std::filesystem::path(out_dir) / "waveforms").string();
}

std::vector<WaveformExport> ExportWaveforms(const PreparedSweep& sweep,
                                            const std::vector<size_t>& indices,
                                            const std::string& out_dir, Simulator& simulator) {
  std::vector<WaveformExport> out;
  std::string dir = WaveformDir(out_dir);
  std::error_code ec;
  std::filesystem::create_directories(dir, ec);
  PointEvaluator evaluator(sweep);
  for (size_t index : indices) {
    WaveformExport item;
    item.index = index;
    if (index >= sweep.points.size()) {
      item.reason = "no point " + std::to_string(index) + " (the sweep has " +
                    std::to_string(sweep.points.size()) + ")";
      out.push_back(item);
      continue;
    }
    if (ec) {
      item.reason = dir + ": cannot create: " + ec.message();
      out.push_back(item);
      continue;
    }
    const Point& point = sweep.points[index];
    PointEvaluation ev = evaluator.EvaluateFully(point, simulator, true);
    const PointResult& result = ev.result;
    if (result.status != PointStatus::kOk || ev.settled.time().empty()) {
      item.reason = std::string(PointStatusName(result.status)) + ": " + result.reason;
      out.push_back(item);
      continue;
    }
    std::string stem = "point_" + std::to_string(index);
    std::string raw_path = (std::filesystem::path(dir) / (stem + ".raw")).string();
    std::ostringstream raw;
    WriteRawFile(raw, ev.settled,
                 {"zvsmap point " + std::to_string(index) + ": " + point.Describe(), RawFileDate(),
                  "Transient Analysis"});
    if (!WriteFileAtomically(raw_path, raw.str(), &item.reason)) {
      out.push_back(item);
      continue;
    }
    item.files.push_back(raw_path);
    item.ok = WriteEdgePlots(sweep, ev, dir, stem, &item);
    out.push_back(item);
  }
  return out;
}

}  // namespace zvsmap
