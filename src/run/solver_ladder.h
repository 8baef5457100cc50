// The convergence ladder applied to one point: the point's whole pipeline is
// re-run under each rung of the sweep's `solver-aid` setting until a run does
// not fail the way stiff switching fails (sim/solver_aids.h).
#pragma once

#include <functional>
#include <string>
#include <utility>
#include <vector>

#include "core/diagnostic.h"
#include "result/point_result.h"
#include "sim/solver_aids.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// One attempt at a point with the given (aided) simulator.
using PointAttempt = std::function<PointResult(AidedSimulator& simulator)>;

/// Runs `attempt` for each rung of `sim.solver_aid` (see SolverAidRungs) and
/// returns the first result that is not a stiff failure, with `solver_aid`
/// set to the rung's name and `wall_s` covering every attempt. When every rung
/// fails, returns the unaided attempt's result with the aids tried appended to
/// its reason and an empty `solver_aid`. Stops early when the engine became
/// unusable.
PointResult RunSolverLadder(const SimulationSettings& sim, Simulator& simulator,
                            const PointAttempt& attempt);

/// Adds an error (at the <simulation> element) and returns false when the
/// sweep's `solver-aid` value is not "auto", "off" or an aid's name.
bool CheckSolverAidSetting(const SweepSpec& spec, std::vector<Diagnostic>* errors);

}  // namespace zvsmap
