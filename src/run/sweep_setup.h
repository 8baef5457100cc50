// Loading everything a run needs before any simulation starts.
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "netlist/device_models.h"
#include "netlist/template.h"
#include "run/refinement.h"
#include "sweep/point.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// A sweep ready to run: the parsed file, its template and its points.
struct PreparedSweep {
  SweepSpec spec;
  Template tmpl;
  std::vector<Point> points;
  std::vector<ResolvedDevice> devices;  ///< the sweep's <device> models, checked
  std::vector<Diagnostic> warnings;     ///< not fatal (run/sweep_checks.h); printed before a run
  /// Adaptive refinement (<refine>): `points` are round 0 on the fine
  /// lattice, `spec`'s refined axes hold the lattice's values; inactive otherwise.
  RefinementPlan refinement = {};
};

/// Parses the sweep file, loads its template, checks every parameter name
/// against the template, checks the <device> models (files, subcircuits, pin
/// maps, roles) and expands the points (with <refine>: round 0 of the
/// refinement, see StartRefinement). `max_points_override` > 0
/// replaces the file's limit. All problems found are returned (at least one
/// on failure); nothing is simulated.
bool PrepareSweep(const std::string& sweep_path, size_t max_points_override, PreparedSweep* out,
                  std::vector<Diagnostic>* errors);

}  // namespace zvsmap
