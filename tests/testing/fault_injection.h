// Fault injection for tests, through the worker pool's seams (WorkerSetup):
// a simulator that misbehaves on chosen points and a job that tells it which
// point runs. Production code has no fault switch; only test code and the
// test-only binary zvsmap_faulty (tests/e2e) link this.
#pragma once

#include <cstddef>
#include <map>
#include <string>

#include "run/worker_pool.h"

namespace zvsmap::testing_support {

/// What a chosen point does instead of its work.
enum class Fault {
  kHang,          ///< sleeps forever (the pool's timeout ends it)
  kSegv,          ///< raises SIGSEGV
  kExitCallback,  ///< the engine stops as if ngspice's exit callback fired
  kHog,           ///< allocates and touches memory until the address-space bound stops it
};

/// Point index -> fault.
using FaultPlan = std::map<size_t, Fault>;

/// Parses "kind:index,..." with kind hang, segv, exitcb or hog (e.g.
/// "hang:3,segv:5"). Returns false with `error` on anything else.
bool ParseFaultPlan(const std::string& text, FaultPlan* plan, std::string* error);

/// `setup` with `plan` put in: a planned point runs its fault in the
/// simulator (a kExitCallback point fails with "engine error: ngspice stopped
/// (exit callback; test fault)" and poisons the simulator, so the worker
/// quits; a kHog point grows to at most twice the process's RLIMIT_AS or
/// 8 GiB, whichever is less, then fails); every other point runs as before.
WorkerSetup InjectFaults(WorkerSetup setup, FaultPlan plan);

}  // namespace zvsmap::testing_support
