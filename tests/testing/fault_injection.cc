#include "testing/fault_injection.h"

#include <signal.h>
#include <sys/resource.h>
#include <unistd.h>

#include <algorithm>
#include <cstdint>
#include <cstdlib>
#include <cstring>
#include <memory>
#include <sstream>
#include <vector>

namespace zvsmap::testing_support {
namespace {

// Grows by touched 16 MiB blocks until an allocation fails (std::bad_alloc,
// as the bound makes it) or the cap is reached.
std::string HogMemory() {
  struct rlimit limit {};
  getrlimit(RLIMIT_AS, &limit);
  uint64_t bound = limit.rlim_cur == RLIM_INFINITY ? 0 : limit.rlim_cur;
  const uint64_t cap = std::min<uint64_t>(2 * bound, 8ull << 30);
  std::vector<std::unique_ptr<char[]>> blocks;
  const size_t block = 16u << 20;
  for (uint64_t total = 0; total < cap; total += block) {
    blocks.emplace_back(new char[block]);
    std::memset(blocks.back().get(), 1, block);
  }
  return "test fault: the memory bound did not stop the hog";
}

// Forwards runs to the real simulator, except when a fault is pending.
class FaultySimulator : public Simulator {
 public:
  FaultySimulator(std::unique_ptr<Simulator> inner, std::shared_ptr<const Fault*> pending)
      : inner_(std::move(inner)), pending_(std::move(pending)) {}

  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>& vectors,
                       double tstop_s) override {
    const Fault* fault = *pending_;
    if (fault == nullptr) return inner_->Run(netlist, vectors, tstop_s);
    *pending_ = nullptr;
    SimulationOutput out;
    switch (*fault) {
      case Fault::kHang:
        for (;;) pause();
      case Fault::kSegv:
        signal(SIGSEGV, SIG_DFL);  // die by the signal even under a sanitizer's handler
        raise(SIGSEGV);
        break;
      case Fault::kExitCallback:
        out.error = "engine error: ngspice stopped (exit callback; test fault)";
        out.poisoned = true;
        break;
      case Fault::kHog:
        out.error = HogMemory();
        break;
    }
    return out;
  }

 private:
  std::unique_ptr<Simulator> inner_;
  std::shared_ptr<const Fault*> pending_;
};

}  // namespace

bool ParseFaultPlan(const std::string& text, FaultPlan* plan, std::string* error) {
  static const std::map<std::string, Fault> kinds = {{"hang", Fault::kHang},
                                                     {"segv", Fault::kSegv},
                                                     {"exitcb", Fault::kExitCallback},
                                                     {"hog", Fault::kHog}};
  plan->clear();
  std::stringstream in(text);
  std::string item;
  while (std::getline(in, item, ',')) {
    size_t colon = item.find(':');
    auto kind = kinds.find(item.substr(0, colon));
    const char* digits = colon == std::string::npos ? "" : item.c_str() + colon + 1;
    char* end = nullptr;
    unsigned long long index = std::strtoull(digits, &end, 10);
    if (kind == kinds.end() || *digits == '\0' || *end != '\0') {
      *error = "fault plan '" + text + "': '" + item + "' is not kind:index";
      return false;
    }
    (*plan)[static_cast<size_t>(index)] = kind->second;
  }
  return true;
}

WorkerSetup InjectFaults(WorkerSetup setup, FaultPlan plan) {
  // Shared by the job and the simulator of one worker (each worker's copy).
  auto pending = std::make_shared<const Fault*>(nullptr);
  auto faults = std::make_shared<const FaultPlan>(std::move(plan));
  PointJob job = [inner = std::move(setup.job), pending, faults](size_t index,
                                                                 Simulator& simulator) {
    auto fault = faults->find(index);
    if (fault == faults->end()) return inner(index, simulator);
    *pending = &fault->second;
    SimulationOutput out = simulator.Run("* test fault\n.end\n", {}, 0);
    PointResult result;
    result.index = index;
    result.status = PointStatus::kFailed;
    result.reason = out.error;
    return result;
  };
  SimulatorFactory factory = [inner = std::move(setup.factory), pending] {
    return std::make_unique<FaultySimulator>(inner(), pending);
  };
  return {std::move(job), std::move(factory)};
}

}  // namespace zvsmap::testing_support
