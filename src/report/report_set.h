// Every report of a run, written from the points and their results.
#pragma once

#include <string>
#include <vector>

#include "netlist/template.h"
#include "report/dead_time_envelope.h"
#include "report/tolerance_report.h"
#include "report/zvs_boundary.h"
#include "result/point_result.h"
#include "sweep/point.h"
#include "sweep/refine_spec.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// What the reports are made from: the sweep, its points and one result per
/// point (results[i] belongs to points[i]; a point not run has no result and
/// is passed as NotRunResult: status kNotRun, reason "not run").
struct ReportInput {
  const SweepSpec& spec;
  const Template& tmpl;
  const std::vector<Point>& points;
  const std::vector<PointResult>& results;
  /// How far adaptive refinement got (summary.xml's <refinement>); unused
  /// (`used` false) for a sweep without <refine>.
  RefinementOutcome refinement = {};
};

/// The input with what every report derives from it, derived once (by
/// WriteReports) and handed to each writer: the grid, the measured edges, the
/// margin, the dead-time window columns and the envelope's dead time.
struct ReportBasis : ReportInput {
  /// Derives grid, edges, margin, window and envelope from `input` (whose
  /// sweep, points and results must outlive the basis).
  explicit ReportBasis(const ReportInput& input);

  Grid grid;                   ///< BuildGrid(spec, points)
  std::vector<EdgeKey> edges;  ///< MeasuredEdges(results)
  MarginSource margin;         ///< ChooseMargin(results)
  WindowColumns window;        ///< FindWindowColumns(results)
  DeadTimeEnvelope envelope;   ///< ComputeDeadTimeEnvelope(grid, results, edges)
  /// The tolerance variants summarized by nominal point (WriteReports fills
  /// it from every point before the basis is made from the nominal ones).
  ToleranceSummary tolerance = {};
};

/// What writing the reports found out, for the verdict and the exit status.
struct ReportOutcome {
  std::vector<std::string> files;  ///< paths written
  int requirements_total = 0;
  int requirements_failed = 0;
};

/// Writes every report into `dir` (which exists): edges.csv, summary.xml,
/// tolerance.csv (with <tolerances>: the variants are summarized by nominal
/// point, every other report sees the nominal points only),
/// junit.xml, deadtime_schedule.csv (when the results carry the probe's
/// window), the SVG plots and index.html; evaluates the sweep's requirements
/// and fills `outcome` (files written, requirements total and failed). Returns
/// false with `error` when a file cannot be written.
bool WriteReports(const ReportInput& input, const std::string& dir, ReportOutcome* outcome,
                  std::string* error);

}  // namespace zvsmap
