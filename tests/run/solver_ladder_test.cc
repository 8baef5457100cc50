#include "run/solver_ladder.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "report/solver_aid_use.h"

namespace zvsmap {
namespace {

const char kNetlist[] = "r1 a 0 1k\n.tran 1n 1u\n.end\n";

// Fails like ngspice on stiff switching ("Timestep too small") unless the
// netlist carries one of `cures`; counts the runs.
class PickySimulator : public Simulator {
 public:
  std::vector<std::string> cures;
  bool poison = false;
  int runs = 0;
  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>&,
                       double) override {
    ++runs;
    SimulationOutput out;
    out.poisoned = poison;
    for (const auto& c : cures) out.ok = out.ok || netlist.find(c) != std::string::npos;
    if (!out.ok) out.error = "engine error: doAnalyses: TRAN:  Timestep too small";
    return out;
  }
};

// One attempt = one run; ok when the run is.
PointResult Attempt(AidedSimulator& simulator) {
  PointResult r;
  SimulationOutput out = simulator.Run(kNetlist, {}, 1e-6);
  r.status = out.ok ? PointStatus::kOk : PointStatus::kFailed;
  r.reason = out.error;
  r.wall_s = 1;
  return r;
}

TEST(SolverLadderTest, ClimbsUntilAnAidWorksAndNamesIt) {
  PickySimulator sim;
  sim.cures = {"gmin="};
  SimulationSettings settings;
  PointResult r = RunSolverLadder(settings, sim, Attempt);
  EXPECT_EQ(r.status, PointStatus::kOk);
  EXPECT_EQ(r.solver_aid, "gmin");
  EXPECT_EQ(sim.runs, 3);  // unaided, rshunt, gmin
  EXPECT_EQ(r.wall_s, 3);  // every attempt counted
}

TEST(SolverLadderTest, AnUnaidedSuccessSaysNone) {
  PickySimulator sim;
  sim.cures = {".end"};
  PointResult r = RunSolverLadder(SimulationSettings{}, sim, Attempt);
  EXPECT_EQ(r.solver_aid, "none");
  EXPECT_EQ(sim.runs, 1);
}

TEST(SolverLadderTest, OffRunsOnceAndAFixedAidRunsOnlyThatAid) {
  PickySimulator sim;
  sim.cures = {"rshunt="};
  SimulationSettings settings;
  settings.solver_aid = "off";
  PointResult r = RunSolverLadder(settings, sim, Attempt);
  EXPECT_EQ(r.status, PointStatus::kFailed);
  EXPECT_EQ(r.reason, "engine error: doAnalyses: TRAN:  Timestep too small");
  EXPECT_EQ(sim.runs, 1);
  settings.solver_aid = "rshunt";
  r = RunSolverLadder(settings, sim, Attempt);
  EXPECT_EQ(r.solver_aid, "rshunt");
  EXPECT_EQ(sim.runs, 2);
}

TEST(SolverLadderTest, WhenEveryAidFailsTheReasonListsThem) {
  PickySimulator sim;
  PointResult r = RunSolverLadder(SimulationSettings{}, sim, Attempt);
  EXPECT_EQ(r.status, PointStatus::kFailed);
  EXPECT_TRUE(r.solver_aid.empty());
  EXPECT_NE(r.reason.find("Timestep too small (solver aids tried, each failed too: rshunt, gmin, "
                          "abstol)"),
            std::string::npos)
      << r.reason;
  EXPECT_EQ(static_cast<size_t>(sim.runs), SolverAidRungs("auto").size());
}

TEST(SolverLadderTest, APoisonedEngineStopsTheLadder) {
  PickySimulator sim;
  sim.poison = true;
  PointResult r = RunSolverLadder(SimulationSettings{}, sim, Attempt);
  EXPECT_EQ(r.status, PointStatus::kFailed);
  EXPECT_EQ(sim.runs, 1);
}

TEST(SolverLadderTest, CountsPerAidInLadderOrder) {
  std::vector<PointResult> results(4);
  results[0].solver_aid = "gmin";
  results[1].solver_aid = "rshunt";
  results[2].solver_aid = "gmin";
  results[3].solver_aid = "none";
  auto counts = CountSolverAids(results);
  ASSERT_EQ(counts.size(), 2u);
  EXPECT_EQ(counts[0], (std::pair<std::string, int>("rshunt", 1)));
  EXPECT_EQ(counts[1], (std::pair<std::string, int>("gmin", 2)));
  EXPECT_EQ(DescribeSolverAidUse(results),
            "3 of 4 points ran with a solver aid (rshunt 1, gmin 2)");
}

}  // namespace
}  // namespace zvsmap
