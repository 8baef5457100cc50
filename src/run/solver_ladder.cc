#include "run/solver_ladder.h"

#include <string>

namespace zvsmap {

PointResult RunSolverLadder(const SimulationSettings& sim, Simulator& simulator,
                            const PointAttempt& attempt) {
  std::vector<const SolverAid*> rungs = SolverAidRungs(sim.solver_aid);
  if (rungs.empty()) rungs.push_back(nullptr);
  PointResult first;
  double wall_s = 0;
  std::string tried;
  for (size_t k = 0; k < rungs.size(); ++k) {
    AidedSimulator aided(simulator, rungs[k], sim.reltol);
    PointResult r = attempt(aided);
    wall_s += r.wall_s;
    bool stiff = r.status == PointStatus::kFailed && IsStiffFailure(r.reason);
    if (!stiff) {
      if (r.status != PointStatus::kFailed) r.solver_aid = SolverAidName(rungs[k]);
      r.wall_s = wall_s;
      return r;
    }
    if (k == 0) {
      first = std::move(r);
    } else {
      tried += (tried.empty() ? "" : ", ") + SolverAidName(rungs[k]);
    }
    if (aided.poisoned()) break;
  }
  if (!tried.empty()) first.reason += " (solver aids tried, each failed too: " + tried + ")";
  first.solver_aid.clear();
  first.wall_s = wall_s;
  return first;
}

bool CheckSolverAidSetting(const SweepSpec& spec, std::vector<Diagnostic>* errors) {
  if (!SolverAidRungs(spec.simulation.solver_aid).empty()) return true;
  errors->push_back(
      Diagnostic{spec.simulation.where, "<simulation solver-aid=\"" + spec.simulation.solver_aid +
                                            "\">: must be one of " + SolverAidChoices()});
  return false;
}

}  // namespace zvsmap
