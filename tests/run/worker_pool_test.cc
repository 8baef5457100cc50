// Tests of the worker pool: forked workers, faults, timeouts, recycling and
// real ngspice failures isolated to their point. The parent process of this
// binary never creates an ngspice; each worker creates its own.
#include "run/worker_pool.h"

#include <gtest/gtest.h>
#include <signal.h>
#include <unistd.h>

#include <algorithm>
#include <cstdlib>
#include <cstring>
#include <map>
#include <set>
#include <string>
#include <thread>

#include "run/memory_bound.h"
#include "sim/ngspice_simulator.h"
#include "testing/fault_injection.h"

namespace zvsmap {
namespace {

// A simulator for workers that do not simulate.
class NoSimulator : public Simulator {
 public:
  SimulationOutput Run(const std::string&, const std::vector<std::string>&, double) override {
    return {};
  }
};

SimulatorFactory NoSim() {
  return [] { return std::make_unique<NoSimulator>(); };
}

// Each point reports its index twice over and the worker's pid.
PointResult Echo(size_t index, Simulator&) {
  PointResult r;
  r.index = index;
  r.status = PointStatus::kOk;
  r.edges.push_back({"leg",
                     "high_on",
                     ZvsClass::kFull,
                     "",
                     {{"twice", 2.0 * index}, {"pid", static_cast<double>(getpid())}}});
  return r;
}

// `job` and `factory` with faults put in through the pool's seams.
WorkerSetup Faulty(PointJob job, SimulatorFactory factory, const std::string& plan_text) {
  testing_support::FaultPlan plan;
  std::string error;
  EXPECT_TRUE(testing_support::ParseFaultPlan(plan_text, &plan, &error)) << error;
  return testing_support::InjectFaults({std::move(job), std::move(factory)}, plan);
}

std::vector<size_t> Range(size_t n) {
  std::vector<size_t> v(n);
  for (size_t i = 0; i < n; ++i) v[i] = i;
  return v;
}

std::map<size_t, PointResult> RunAll(WorkerPool& pool, size_t n, PoolOutcome* outcome = nullptr) {
  std::map<size_t, PointResult> results;
  PoolOutcome o = pool.Run(Range(n), [&](PointResult&& r) {
    EXPECT_EQ(results.count(r.index), 0u) << "point " << r.index << " reported twice";
    results[r.index] = std::move(r);
  });
  if (outcome) *outcome = o;
  return results;
}

TEST(WorkerPoolTest, EveryPointIsReportedExactlyOnce) {
  WorkerPoolOptions options;
  options.jobs = 2;
  WorkerPool pool(Echo, NoSim(), options);
  PoolOutcome outcome;
  auto results = RunAll(pool, 20, &outcome);
  EXPECT_TRUE(outcome.ok) << outcome.error;
  ASSERT_EQ(results.size(), 20u);
  for (auto& [i, r] : results) {
    EXPECT_EQ(r.status, PointStatus::kOk);
    EXPECT_EQ(r.edges.at(0).Get("twice"), 2.0 * i);
    EXPECT_NE(r.edges.at(0).Get("pid"), static_cast<double>(getpid()));  // ran in a worker
  }
}

// Units run whole in one worker, in their order; a crash fails only its
// point and the rest of its unit still runs (in a new worker).
TEST(WorkerPoolTest, UnitsRunWholeInOneWorkerInTheirOrder) {
  WorkerPoolOptions options;
  options.jobs = 2;
  WorkerSetup setup = Faulty(Echo, NoSim(), "segv:6");
  WorkerPool pool(setup.job, setup.factory, options);
  std::vector<std::vector<size_t>> units = {{2, 0, 1}, {3, 4}, {5, 6, 7, 8}};
  std::vector<size_t> order;
  std::map<size_t, PointResult> results;
  PoolOutcome outcome = pool.RunUnits(units, [&](PointResult&& r) {
    order.push_back(r.index);
    results[r.index] = std::move(r);
  });
  EXPECT_TRUE(outcome.ok) << outcome.error;
  ASSERT_EQ(results.size(), 9u);
  EXPECT_EQ(results[6].reason, "crash (signal 11)");
  auto pid = [&](size_t i) { return results[i].edges.at(0).Get("pid"); };
  EXPECT_EQ(pid(2), pid(0));
  EXPECT_EQ(pid(0), pid(1));
  EXPECT_EQ(pid(3), pid(4));
  EXPECT_EQ(pid(7), pid(8));
  EXPECT_NE(pid(5), pid(7));  // the unit's rest went to a new worker
  for (const auto& unit : units) {
    auto at = [&](size_t i) { return std::find(order.begin(), order.end(), i) - order.begin(); };
    for (size_t k = 1; k < unit.size(); ++k) EXPECT_LT(at(unit[k - 1]), at(unit[k]));
  }
}

TEST(WorkerPoolTest, FaultSwitchHangCrashAndExitCallbackFailOnlyTheirPoints) {
  WorkerPoolOptions options;
  options.jobs = 2;
  options.timeout_s = 1;
  WorkerSetup setup = Faulty(Echo, NoSim(), "hang:3,segv:5,exitcb:7");
  WorkerPool pool(setup.job, setup.factory, options);
  PoolOutcome outcome;
  auto results = RunAll(pool, 10, &outcome);
  EXPECT_TRUE(outcome.ok) << outcome.error;
  ASSERT_EQ(results.size(), 10u);
  EXPECT_EQ(results[3].reason, "timeout after 1 s");
  EXPECT_GE(results[3].wall_s, 1.0);
  EXPECT_EQ(results[5].reason, "crash (signal 11)");  // SIGSEGV is 11 on Linux (signal(7))
  EXPECT_EQ(results[7].reason, "engine error: ngspice stopped (exit callback; test fault)");
  for (size_t i : {0, 1, 2, 4, 6, 8, 9}) {
    EXPECT_EQ(results[i].status, PointStatus::kOk) << i << ": " << results[i].reason;
  }
  for (size_t i : {3, 5, 7}) EXPECT_EQ(results[i].status, PointStatus::kFailed);
}

TEST(WorkerPoolTest, WorkerKilledFromOutsideIsReplacedAndItsPointReported) {
  WorkerPoolOptions options;
  options.jobs = 1;  // one worker: points 3-7 can only run on its replacement
  options.on_dispatch = [](size_t index, pid_t pid) {
    if (index == 2) kill(pid, SIGKILL);
  };
  auto slow_on_two = [](size_t index, Simulator& sim) {
    if (index == 2) sleep(5);
    return Echo(index, sim);
  };
  WorkerPool pool(slow_on_two, NoSim(), options);
  PoolOutcome outcome;
  auto results = RunAll(pool, 8, &outcome);
  ASSERT_EQ(results.size(), 8u);
  EXPECT_EQ(results[2].reason, "crash (signal 9)");  // SIGKILL is 9 (POSIX)
  for (size_t i : {0, 1, 3, 4, 5, 6, 7}) EXPECT_EQ(results[i].status, PointStatus::kOk);
  EXPECT_EQ(outcome.workers_started, 2u);
}

TEST(WorkerPoolTest, WorkersAreRecycledAfterTheSetNumberOfPoints) {
  WorkerPoolOptions options;
  options.jobs = 1;
  options.recycle_after = 2;
  WorkerPool pool(Echo, NoSim(), options);
  PoolOutcome outcome;
  auto results = RunAll(pool, 6, &outcome);
  ASSERT_EQ(results.size(), 6u);
  std::set<double> pids;
  for (auto& [i, r] : results) pids.insert(r.edges.at(0).Get("pid"));
  EXPECT_EQ(pids.size(), 3u);
  EXPECT_EQ(outcome.workers_started, 3u);
}

TEST(WorkerPoolTest, StopFlagEndsTheRunWithoutReportingPointsInFlight) {
  WorkerPoolOptions options;
  options.jobs = 2;
  volatile std::sig_atomic_t stop = 0;
  auto slow = [](size_t index, Simulator& sim) {
    if (index >= 2) sleep(5);
    return Echo(index, sim);
  };
  WorkerPool pool(slow, NoSim(), options);
  std::vector<size_t> seen;
  PoolOutcome outcome = pool.Run(
      Range(10),
      [&](PointResult&& r) {
        seen.push_back(r.index);
        if (seen.size() == 2) stop = 1;
      },
      &stop);
  EXPECT_TRUE(outcome.interrupted);
  EXPECT_EQ(seen.size(), 2u);
}

TEST(WorkerPoolTest, WorkerRunsInAPrivateDirectoryWithItsOwnHome) {
  auto where = [](size_t index, Simulator&) {
    PointResult r;
    r.index = index;
    char cwd[4096];
    r.reason = std::string(getcwd(cwd, sizeof cwd) ? cwd : "?") + "|" +
               (std::getenv("HOME") ? std::getenv("HOME") : "");
    return r;
  };
  WorkerPoolOptions options;
  options.jobs = 1;
  WorkerPool pool(where, NoSim(), options);
  auto results = RunAll(pool, 1);
  std::string reason = results.at(0).reason;
  size_t bar = reason.find('|');
  ASSERT_NE(bar, std::string::npos);
  EXPECT_EQ(reason.substr(0, bar), reason.substr(bar + 1));  // cwd == HOME
  char cwd[4096];
  EXPECT_NE(reason.substr(0, bar), std::string(getcwd(cwd, sizeof cwd)));
  EXPECT_NE(reason.find("/zvsmap-"), std::string::npos) << reason;
}

TEST(WorkerPoolTest, DerivedTimeoutFollowsTheFirstPoints) {
  // The rule stated in child_process.h (our own choice, no source).
  EXPECT_EQ(DerivedTimeout({}), 300);
  EXPECT_EQ(DerivedTimeout({0.5, 1.0}), 30);
  EXPECT_EQ(DerivedTimeout({2.0, 4.0, 1.0, 100.0}), 80);
}

// --- real ngspice in the workers ---

// RC low-pass, 1 V step, tau = 1 us.
const char kGoodNetlist[] =
    "rc\nV1 in 0 DC 1\nR1 in out 1k\nC1 out 0 1n IC=0\n.tran 10n 2u 0 10n uic\n.end\n";
// An unknown dot card: "Error: circuit not parsed." (ngspice 39, as in
// tests/integration/ngspice_simulator_test.cc).
const char kRejectedNetlist[] =
    "rejected\nV1 in 0 DC 1\nR1 in out 1k\nC1 out 0 1n\n.tran 10n 2u\n.frobnicate\n.end\n";
// An undefined parameter: the exit callback fires and the instance is
// poisoned (observed with ngspice 39, see sim/ngspice_simulator.cc).
const char kUndefinedParam[] =
    "undefined\nV1 in 0 DC 1\nR1 in out {rundefined}\nC1 out 0 1n IC=0\n"
    ".tran 10n 2u 0 10n uic\n.end\n";

PointResult Simulate(size_t index, Simulator& sim) {
  const char* netlist = index == 2 ? kRejectedNetlist : index == 4 ? kUndefinedParam : kGoodNetlist;
  SimulationOutput out = sim.Run(netlist, {"v(out)"}, 2e-6);
  PointResult r;
  r.index = index;
  r.status = out.ok ? PointStatus::kOk : PointStatus::kFailed;
  r.reason = out.error;
  if (out.ok) {
    // 1 - exp(-1) at t = tau: first-order RC step (Alexander & Sadiku 2017, ch. 7).
    r.edges.push_back(
        {"rc", "step", ZvsClass::kUnknown, "", {{"v_tau", out.waves.At("v(out)", 1e-6)}}});
  }
  return r;
}

SimulatorFactory Ngspice() {
  return [] { return std::make_unique<NgspiceSimulator>(); };
}

TEST(WorkerPoolNgspiceTest, RejectedAndPoisoningNetlistsFailOnlyTheirPoints) {
  WorkerPoolOptions options;
  options.jobs = 1;  // one worker: the points after the poisoning one prove it was replaced
  WorkerPool pool(Simulate, Ngspice(), options);
  PoolOutcome outcome;
  auto results = RunAll(pool, 7, &outcome);
  ASSERT_EQ(results.size(), 7u);
  EXPECT_EQ(results[2].status, PointStatus::kFailed);
  EXPECT_EQ(results[2].reason.rfind("engine error: ", 0), 0u) << results[2].reason;
  EXPECT_EQ(results[4].status, PointStatus::kFailed);
  EXPECT_EQ(results[4].reason.rfind("engine error: ", 0), 0u) << results[4].reason;
  for (size_t i : {0, 1, 3, 5, 6}) {
    ASSERT_EQ(results[i].status, PointStatus::kOk) << i << ": " << results[i].reason;
    EXPECT_NEAR(results[i].edges[0].Get("v_tau"), 0.632, 0.005);
  }
  EXPECT_EQ(outcome.workers_started, 2u);  // replaced once, after the poisoning point
}

TEST(WorkerPoolNgspiceTest, TwoWorkersGiveTheSameNumbersAsOne) {
  std::map<size_t, PointResult> one, two;
  {
    WorkerPoolOptions options;
    options.jobs = 1;
    WorkerPool pool(Simulate, Ngspice(), options);
    one = RunAll(pool, 6);
  }
  {
    WorkerPoolOptions options;
    options.jobs = 2;
    WorkerPool pool(Simulate, Ngspice(), options);
    two = RunAll(pool, 6);
  }
  for (size_t i : {0, 1, 3, 5}) {
    EXPECT_EQ(one[i].edges.at(0).Get("v_tau"), two[i].edges.at(0).Get("v_tau"));
  }
}

TEST(WorkerPoolNgspiceTest, HangingPointTimesOutAndTheRestComplete) {
  WorkerPoolOptions options;
  options.jobs = 2;
  options.timeout_s = 2;
  WorkerSetup setup = Faulty(
      [](size_t index, Simulator& sim) {
        PointResult r = Simulate(0, sim);  // the good netlist for every point
        r.index = index;
        return r;
      },
      Ngspice(), "hang:1");
  WorkerPool pool(setup.job, setup.factory, options);
  auto results = RunAll(pool, 5);
  ASSERT_EQ(results.size(), 5u);
  EXPECT_EQ(results[1].reason, "timeout after 2 s");
  for (size_t i : {0, 2, 3, 4}) EXPECT_EQ(results[i].status, PointStatus::kOk) << results[i].reason;
}

// --- the memory bound and the tick ---

constexpr uint64_t kBound = 256ull << 20;

TEST(WorkerPoolTest, APointPastTheMemoryBoundFailsWithThatReason) {
  if (!MemoryBoundAvailable()) GTEST_SKIP() << "no memory bound under AddressSanitizer";
  WorkerPoolOptions options;
  options.jobs = 1;
  options.memory_bound_bytes = kBound;
  auto greedy_on_one = [](size_t index, Simulator& sim) {
    if (index == 1) {
      std::vector<char> big(1ull << 30, 1);  // 1 GiB, four times the bound
      EXPECT_EQ(big[12345], 1);              // not reached: the allocation throws
    }
    return Echo(index, sim);
  };
  WorkerPool pool(greedy_on_one, NoSim(), options);
  auto results = RunAll(pool, 4);
  ASSERT_EQ(results.size(), 4u);
  EXPECT_EQ(results[1].status, PointStatus::kFailed);
  EXPECT_EQ(results[1].reason,
            "memory bound: the worker reached its 256 MiB limit (--worker-memory)");
  for (size_t i : {0, 2, 3}) EXPECT_EQ(results[i].status, PointStatus::kOk) << results[i].reason;
}

TEST(WorkerPoolTest, CCodeThatCrashesOnAFailedMallocNearTheBoundIsWordedAsTheBound) {
  if (!MemoryBoundAvailable()) GTEST_SKIP() << "no memory bound under AddressSanitizer";
  WorkerPoolOptions options;
  options.jobs = 1;
  options.memory_bound_bytes = kBound;
  // Like C code that does not check malloc: touch blocks until malloc fails,
  // then die of it.
  auto crash_on_two = [](size_t index, Simulator& sim) {
    if (index == 2) {
      for (;;) {
        void* block = std::malloc(4u << 20);
        if (block == nullptr) {
          signal(SIGSEGV, SIG_DFL);
          raise(SIGSEGV);
        }
        std::memset(block, 1, 4u << 20);
      }
    }
    return Echo(index, sim);
  };
  WorkerPool pool(crash_on_two, NoSim(), options);
  auto results = RunAll(pool, 4);
  ASSERT_EQ(results.size(), 4u);
  EXPECT_EQ(results[2].reason,
            "memory bound: the worker reached its 256 MiB limit (--worker-memory); crash "
            "(signal 11)");
  for (size_t i : {0, 1, 3}) EXPECT_EQ(results[i].status, PointStatus::kOk) << results[i].reason;
}

TEST(WorkerPoolTest, ACrashFarBelowTheBoundStaysACrash) {
  WorkerPoolOptions options;
  options.jobs = 1;
  options.memory_bound_bytes = 4ull << 30;
  WorkerSetup setup = Faulty(Echo, NoSim(), "segv:0");
  WorkerPool pool(setup.job, setup.factory, options);
  auto results = RunAll(pool, 2);
  EXPECT_EQ(results[0].reason, "crash (signal 11)");
  EXPECT_EQ(results[1].status, PointStatus::kOk);
}

TEST(WorkerPoolTest, HogFaultIsStoppedByTheBound) {
  if (!MemoryBoundAvailable()) GTEST_SKIP() << "no memory bound under AddressSanitizer";
  WorkerPoolOptions options;
  options.jobs = 1;
  options.memory_bound_bytes = kBound;
  WorkerSetup setup = Faulty(Echo, NoSim(), "hog:0");
  WorkerPool pool(setup.job, setup.factory, options);
  auto results = RunAll(pool, 2);
  EXPECT_EQ(results[0].reason,
            "memory bound: the worker reached its 256 MiB limit (--worker-memory)");
  EXPECT_EQ(results[1].status, PointStatus::kOk);
}

TEST(WorkerPoolTest, TheTickKeepsComingWhileAPointHangs) {
  WorkerPoolOptions options;
  options.jobs = 1;
  options.timeout_s = 1.5;
  int ticks = 0;
  options.on_tick = [&ticks] { ++ticks; };
  WorkerSetup setup = Faulty(Echo, NoSim(), "hang:0");
  WorkerPool pool(setup.job, setup.factory, options);
  auto results = RunAll(pool, 1);
  EXPECT_EQ(results[0].reason, "timeout after 1.5 s");
  // The pool polls at most 250 ms at a time: 1.5 s of hanging gives about 6
  // ticks; 3 leaves room for a loaded machine.
  EXPECT_GE(ticks, 3);
}

TEST(WorkerPoolNgspiceTest, NgspiceRunningIntoTheMemoryBoundIsWordedAsTheBound) {
  if (!MemoryBoundAvailable()) GTEST_SKIP() << "no memory bound under AddressSanitizer";
  WorkerPoolOptions options;
  options.jobs = 1;
  options.memory_bound_bytes = kBound;
  // 1 ms in 10 ps steps: ngspice sizes its vectors for 1e8 points (800 MB
  // each) before it starts, far past the 256 MiB bound.
  auto long_on_one = [](size_t index, Simulator& sim) {
    if (index != 1) {
      PointResult good = Simulate(0, sim);  // the good netlist
      good.index = index;
      return good;
    }
    SimulationOutput out = sim.Run(
        "long\nV1 in 0 DC 1\nR1 in out 1k\nC1 out 0 1n IC=0\n.tran 10p 1m 0 10p uic\n.end\n",
        {"v(out)"}, 1e-3);
    PointResult r;
    r.index = index;
    r.status = out.ok ? PointStatus::kOk : PointStatus::kFailed;
    r.reason = out.error;
    return r;
  };
  WorkerPool pool(long_on_one, Ngspice(), options);
  auto results = RunAll(pool, 3);
  ASSERT_EQ(results.size(), 3u);
  const std::string prefix =
      "memory bound: the worker reached its 256 MiB limit (--worker-memory); engine error: ";
  EXPECT_EQ(results[1].reason.rfind(prefix, 0), 0u) << results[1].reason;
  EXPECT_NE(results[1].reason.find("can't allocate"), std::string::npos) << results[1].reason;
  for (size_t i : {0, 2}) EXPECT_EQ(results[i].status, PointStatus::kOk) << results[i].reason;
}

}  // namespace
}  // namespace zvsmap
