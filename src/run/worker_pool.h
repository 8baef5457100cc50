// A pool of forked worker processes, each with its own simulator (ngspice is
// not re-entrant and some of its errors crash or poison the process).
#pragma once

#include <sys/types.h>

#include <csignal>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <vector>

#include "result/point_result.h"
#include "run/child_process.h"
#include "sim/simulator.h"

namespace zvsmap {

/// Evaluates point `index` inside a worker with that worker's simulator.
using PointJob = std::function<PointResult(size_t index, Simulator& simulator)>;
/// Creates a worker's simulator; called in the worker process, never in the parent.
using SimulatorFactory = std::function<std::unique_ptr<Simulator>()>;

/// The two seams a pool's workers are built from. Tests put faults in
/// through them (a job or simulator that crashes, hangs, stops the engine or
/// allocates without end); production code reads no fault from anywhere.
struct WorkerSetup {
  PointJob job;
  SimulatorFactory factory;
};

/// How the pool runs its workers.
struct WorkerPoolOptions {
  int jobs = 0;                ///< worker processes; 0 = number of online CPUs
  double timeout_s = 0;        ///< per-point wall-clock limit; 0 = derived (see DerivedTimeout)
  size_t recycle_after = 200;  ///< a worker is replaced after this many points; 0 = never
  /// Each worker's address-space bound in bytes (RLIMIT_AS, run/memory_bound.h);
  /// 0 = none. A point that runs into it fails with MemoryBoundReason.
  uint64_t memory_bound_bytes = 0;
  /// Test hook, called in the parent when `index` is sent to worker `pid`.
  std::function<void(size_t index, pid_t pid)> on_dispatch;
  /// Called in the parent about every 250 ms while points run, also while
  /// none finishes (drives a progress line's interval).
  std::function<void()> on_tick;
};

/// What a Run did.
struct PoolOutcome {
  bool interrupted = false;  ///< `*stop` became non-zero; unfinished points were dropped
  bool ok = true;            ///< false: the pool could not work (see error)
  std::string error;
  size_t workers_started = 0;
};

/// Forks workers on demand (ChildProcess), sends them point indices over a socketpair and
/// collects encoded results. A worker that crashes, exceeds the timeout or
/// reports a poisoned simulator is killed and replaced; its point gets a
/// failed result with the reason ("crash (signal N)", "crash (exit N)",
/// "timeout after N s", or the engine's message; MemoryBoundReason when the
/// point ran into the memory bound: an allocation failed, or the worker died
/// after its peak resident size reached half the bound). Create it after everything
/// the workers need is in memory: they inherit the parent's state by fork.
class WorkerPool {
 public:
  WorkerPool(PointJob job, SimulatorFactory factory, WorkerPoolOptions options);
  ~WorkerPool();
  WorkerPool(const WorkerPool&) = delete;
  WorkerPool& operator=(const WorkerPool&) = delete;

  /// Evaluates every index in `indices` and calls `on_result` (in the parent,
  /// in completion order) once per finished point. Returns early, killing the
  /// workers, when `stop` is non-null and becomes non-zero; points in flight
  /// are then not reported.
  PoolOutcome Run(const std::vector<size_t>& indices,
                  const std::function<void(PointResult&&)>& on_result,
                  const volatile std::sig_atomic_t* stop = nullptr);

  /// Evaluates `units` of points: each unit whole in one worker, its points
  /// in the given order (warm starts along a chain, sweep/chain_layout.h),
  /// units handed out in the given order. A point that crashes or times out
  /// fails as in Run; the unreported rest of its unit goes to a new worker,
  /// first in the queue.
  PoolOutcome RunUnits(const std::vector<std::vector<size_t>>& units,
                       const std::function<void(PointResult&&)>& on_result,
                       const volatile std::sig_atomic_t* stop = nullptr);

  /// The number of workers the pool runs at most.
  int jobs() const { return jobs_; }

 private:
  struct Worker;
  bool Spawn(Worker* w, std::string* error);
  void Retire(Worker* w);
  int WorkerMain(int fd);  // never returns: the worker _exits
  PointResult RunJob(size_t index, Simulator& simulator);

  PointJob job_;
  SimulatorFactory factory_;
  WorkerPoolOptions options_;
  int jobs_ = 1;
  std::string temp_dir_;
  std::vector<std::unique_ptr<Worker>> workers_;
};

}  // namespace zvsmap
