// What a sweep file says, after parsing and validation: the template, the
// axes, fixed and derived values, simulation settings and the ZVS criterion.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "result/settle_record.h"
#include "sweep/device_spec.h"
#include "sweep/prediction_spec.h"
#include "sweep/refine_spec.h"
#include "sweep/requirement_spec.h"
#include "sweep/tolerance_spec.h"

namespace zvsmap {

/// One swept parameter and its values, in the order they are visited.
struct AxisSpec {
  std::string param;           ///< "" for a device axis
  std::vector<double> values;  ///< a device axis: indices into device_names
  SourceLocation where;
  /// A device axis (<axis device="leg.high leg.low" values="wbg sj"/>): the
  /// switch roles ("cell.high"/"cell.low", lower-case) it assigns and the
  /// device names it visits, as written.
  std::vector<std::string> device_roles = {};
  std::vector<std::string> device_names = {};
};

/// Axes that combine as one grid dimension. A plain <axis> is a group of one;
/// a <lockstep> group advances all its axes together (equal lengths).
struct AxisGroup {
  std::vector<AxisSpec> axes;
  bool lockstep = false;
  SourceLocation where;
  size_t size() const { return axes.empty() ? 0 : axes.front().values.size(); }
};

/// A parameter held at one value for the whole sweep.
struct FixedValue {
  std::string param;
  double value = 0;
  SourceLocation where;
};

/// A parameter computed per point from an expression over other parameters
/// (evaluated with core/expression; e.g. duty from Vout and Vin).
struct DerivedValue {
  std::string param;
  std::string expression;
  SourceLocation where;
};

/// The lead of a measured run when neither the sweep nor the template sets
/// one: a whole period, in which the states not set at t = 0 settle
/// (DEVELOPERS.md "Measured run").
constexpr double kDefaultMeasureLead = 1;

/// The range of a measured run's lead, in periods.
constexpr double kMinMeasureLead = 0.05, kMaxMeasureLead = 100;

/// How each point is simulated.
struct SimulationSettings {
  int settle_periods = 60;  ///< periods simulated before the measured one (brute force)
  /// The measured run from the settled state: a lead, then the measured
  /// period, then the last edge's dead time and a guard; each edge is taken
  /// from its first occurrence that starts in the measured period. The lead
  /// lets the states that are not set at t = 0 (switch capacitances of vendor
  /// models, gate drives, rectifier junctions) settle before anything is
  /// measured (DEVELOPERS.md "Measured run"). `measure-lead`; NaN = not set:
  /// the template's `*@ measure lead=`, else kDefaultMeasureLead
  /// (Template::MeasureLead).
  double measure_lead = std::numeric_limits<double>::quiet_NaN();
  double max_step_s = 0;  ///< .tran step bound; 0 = derived from period and dead time
  double reltol = 1e-4;   ///< ngspice RELTOL
  double timeout_s = 0;   ///< per-point wall-clock limit; 0 = derived
  /// Settling: kShooting (Newton on the template's slow states, falling back
  /// to period by period) or kPeriods (period by period only, in runs of
  /// settle_periods, stopping when the last 20 period-boundary states lie
  /// within the tolerance of the latest one and the geometric-decay estimate of
  /// the remaining distance is within it too; see sim/steady_state.h).
  SettleMethod settle_method = SettleMethod::kShooting;
  double settle_tolerance = 1e-3;  ///< relative to each state's ripple (floors 1 mA / 1 mV)
  int max_newton = 8;              ///< Newton iterations before falling back
  int max_periods = 1000;          ///< periods simulated in all while settling
  /// The convergence ladder (sim/solver_aids.h): "auto" (retry a stiff
  /// failure with each automatic aid), "off", or one aid's name (every run).
  std::string solver_aid = "auto";
  /// Probe runs (`probe="on"`, the default, or "off"): one more run per edge
  /// from the settled state with the incoming turn-on withheld, giving the
  /// dead-time window (analysis/dead_time_window.h).
  bool probe = true;
  /// The loop (`loop="regulated"` or "open"): regulated holds the template's
  /// `*@ regulate` quantity at its set point by solving for its `*@ control`
  /// parameter (sim/steady_state.h); open keeps the control's own value.
  /// kDefault = regulated when the template declares a control, else open.
  enum class Loop { kDefault, kOpen, kRegulated };
  Loop loop = Loop::kDefault;
  /// Warm starts (`warm-start="on"`, the default, or "off"): a point settles
  /// from its chain predecessor's settled state and Jacobian
  /// (sweep/chain_layout.h) instead of the average model. "off" starts every
  /// point from the average model (DEVELOPERS.md "Warm starts" compares both).
  bool warm_start = true;
  SourceLocation where;
};

/// The ZVS criterion: the incoming switch's voltage at its turn-on command must
/// not exceed `value` volts (kAbsolute) or `value` times the rail (kFraction).
struct ZvsCriterion {
  enum class Kind { kAbsolute, kFraction };
  Kind kind = Kind::kFraction;
  double value = 0.1;
  /// The residual-voltage limit for a given rail voltage.
  double Limit(double rail_v) const { return kind == Kind::kAbsolute ? value : value * rail_v; }
  /// Human-readable form written into outputs, e.g. "v_turn_on <= 10% of rail".
  std::string Describe() const;
};

/// A parsed, validated sweep file.
struct SweepSpec {
  std::string path;           ///< the sweep file as given
  std::string template_path;  ///< resolved relative to the sweep file's folder
  SourceLocation template_where;
  std::vector<FixedValue> fixed;
  std::vector<AxisGroup> groups;  ///< in file order; the first varies slowest
  std::vector<DerivedValue> derived;
  SimulationSettings simulation;
  ZvsCriterion zvs;
  size_t max_points = 10000;  ///< grid size limit (file's <limits max-points>, CLI can override)
  SourceLocation
      limits_where;  ///< the <limits> element, else the <sweep> root (for the size error)
  std::vector<RequirementSpec> requirements;  ///< <require> elements, in file order
  std::vector<PredictionSpec> predictions;    ///< <predict> elements, in file order
  std::vector<DeviceSpec> devices;            ///< <device> elements, in file order
  /// Not fatal, found while reading: numbers with unit letters SPICE ignores
  /// ("10uH"), each at its attribute with a caret. Printed before a run.
  std::vector<Diagnostic> warnings;
  /// <refine> elements, in file order (checked against the axes; empty: no
  /// adaptive refinement, the grid is run as it is).
  std::vector<RefineSpec> refine = {};
  /// The <tolerances> block (`used` false when the file has none).
  ToleranceSpec tolerances = {};

  /// Number of points of the crossed grid (product of group sizes).
  size_t GridSize() const;
  /// Every parameter the sweep names (fixed, axes, derived) with where it is named.
  std::vector<std::pair<std::string, SourceLocation>> NamedParams() const;
};

}  // namespace zvsmap
