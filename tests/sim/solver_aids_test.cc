#include "sim/solver_aids.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace zvsmap {
namespace {

const char kNetlist[] =
    "* test\n"
    "r1 a 0 1k\n"
    ".options method=gear reltol=1e-4\n"
    ".tran 1n 1u 0 1n uic\n"
    ".end\n";

// ngspice reads option lines anywhere before `.end`; a later line overrides
// an earlier one (ngspice manual, ch. 15.1). The aid's line must come after
// zvsmap's own `.options` and before `.end`.
TEST(SolverAidsTest, OptionsLineGoesBeforeTheEndLine) {
  std::string out = ApplySolverAid(kNetlist, FindSolverAid("rshunt"), 1e-4, false);
  EXPECT_EQ(out,
            "* test\nr1 a 0 1k\n.options method=gear reltol=1e-4\n.tran 1n 1u 0 1n uic\n"
            ".options rshunt=1e11\n.end\n");
  EXPECT_EQ(ApplySolverAid(kNetlist, nullptr, 1e-4, false), kNetlist);
}

TEST(SolverAidsTest, SettleReltolRelaxesOnlyTheSettlingRuns) {
  const SolverAid* aid = FindSolverAid("settle-reltol");
  ASSERT_NE(aid, nullptr);
  std::string settling = ApplySolverAid(kNetlist, aid, 1e-4, false);
  EXPECT_NE(settling.find(".options reltol=0.001\n.end"), std::string::npos) << settling;
  EXPECT_EQ(ApplySolverAid(kNetlist, aid, 1e-4, true), kNetlist);
  // Never coarser than kMaxSettleReltol: at 1e-3 requested nothing changes.
  EXPECT_EQ(ApplySolverAid(kNetlist, aid, 1e-3, false), kNetlist);
}

TEST(SolverAidsTest, RungsFollowTheSetting) {
  std::vector<const SolverAid*> automatic = SolverAidRungs("auto");
  ASSERT_GE(automatic.size(), 2u);
  EXPECT_EQ(automatic[0], nullptr);  // the unaided run comes first
  for (size_t i = 1; i < automatic.size(); ++i) EXPECT_TRUE(automatic[i]->automatic);
  EXPECT_EQ(SolverAidRungs("off"), std::vector<const SolverAid*>{nullptr});
  EXPECT_EQ(SolverAidRungs("GMIN"), std::vector<const SolverAid*>{FindSolverAid("gmin")});
  EXPECT_TRUE(SolverAidRungs("rshunt=1e9").empty());
  EXPECT_EQ(SolverAidName(nullptr), "none");
}

// The messages are ngspice 39.3's, copied from failing runs' logs.
TEST(SolverAidsTest, StiffFailuresAreRecognisedOthersAreNot) {
  EXPECT_TRUE(IsStiffFailure(
      "while settling: engine error: doAnalyses: TRAN:  Timestep too small; time = 1.2e-06, "
      "timestep = 1.25e-20: trouble with node \"gh\""));
  EXPECT_TRUE(IsStiffFailure("engine error: Transient op failed"));
  EXPECT_TRUE(IsStiffFailure("engine error: gmin stepping failed"));
  EXPECT_TRUE(IsStiffFailure("simulation ended at t=1e-06 before tstop=2e-06"));
  EXPECT_FALSE(IsStiffFailure("engine error: Error: circuit not parsed."));
  EXPECT_FALSE(IsStiffFailure("vector 'v(sw)' not found (available: none)"));
  EXPECT_FALSE(IsStiffFailure("timeout after 120 s"));
}

// A simulator that fails like ngspice on a floating node unless a node shunt
// is present, and records what it was given.
class FloatingNodeSimulator : public Simulator {
 public:
  std::vector<std::string> netlists;
  bool poison = false;
  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>&,
                       double) override {
    netlists.push_back(netlist);
    SimulationOutput out;
    out.poisoned = poison;
    out.ok = netlist.find("rshunt=") != std::string::npos;
    if (!out.ok) out.error = "engine error: Timestep too small; trouble with node \"gh\"";
    return out;
  }
};

TEST(SolverAidsTest, AidedSimulatorAddsTheAidAndNotesPoisoning) {
  FloatingNodeSimulator inner;
  AidedSimulator aided(inner, FindSolverAid("rshunt"), 1e-4);
  EXPECT_TRUE(aided.Run(kNetlist, {}, 1e-6).ok);
  EXPECT_FALSE(aided.poisoned());
  inner.poison = true;
  AidedSimulator plain(inner, nullptr, 1e-4);
  EXPECT_FALSE(plain.Run(kNetlist, {}, 1e-6).ok);
  EXPECT_TRUE(plain.poisoned());
  EXPECT_EQ(inner.netlists.back(), kNetlist);
}

}  // namespace
}  // namespace zvsmap
