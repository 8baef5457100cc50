// Integration tests of NgspiceSimulator against the real ngspice library.
// ngspice keeps one global instance per process: every test binary shares one
// simulator (testing/shared_ngspice.h), and the one case that breaks ngspice
// for good runs in a forked child.
#include "sim/ngspice_simulator.h"

#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <memory>
#include <string>

#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

bool Contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

// RC low-pass, 1 V step at t = 0 (uic, capacitor starts empty), tau = 1 us.
const char kRcStep[] =
    "rc step response\n"
    "V1 in 0 DC 1\n"
    "R1 in out 1k\n"
    "C1 out 0 1n IC=0\n"
    ".tran 1n 5u 0 5n uic\n"
    ".end\n";

class NgspiceSimulatorTest : public ::testing::Test {
 protected:
  void SetUp() override { sim_ = &testing_support::SharedNgspice(); }
  NgspiceSimulator* sim_ = nullptr;
};

TEST_F(NgspiceSimulatorTest, RcStepResponse) {
  SimulationOutput out = sim_->Run(kRcStep, {"v(out)", "V(in)"}, 5e-6);
  ASSERT_TRUE(out.ok) << out.error << "\n" << out.log;
  EXPECT_FALSE(out.poisoned);
  EXPECT_TRUE(out.error.empty());
  EXPECT_TRUE(out.waves.Has("time"));
  EXPECT_TRUE(out.waves.Has("v(in)"));
  EXPECT_DOUBLE_EQ(out.waves.time().back(), 5e-6);
  // v(t) = V (1 - exp(-t/RC)): first-order RC step response, any circuits
  // textbook (e.g. Alexander & Sadiku 2017, ch. 7).
  const double expected = 1.0 - std::exp(-1.0);
  EXPECT_NEAR(out.waves.At("v(out)", 1e-6), expected, 0.005 * expected);
  const double expected_3tau = 1.0 - std::exp(-3.0);
  EXPECT_NEAR(out.waves.At("v(out)", 3e-6), expected_3tau, 0.005 * expected_3tau);
  // The log holds ngspice's chatter for this run, with its channel prefix.
  EXPECT_TRUE(Contains(out.log, "stdout Circuit: rc step response")) << out.log;
}

// The stage clocks (EngineTimings) count each run once and its stored time
// points exactly (checked against the time vector the run returns); a failed
// load still counts as a run but stores no samples.
TEST_F(NgspiceSimulatorTest, TimingsCountRunsAndSamples) {
  sim_->ResetTimings();
  SimulationOutput out = sim_->Run(kRcStep, {"v(out)"}, 5e-6);
  ASSERT_TRUE(out.ok) << out.error;
  const EngineTimings& t = sim_->timings();
  EXPECT_EQ(t.runs, 1);
  EXPECT_EQ(t.samples, static_cast<long>(out.waves.time().size()));
  EXPECT_GT(t.run_s, 0);
  EXPECT_GE(t.load_s, 0);
  EXPECT_GE(t.copy_s, 0);
  EXPECT_GE(t.unload_s, 0);
  SimulationOutput bad = sim_->Run(
      "bad card\nV1 in 0 DC 1\nR1 in 0 1k\n.tran 1n 1u\n.frobnicate\n.end\n", {"v(in)"}, 1e-6);
  EXPECT_FALSE(bad.ok);
  EXPECT_EQ(sim_->timings().runs, 2);
  EXPECT_EQ(sim_->timings().samples, static_cast<long>(out.waves.time().size()));
  sim_->ResetTimings();
  EXPECT_EQ(sim_->timings().runs, 0);
}

// ngspice prints a "Reference value" progress line every 0.25 s of process
// time and, to know when, reads the process clock at every stored time point
// (about a third of a one-period run, DEVELOPERS.md "The engine's progress line").
// NgspiceSimulator sets norefvalue, so a run that long prints none. Source:
// ngspice, src/frontend/outitf.c, OUTpData (a clock() call per stored point
// unless the variable norefvalue is set), read in ngspice's repository; the
// cost was seen in a profile of ngspice 39 (clock_gettime per stored point).
TEST_F(NgspiceSimulatorTest, NoProgressLineInALongRun) {
  const char kLongRc[] =
      "rc long run\n"
      "V1 in 0 DC 1\n"
      "R1 in out 1k\n"
      "C1 out 0 1n IC=0\n"
      ".tran 1n 300u 0 1n uic\n"
      ".end\n";
  SimulationOutput out = sim_->Run(kLongRc, {"v(out)"}, 300e-6);
  ASSERT_TRUE(out.ok) << out.error << "\n" << out.log;
  EXPECT_GE(out.waves.time().size(), 250000u);
  EXPECT_FALSE(Contains(out.log, "Reference value")) << out.log.substr(0, 2000);
}

TEST_F(NgspiceSimulatorTest, LcResonancePeakVoltage) {
  // L = 1 uH with 1 A, C = 1 nF empty: all of 1/2 L I^2 moves into the
  // capacitor, so |v| peaks at I sqrt(L/C) = 31.62 V and |i| stays at 1 A
  // (energy conservation, derived).
  const char netlist[] =
      "lc tank\n"
      "L1 a 0 1u IC=1\n"
      "C1 a 0 1n IC=0\n"
      ".tran 1n 1u 0 0.5n uic\n"
      ".end\n";
  SimulationOutput out = sim_->Run(netlist, {"v(a)", "i(L1)"}, 1e-6);
  ASSERT_TRUE(out.ok) << out.error << "\n" << out.log;
  // The inductor current is stored as "l1#branch" and reachable as i(l1).
  ASSERT_TRUE(out.waves.Has("i(l1)"));
  double v_peak = 0.0;
  for (double v : out.waves.Get("v(a)")) v_peak = std::max(v_peak, std::fabs(v));
  double i_peak = 0.0;
  for (double i : out.waves.Get("i(l1)")) i_peak = std::max(i_peak, std::fabs(i));
  const double z0 = std::sqrt(1e-6 / 1e-9);
  EXPECT_NEAR(v_peak, 1.0 * z0, 0.01 * z0);
  EXPECT_NEAR(i_peak, 1.0, 0.01);
}

TEST_F(NgspiceSimulatorTest, CurrentOfASourceInsideASubcircuit) {
  // 1 V across 1 kOhm through a 0 V sense source inside X1: 1 mA (Ohm's law),
  // positive into the sense source's + node (SPICE sign convention, common
  // practice, no source). ngspice stores it as "v.x1.vs#branch".
  const char netlist[] =
      "sense inside a subcircuit\n"
      ".subckt load a b\n"
      "Vs a x 0\n"
      "R1 x b 1k\n"
      ".ends\n"
      "V1 in 0 DC 1\n"
      "X1 in 0 load\n"
      ".tran 1n 100n\n"
      ".end\n";
  SimulationOutput out = sim_->Run(netlist, {"i(x1.vs)", "i(v.x1.vs)", "i(v1)"}, 100e-9);
  ASSERT_TRUE(out.ok) << out.error << "\n" << out.log;
  EXPECT_NEAR(out.waves.At("i(x1.vs)", 50e-9), 1e-3, 1e-9);
  EXPECT_NEAR(out.waves.At("i(v.x1.vs)", 50e-9), 1e-3, 1e-9);
  EXPECT_NEAR(out.waves.At("i(v1)", 50e-9), -1e-3, 1e-9);
}

TEST_F(NgspiceSimulatorTest, SyntaxErrorFailsAndTheNextRunSucceeds) {
  const char netlist[] =
      "bad card\n"
      "V1 in 0 DC 1\n"
      "R1 in out 1k\n"
      "C1 out 0 1n\n"
      ".tran 1n 1u\n"
      ".frobnicate\n"
      ".end\n";
  SimulationOutput out = sim_->Run(netlist, {"v(out)"}, 1e-6);
  EXPECT_FALSE(out.ok);
  EXPECT_FALSE(out.poisoned);
  // ngspice 39.3's own words, joined from its three lines.
  EXPECT_EQ(out.error,
            "engine error: Error on line 6 or its substitute: .frobnicate unimplemented "
            "control card - error");
  EXPECT_TRUE(Contains(out.log, "stderr Error: circuit not parsed.")) << out.log;
  EXPECT_TRUE(out.waves.Names().empty());

  SimulationOutput next = sim_->Run(kRcStep, {"v(out)"}, 5e-6);
  ASSERT_TRUE(next.ok) << next.error << "\n" << next.log;
  // The log starts afresh for each run.
  EXPECT_FALSE(Contains(next.log, "frobnicate"));
  const double expected = 1.0 - std::exp(-1.0);  // Alexander & Sadiku 2017, ch. 7
  EXPECT_NEAR(next.waves.At("v(out)", 1e-6), expected, 0.005 * expected);
}

TEST_F(NgspiceSimulatorTest, TimestepTooSmallFailsCleanly) {
  // An ideal comparator with no hysteresis driving its own RC input: the
  // capacitor charges towards 1 V until v(c) = 0.5 V, then the output flips
  // and chatters; ngspice cannot step past that instant. v(c) reaches 0.5 V
  // at t = RC ln 2 = 693.1 ns (first-order RC step response, Alexander &
  // Sadiku 2017, ch. 7).
  const char netlist[] =
      "chattering comparator\n"
      "B1 out 0 V = v(c) > 0.5 ? 0 : 1\n"
      "R1 out c 1k\n"
      "C1 c 0 1n IC=0\n"
      ".tran 1n 10u uic\n"
      ".end\n";
  SimulationOutput out = sim_->Run(netlist, {"v(c)"}, 10e-6);
  EXPECT_FALSE(out.ok);
  EXPECT_FALSE(out.poisoned);
  const std::string prefix = "engine error: doAnalyses: TRAN:  Timestep too small; time = ";
  ASSERT_EQ(out.error.compare(0, prefix.size(), prefix), 0) << out.error;
  double t_fail = std::atof(out.error.c_str() + out.error.find("time = ") + 7);
  EXPECT_NEAR(t_fail, 1e-6 * std::log(2.0), 1e-9);
  EXPECT_TRUE(Contains(out.log, "stderr run simulation(s) aborted")) << out.log;

  // Without uic the operating point itself cannot be found.
  const char no_uic[] =
      "chattering comparator, operating point\n"
      "B1 out 0 V = v(c) > 0.5 ? 0 : 1\n"
      "R1 out c 1k\n"
      "C1 c 0 1n\n"
      ".tran 1n 10u\n"
      ".end\n";
  SimulationOutput op = sim_->Run(no_uic, {"v(c)"}, 10e-6);
  EXPECT_FALSE(op.ok);
  EXPECT_EQ(op.error, "engine error: Error: Transient op failed, timestep too small");

  SimulationOutput next = sim_->Run(kRcStep, {"v(out)"}, 5e-6);
  EXPECT_TRUE(next.ok) << next.error << "\n" << next.log;
}

TEST_F(NgspiceSimulatorTest, MissingVectorIsNamed) {
  SimulationOutput out = sim_->Run(kRcStep, {"v(out)", "v(nothere)"}, 5e-6);
  EXPECT_FALSE(out.ok);
  EXPECT_EQ(out.error, "vector 'v(nothere)' not found (available: i(v1), time, v(in), v(out))");
}

TEST_F(NgspiceSimulatorTest, RunEndingBeforeTstopFails) {
  SimulationOutput out = sim_->Run(kRcStep, {"v(out)"}, 10e-6);
  EXPECT_FALSE(out.ok);
  EXPECT_EQ(out.error, "simulation ended at t=5e-06 before tstop=1e-05");
}

TEST_F(NgspiceSimulatorTest, NetlistWithoutAnalysisFails) {
  const char netlist[] =
      "no analysis\n"
      "V1 in 0 DC 1\n"
      "R1 in 0 1k\n"
      ".end\n";
  SimulationOutput out = sim_->Run(netlist, {}, 1e-6);
  EXPECT_FALSE(out.ok);
  EXPECT_EQ(out.error, "engine error: run simulation not started");
  SimulationOutput empty = sim_->Run("", {}, 1e-6);
  EXPECT_FALSE(empty.ok);
  EXPECT_EQ(empty.error, "empty netlist");
}

// Exit codes of the child in FatalErrorPoisonsTheSimulator.
enum ChildResult { kChildOk = 0, kFirstRunWrong = 10, kSecondRunWrong = 11 };

TEST_F(NgspiceSimulatorTest, FatalErrorPoisonsTheSimulator) {
  // An undefined parameter makes ngspice fire its exit callback and refuse
  // every later circuit; run it in a child so this process's ngspice stays
  // usable. The child reports through its exit code and ends with _exit().
  pid_t pid = fork();
  ASSERT_GE(pid, 0);
  if (pid == 0) {
    const char netlist[] =
        "undefined parameter\n"
        ".param a=1\n"
        "V1 in 0 {b}\n"
        "R1 in 0 1k\n"
        ".tran 1n 100n\n"
        ".end\n";
    SimulationOutput first = sim_->Run(netlist, {}, 100e-9);
    if (first.ok || !first.poisoned ||
        first.error != "engine error: Netlist line no. 3: Undefined parameter [b]") {
      _exit(kFirstRunWrong);
    }
    SimulationOutput second = sim_->Run(kRcStep, {"v(out)"}, 5e-6);
    if (second.ok || !second.poisoned ||
        second.error != "engine unusable after an earlier fatal error" || !second.log.empty()) {
      _exit(kSecondRunWrong);
    }
    _exit(kChildOk);
  }
  int status = 0;
  ASSERT_EQ(waitpid(pid, &status, 0), pid);
  ASSERT_TRUE(WIFEXITED(status)) << "child ended by signal " << WTERMSIG(status);
  EXPECT_EQ(WEXITSTATUS(status), kChildOk);

  // This process's ngspice is untouched.
  SimulationOutput out = sim_->Run(kRcStep, {"v(out)"}, 5e-6);
  EXPECT_TRUE(out.ok) << out.error;
  EXPECT_FALSE(out.poisoned);
}

}  // namespace
}  // namespace zvsmap
