// The convergence ladder: solver aids tried, least intrusive first, on a point
// whose runs fail the way ngspice fails on stiff switching ("Timestep too
// small", no convergence, gmin or source stepping failure). Each aid is a few
// ngspice options added to the rendered netlist; the point is re-run from the
// start with it. README ("Solver aids") lists the aids with their measured
// effect on the reference cases (tools/bench-aids).
#pragma once

#include <string>
#include <vector>

#include "sim/simulator.h"

namespace zvsmap {

/// One solver aid.
struct SolverAid {
  const char* name;     ///< as written in edges.csv and in `solver-aid="..."`
  const char* summary;  ///< one line: what it changes
  /// Option assignments added (as one `.options` line) to every run, settling
  /// and measuring; empty when the aid changes the settling runs only.
  const char* options;
  /// > 1: the settling runs use reltol times this factor (at most
  /// kMaxSettleReltol); the measuring run keeps the requested reltol.
  double settle_reltol_factor;
  /// Tried by the ladder. False for an aid whose measured effect on a
  /// reference metric exceeds 0.5 % (it can still be fixed by the sweep).
  bool automatic;
};

/// The largest reltol the settle-reltol aid gives the settling runs.
constexpr double kMaxSettleReltol = 1e-3;

/// Every aid, in ladder order (least intrusive first).
const std::vector<SolverAid>& SolverAids();

/// The aid named `name` (case-insensitive), or null.
const SolverAid* FindSolverAid(const std::string& name);

/// The `solver-aid` values a sweep may give: "auto", "off" and every aid name,
/// comma-separated (for error messages and docs).
std::string SolverAidChoices();

/// The runs a point gets under the sweep setting `setting`: "auto" -> an
/// unaided run, then each automatic aid in order; "off" -> one unaided run;
/// an aid's name -> one run with that aid (fixed). Null stands for the
/// unaided run. An unknown setting yields an empty list (the sweep parser
/// refuses it first).
std::vector<const SolverAid*> SolverAidRungs(const std::string& setting);

/// The name written for a rung: the aid's name, or "none" for null.
std::string SolverAidName(const SolverAid* aid);

/// True when `reason` (a point's failure reason) is the kind of failure the
/// ladder addresses: ngspice's "Timestep too small", "no convergence",
/// "iteration limit reached", gmin or source stepping failed, or a run
/// aborted before tstop.
bool IsStiffFailure(const std::string& reason);

/// `netlist` with the aid's options for a settling (`measuring` false) or the
/// measuring run, as one `.options` line before the final `.end` (ngspice
/// applies later option lines over earlier ones). `reltol` is the requested
/// one. Unchanged for a null aid.
std::string ApplySolverAid(const std::string& netlist, const SolverAid* aid, double reltol,
                           bool measuring);

/// A Simulator that adds one aid to every netlist it passes on, and notes
/// whether the engine became unusable (then the ladder stops).
class AidedSimulator : public Simulator {
 public:
  /// `aid` may be null (runs unchanged); `reltol` is the sweep's requested one.
  AidedSimulator(Simulator& inner, const SolverAid* aid, double reltol)
      : inner_(inner), aid_(aid), reltol_(reltol) {}
  /// From here on the runs are the measuring run (requested reltol).
  void SetMeasuring(bool measuring) { measuring_ = measuring; }
  /// True when a settling run is the same run as a measuring one (no aid, or
  /// one that does not relax the settling runs), so a settled run can be the
  /// measured run.
  bool SettlesAsItMeasures() const {
    return aid_ == nullptr || !(aid_->settle_reltol_factor > 1);
  }
  /// True once a run returned `poisoned`.
  bool poisoned() const { return poisoned_; }
  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>& vectors,
                       double tstop_s) override;

 private:
  Simulator& inner_;
  const SolverAid* aid_;
  double reltol_;
  bool measuring_ = false;
  bool poisoned_ = false;
};

}  // namespace zvsmap
