#include "run/point_evaluator.h"

#include <algorithm>
#include <chrono>

#include "analysis/commutation.h"
#include "analysis/edge_finder.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "handcalc/hand_calculation.h"
#include "result/edge_identity.h"
#include "run/operating_point_measure.h"
#include "run/solver_ladder.h"
#include "sim/engine_messages.h"
#include "sim/steady_state.h"

namespace zvsmap {

PointEvaluator::PointEvaluator(const SweepSpec& spec, const Template& tmpl)
    : spec_(spec), tmpl_(tmpl) {
  std::vector<Diagnostic> errors;
  if (!ResolveSweepDevices(spec_, tmpl_, &devices_, &errors)) devices_error_ = errors[0].Format();
}

PointEvaluator::PointEvaluator(const PreparedSweep& sweep)
    : spec_(sweep.spec), tmpl_(sweep.tmpl), devices_(sweep.devices) {}

bool PointEvaluator::RenderFor(const Point& point, const Variables& resolved,
                               const TranSettings& tran, Deck* deck, std::string* why) const {
  *deck = RenderDeck(tmpl_, resolved, tran, VectorsToSave(tmpl_));
  if (point.devices.empty()) return true;
  if (!devices_error_.empty()) {
    *why = devices_error_;
    return false;
  }
  if (point.device_params.empty()) {
    return ApplyDevicesToDeck(tmpl_, devices_, point.devices, deck, why);
  }
  // A tolerance variant of a device parameter: that device with its value.
  return ApplyDevicesToDeck(tmpl_, WithDeviceParams(devices_, point.device_params), point.devices,
                            deck, why);
}

namespace {

// The declared dead times of the template's cells at a resolved point (those
// that resolve to a positive value).
std::vector<double> DeadTimes(const Template& tmpl, const Variables& resolved) {
  std::vector<double> out;
  for (const auto& cell : tmpl.cells) {
    for (const auto* name : {&cell.high_dead, &cell.low_dead}) {
      auto it = resolved.find(*name);
      if (!name->empty() && it != resolved.end() && it->second > 0) out.push_back(it->second);
    }
  }
  return out;
}

}  // namespace

MeasuredRun MeasuredRunFor(const SweepSpec& spec, const Template& tmpl,
                           const Variables& resolved, double period_s) {
  const double lead = MeasureLead(spec, tmpl);
  // An edge whose turn-off command falls just before the measured period's
  // end has its turn-on a dead time later, and FindEdgesFrom wants the turn-on
  // kEdgeGuardPeriods before the data's end; without a declared dead time,
  // a twentieth of the period (common practice for a dead time's upper end).
  double dead = period_s / 20;
  std::vector<double> declared = DeadTimes(tmpl, resolved);
  if (!declared.empty()) dead = *std::max_element(declared.begin(), declared.end());
  MeasuredRun run;
  run.lead = lead;
  run.periods = run.lead + 1 + std::min(dead / period_s, 1.0) + 2 * kEdgeGuardPeriods;
  return run;
}

TranSettings PointEvaluator::TranFor(const Variables& resolved, double period_s) const {
  const SimulationSettings& sim = spec_.simulation;
  TranSettings tran;
  const MeasuredRun measured = MeasuredRunFor(spec_, tmpl_, resolved, period_s);
  tran.tstop_s = (sim.settle_periods + measured.periods + kPeriodOverrun) * period_s;
  tran.tstart_s = sim.settle_periods * period_s;
  tran.reltol = sim.reltol;
  if (sim.max_step_s > 0) {
    tran.max_step_s = sim.max_step_s;
  } else {
    // Resolve the dead-time transition: a twentieth of the shortest declared
    // dead time, and never coarser than 1/500 of the period (common practice).
    double step = period_s / 500;
    for (double dead : DeadTimes(tmpl_, resolved)) step = std::min(step, dead / 20);
    tran.max_step_s = step;
  }
  return tran;
}

namespace {

// `tran` (step bound and tolerances) for a run of whole periods from t = 0,
// every sample stored (the settling runs read each period's ripple). The run
// goes 1 % of a period past the last boundary: ngspice failed ("Timestep too
// small") when tstop fell exactly on a command edge.
TranSettings TranForPeriods(TranSettings tran, double period_s, double periods) {
  tran.tstop_s = (periods + kPeriodOverrun) * period_s;
  tran.tstart_s = 0;
  return tran;
}

// The engine's log with every line's netlist references mapped (see MapEngineLines).
std::string MapEngineLog(const std::string& log, const Deck& deck) {
  std::string out;
  size_t start = 0;
  while (start < log.size()) {
    size_t end = log.find('\n', start);
    if (end == std::string::npos) end = log.size();
    out += MapEngineLines(log.substr(start, end - start), deck);
    if (end < log.size()) out += "\n";
    start = end + 1;
  }
  return out;
}

// `values` with parameter `name` set to `value`.
void SetValue(std::vector<ParamValue>* values, const std::string& name, double value) {
  auto it = std::find_if(values->begin(), values->end(),
                         [&](const ParamValue& v) { return Lower(v.name) == name; });
  if (it != values->end()) {
    it->value = value;
  } else {
    values->push_back({name, value});
  }
}

// The point's values with each slow state's init parameter set to `z` and,
// when `z` has one more entry, the control parameter set to it.
std::vector<ParamValue> WithUnknowns(std::vector<ParamValue> values, const std::vector<double>& z,
                                     const Template& tmpl) {
  for (size_t i = 0; i < z.size() && i < tmpl.states.size(); ++i) {
    SetValue(&values, tmpl.states[i].init_param, z[i]);
  }
  if (z.size() > tmpl.states.size()) SetValue(&values, tmpl.regulation.param, z.back());
  return values;
}

// What the steady-state search did, as the point result records it: the
// settled state and (regulated) the control, as the parameters that
// reproduce the settled period.
void RecordSettling(const SteadyStateResult& ss, const Template& tmpl, SettleRecord* out) {
  out->method = ss.method;
  out->iterations = ss.iterations;
  out->periods = ss.periods;
  out->residual = ss.residual;
  for (size_t i = 0; i < tmpl.states.size() && i < ss.state.size(); ++i) {
    out->initial_state.push_back({tmpl.states[i].init_param, ss.state[i]});
  }
  if (!std::isnan(ss.control)) out->initial_state.push_back({tmpl.regulation.param, ss.control});
  // The Jacobian for the chain successor's warm start, only when every entry
  // is finite (the store keeps numbers, not NaN) and it fits the unknowns.
  const size_t m = out->initial_state.size();
  if (ss.jacobian.size() != m) return;
  std::vector<double> flat;
  for (const auto& row : ss.jacobian) {
    if (row.size() != m) return;
    for (double v : row) {
      if (!std::isfinite(v)) return;
      flat.push_back(v);
    }
  }
  out->jacobian = std::move(flat);
}

// Regulation tolerance: the average within 1e-4 of the set point, ten times
// inside the 0.1 % a designer reads as "at the set point" (common practice).
constexpr double kRegulationTolerance = 1e-4;

// The control unknown of a regulated point: false (open loop) when the
// template declares no control or the sweep asks for open loop.
bool RegulatedControl(const Template& tmpl, const SimulationSettings& sim, const Variables& params,
                      ControlUnknown* out) {
  const RegulationSpec& r = tmpl.regulation;
  if (!RunsRegulated(r, sim)) return false;
  out->vector = r.vector;
  out->target = params.at(r.target);
  out->min = r.min;
  out->max = r.max;
  out->initial = std::min(r.max, std::max(r.min, params.at(r.param)));
  out->tolerance = kRegulationTolerance;
  return true;
}

// The loop the point ran in, for its operating-point record.
LoopSetting LoopOf(const Template& tmpl, const Variables& params, const SteadyStateResult& ss) {
  LoopSetting s;
  const RegulationSpec& r = tmpl.regulation;
  if (!r.declared()) return s;
  s.loop = std::isnan(ss.control) ? LoopKind::kOpen : LoopKind::kRegulated;
  s.control = s.loop == LoopKind::kRegulated ? ss.control : params.at(r.param);
  s.set_point = params.at(r.target);
  return s;
}

// The steady-state search as the sweep's <simulation> sets it.
SteadyStateOptions SettleOptions(const SimulationSettings& sim) {
  SteadyStateOptions options;
  options.method = sim.settle_method;
  options.tolerance = sim.settle_tolerance;
  options.max_newton = sim.max_newton;
  options.max_periods = sim.max_periods;
  options.chunk_periods = std::max(1, std::min(sim.settle_periods, sim.max_periods));
  return options;
}

}  // namespace

bool PointEvaluator::RenderPointDeck(const Point& point, Deck* deck, Diagnostic* error) const {
  Variables resolved;
  double period = 0;
  if (!ResolveParams(tmpl_, point.values, &resolved, error)) return false;
  if (!ResolvePeriod(tmpl_, resolved, &period, error)) return false;
  std::string why;
  if (!RenderFor(point, resolved, TranFor(resolved, period), deck, &why)) {
    *error = Diagnostic{{spec_.path, 0, 0}, why, {}};
    return false;
  }
  return true;
}

bool PointEvaluator::Render(const Point& point, std::string* netlist, Diagnostic* error) const {
  Deck deck;
  if (!RenderPointDeck(point, &deck, error)) return false;
  *netlist = deck.Text();
  // A fixed solver aid is part of what runs (its setting is in the content hash).
  std::vector<const SolverAid*> rungs = SolverAidRungs(spec_.simulation.solver_aid);
  if (rungs.size() == 1) {
    *netlist = ApplySolverAid(*netlist, rungs[0], spec_.simulation.reltol, true);
  }
  return true;
}

PointResult PointEvaluator::Evaluate(const Point& point, Simulator& simulator,
                                     Waveforms* settled) const {
  PointEvaluation ev = EvaluateFully(point, simulator, settled != nullptr);
  if (settled) *settled = std::move(ev.settled);
  return std::move(ev.result);
}

PointResult PointEvaluator::EvaluateWarm(const Point& point, Simulator& simulator,
                                         const WarmStart* warm) const {
  PointEvaluation ev;
  Prepare(point, &ev);
  ev.warm_start = warm;
  Simulate(point, simulator, false, &ev);
  return std::move(ev.result);
}

bool PointEvaluator::Prepare(const Point& point, PointEvaluation* out) const {
  *out = PointEvaluation();
  out->resolved = ResolveParams(tmpl_, point.values, &out->params, &out->error) &&
                  ResolvePeriod(tmpl_, out->params, &out->period_s, &out->error);
  if (!out->resolved) return false;
  out->hand_ok = ComputeHandCalculation(spec_, tmpl_, out->params, &out->hand, &out->hand_error);
  return true;
}

void PointEvaluator::Simulate(const Point& point, Simulator& simulator, bool keep_waveforms,
                              PointEvaluation* ev) const {
  ev->result = RunSolverLadder(spec_.simulation, simulator, [&](AidedSimulator& aided) {
    if (ev->resolved) return EvaluateOnce(point, aided, ev, keep_waveforms);
    PointResult failed;
    failed.index = point.index;
    failed.reason = ev->error.Format();
    return failed;
  });
}

PointEvaluation PointEvaluator::EvaluateFully(const Point& point, Simulator& simulator,
                                              bool keep_waveforms) const {
  PointEvaluation ev;
  Prepare(point, &ev);
  Simulate(point, simulator, keep_waveforms, &ev);
  return ev;
}

PointResult PointEvaluator::EvaluateOnce(const Point& point, AidedSimulator& simulator,
                                         PointEvaluation* ev, bool keep_waveforms) const {
  auto started = std::chrono::steady_clock::now();
  PointResult result;
  result.index = point.index;
  ev->edges.clear();
  ev->settled = Waveforms();
  auto finish = [&]() {
    result.wall_s =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
    return result;
  };
  const double period = ev->period_s;

  // Settle: the slow states start from the template's own init expressions
  // (the average-model state); each run re-renders with the init params set.
  const SimulationSettings& sim = spec_.simulation;
  const std::vector<std::string> vectors = VectorsToSave(tmpl_);
  std::vector<SlowState> states;
  for (const auto& s : tmpl_.states) {
    states.push_back({s.vector, ev->params.at(s.init_param), SlowStateFloor(s.vector)});
  }
  // The last deck handed to the engine: its messages about netlist lines are
  // mapped back to the user's file:line through it.
  Deck last_deck;
  auto render = [&](const std::vector<double>& x, double periods, std::string* netlist,
                    std::string* why) {
    Variables r;
    Diagnostic d;
    if (!ResolveParams(tmpl_, WithUnknowns(point.values, x, tmpl_), &r, &d)) {
      *why = d.Format();
      return false;
    }
    if (!RenderFor(point, r, TranForPeriods(TranFor(r, period), period, periods), &last_deck,
                   why)) {
      return false;
    }
    *netlist = last_deck.Text();
    return true;
  };
  const MeasuredRun measured = MeasuredRunFor(spec_, tmpl_, ev->params, period);
  SteadyStateOptions options = SettleOptions(sim);
  if (simulator.SettlesAsItMeasures()) options.trial_periods = measured.periods;
  if (sim.warm_start) options.warm = ev->warm_start;
  ControlUnknown control;
  const bool regulated = RegulatedControl(tmpl_, sim, ev->params, &control);
  SteadyStateResult ss =
      regulated
          ? FindRegulatedSteadyState(simulator, render, vectors, states, control, period, options)
          : FindPeriodicSteadyState(simulator, render, vectors, states, period, options);
  RecordSettling(ss, tmpl_, &result.settle);
  if (!ss.ok) {
    result.reason = "while settling: " + MapEngineLines(ss.error, last_deck);
    result.log = MapEngineLog(ss.log, last_deck);
    return finish();
  }
  if (!ss.settled) {
    // Not measured: numbers from an unsettled period would look trustworthy.
    result.status = PointStatus::kUnsettled;
    result.reason =
        "not settled after " + std::to_string(ss.periods) + " periods: residual " +
        FormatNumber(ss.residual) + " > tolerance " + FormatNumber(options.tolerance) +
        " (relative to the ripple" +
        (regulated ? std::string(", with ") + tmpl_.regulation.param + " held in [" +
                         FormatNumber(control.min) + ", " + FormatNumber(control.max) +
                         "] to regulate " + control.vector + " at " + FormatNumber(control.target)
                   : std::string()) +
        ")" +
        (ss.control_pinned
             ? "; " + tmpl_.regulation.param + " stopped at the bound " + FormatNumber(ss.control) +
                   " of its range, so the set point is out of its reach"
             : std::string());
    return finish();
  }

  // The measured run (MeasuredRunFor) from the settled state; the Newton run
  // that verified the settled state is that run when it settled so.
  std::string why;
  std::vector<double> x = SettledUnknowns(ss);
  SimulationOutput out = std::move(ss.final_run);
  if (!out.ok) {
    simulator.SetMeasuring(true);
    out = RunFromState(simulator, render, vectors,
                       SearchUnknowns(states, regulated ? &control : nullptr), period,
                       measured.periods, -1, &x, &why);
    result.settle.periods += measured.periods;
  }
  if (!out.ok) {
    result.reason = why.empty() ? MapEngineLines(out.error, last_deck) : why;
    result.log = MapEngineLog(out.log, last_deck);
    return finish();
  }
  const double from = measured.lead * period;
  if (!MeasureCells(out, from, ev, &result)) return finish();
  result.operating = MeasureOperatingPoint(tmpl_, out.waves, from, from + period,
                                           LoopOf(tmpl_, ev->params, ss));
  if (sim.probe) ProbeEdges(point, WithUnknowns(point.values, x, tmpl_), simulator, *ev, &result);
  result.status = PointStatus::kOk;
  if (keep_waveforms) ev->settled = std::move(out.waves);
  return finish();
}

bool PointEvaluator::MeasureCells(const SimulationOutput& out, double from_s,
                                  PointEvaluation* ev, PointResult* result) const {
  for (size_t c = 0; c < tmpl_.cells.size(); ++c) {
    const CellSpec& cell = tmpl_.cells[c];
    std::vector<EdgeTiming> edges = FindEdgesFrom(cell, out.waves, ev->period_s, from_s);
    EdgeParams edge_params = EdgeParamsFor(cell, ev->params);
    edge_params.period_s = ev->period_s;
    for (EdgeKind kind : kEdgeKinds) {
      const char* name = EdgeKindName(kind);
      auto it = std::find_if(edges.begin(), edges.end(),
                             [&](const EdgeTiming& e) { return e.edge == name; });
      if (it == edges.end()) {
        result->edges.clear();
        ev->edges.clear();
        result->reason = "edge '" + cell.name + "." + name +
                         "' not found in the measured period (check the command signals)";
        result->log = out.log;
        return false;
      }
      result->edges.push_back(MeasureEdge(cell, out.waves, *it, spec_.zvs, edge_params));
      ev->edges.push_back({c, *it});
    }
  }
  // Hand calculation beside the measured edges (src/handcalc), computed once
  // per point by Prepare. A formula that fails leaves its columns empty and
  // says why; the point itself stays ok.
  AddComparisons(ev->hand, &result->edges);
  if (!ev->hand_ok) {
    Diagnostic hand = ev->hand_error;
    hand.source_line.clear();
    result->reason = "hand calculation: " + hand.Format();
  }
  return true;
}

}  // namespace zvsmap
