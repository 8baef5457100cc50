#include "run/worker_pool.h"

#include <fcntl.h>
#include <poll.h>
#include <sys/prctl.h>
#include <sys/socket.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cstdint>
#include <cstdlib>
#include <cstring>
#include <deque>
#include <filesystem>
#include <memory>
#include <new>
#include <vector>

#include "result/result_codec.h"
#include "run/memory_bound.h"

namespace zvsmap {
namespace {

using Clock = std::chrono::steady_clock;

// Message from worker to parent: u32 payload length, u8 flags, payload.
constexpr uint8_t kFlagExiting = 1;  // the worker quits after this message
constexpr size_t kHeader = 5;

// Passes runs through and remembers whether the simulator became unusable.
class PoisonWatch : public Simulator {
 public:
  explicit PoisonWatch(Simulator& inner) : inner_(inner) {}
  SimulationOutput Run(const std::string& netlist, const std::vector<std::string>& vectors,
                       double tstop_s) override {
    SimulationOutput out = inner_.Run(netlist, vectors, tstop_s);
    poisoned_ = poisoned_ || out.poisoned;
    return out;
  }
  bool poisoned() const { return poisoned_; }

 private:
  Simulator& inner_;
  bool poisoned_ = false;
};

bool WriteAll(int fd, const char* data, size_t size) {
  while (size > 0) {
    ssize_t n = send(fd, data, size, MSG_NOSIGNAL);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) return false;
    data += n;
    size -= static_cast<size_t>(n);
  }
  return true;
}

// Reads exactly `size` bytes; false on end of file or error.
bool ReadAll(int fd, char* data, size_t size) {
  while (size > 0) {
    ssize_t n = read(fd, data, size);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) return false;
    data += n;
    size -= static_cast<size_t>(n);
  }
  return true;
}

}  // namespace

struct WorkerPool::Worker {
  ChildProcess child;
  bool busy = false;
  size_t index = 0;           // the point it runs now (the front of `unit`)
  std::deque<size_t> unit;    // the points of its unit not yet reported

  Clock::time_point started;
  std::string inbox;
  size_t points_done = 0;
  bool alive() const { return child.running(); }
  int fd() const { return child.fd(); }
};

WorkerPool::WorkerPool(PointJob job, SimulatorFactory factory, WorkerPoolOptions options)
    : job_(std::move(job)), factory_(std::move(factory)), options_(std::move(options)) {
  jobs_ = options_.jobs > 0 ? options_.jobs : static_cast<int>(sysconf(_SC_NPROCESSORS_ONLN));
  if (jobs_ < 1) jobs_ = 1;
  const char* tmp = std::getenv("TMPDIR");
  std::string pattern = std::string(tmp && *tmp ? tmp : "/tmp") + "/zvsmap-XXXXXX";
  if (mkdtemp(&pattern[0]) != nullptr) temp_dir_ = pattern;
}

WorkerPool::~WorkerPool() {
  for (auto& w : workers_) Retire(w.get());
  if (!temp_dir_.empty()) {
    std::error_code ec;
    std::filesystem::remove_all(temp_dir_, ec);
  }
}

void WorkerPool::Retire(Worker* w) {
  if (!w->alive()) return;
  w->child.Kill();
  w->busy = false;
  w->inbox.clear();
}

bool WorkerPool::Spawn(Worker* w, std::string* error) {
  std::vector<int> others;
  for (auto& other : workers_) others.push_back(other->fd());
  if (!w->child.Start([this](int fd) { return WorkerMain(fd); }, others, error)) return false;
  fcntl(w->fd(), F_SETFL, fcntl(w->fd(), F_GETFL) | O_NONBLOCK);
  w->busy = false;
  w->inbox.clear();
  w->points_done = 0;
  return true;
}

PointResult WorkerPool::RunJob(size_t index, Simulator& simulator) {
  PointResult result;
  try {
    result = job_(index, simulator);
  } catch (const std::bad_alloc&) {
    result = PointResult();
    result.index = index;
    result.reason = MemoryBoundReason(options_.memory_bound_bytes, "");
  } catch (const std::exception& e) {
    result = PointResult();
    result.index = index;
    result.reason = std::string("internal error: ") + e.what();
  }
  return result;
}

int WorkerPool::WorkerMain(int fd) {
  // The parent decides when a worker ends: Ctrl-C reaches the whole process
  // group, so workers ignore SIGINT; SIGTERM kills them; they die with the parent.
  signal(SIGINT, SIG_IGN);
  signal(SIGTERM, SIG_DFL);
  signal(SIGPIPE, SIG_IGN);  // a closed stdout/stderr fails a write, never kills the point
  prctl(PR_SET_PDEATHSIG, SIGKILL);
  if (getppid() == 1) _exit(0);
  // A private working directory and HOME: ngspice reads ./.spiceinit and ~/.spiceinit.
  std::string dir =
      (temp_dir_.empty() ? std::string("/tmp") : temp_dir_) + "/w" + std::to_string(getpid());
  if (mkdir(dir.c_str(), 0700) != 0 || chdir(dir.c_str()) != 0) _exit(70);
  setenv("HOME", dir.c_str(), 1);
  ApplyMemoryBound(options_.memory_bound_bytes);

  std::unique_ptr<Simulator> simulator;
  try {
    simulator = factory_();
  } catch (...) {
    _exit(71);
  }
  PoisonWatch watch(*simulator);
  for (;;) {
    // A unit: its size, then its point indices, run in this order.
    uint64_t count = 0;
    if (!ReadAll(fd, reinterpret_cast<char*>(&count), sizeof count) || count == 0) _exit(0);
    std::vector<uint64_t> unit(count);
    if (!ReadAll(fd, reinterpret_cast<char*>(unit.data()), count * sizeof(uint64_t))) _exit(0);
    for (uint64_t index : unit) {
      PointResult result = RunJob(static_cast<size_t>(index), watch);
      if (options_.memory_bound_bytes > 0 && result.status != PointStatus::kOk &&
          result.reason.rfind("memory bound", 0) != 0 &&
          LooksLikeAllocationFailure(result.reason)) {
        result.reason = MemoryBoundReason(options_.memory_bound_bytes, result.reason);
      }
      bool exiting = watch.poisoned();
      std::string payload = EncodeResult(result);
      char header[kHeader];
      uint32_t size = static_cast<uint32_t>(payload.size());
      std::memcpy(header, &size, 4);
      header[4] = static_cast<char>(exiting ? kFlagExiting : 0);
      if (!WriteAll(fd, header, kHeader) || !WriteAll(fd, payload.data(), payload.size())) {
        _exit(0);
      }
      if (exiting) _exit(0);  // the parent runs the rest of the unit elsewhere
    }
  }
}

PoolOutcome WorkerPool::Run(const std::vector<size_t>& indices,
                            const std::function<void(PointResult&&)>& on_result,
                            const volatile std::sig_atomic_t* stop) {
  std::vector<std::vector<size_t>> units;
  for (size_t i : indices) units.push_back({i});
  return RunUnits(units, on_result, stop);
}

PoolOutcome WorkerPool::RunUnits(const std::vector<std::vector<size_t>>& units,
                                 const std::function<void(PointResult&&)>& on_result,
                                 const volatile std::sig_atomic_t* stop) {
  PoolOutcome outcome;
  std::deque<std::vector<size_t>> queue;
  for (const auto& u : units)
    if (!u.empty()) queue.push_back(u);
  size_t want = std::min(static_cast<size_t>(jobs_), queue.size());
  while (workers_.size() < want) workers_.push_back(std::make_unique<Worker>());
  std::vector<double> first_durations;
  size_t idle_deaths = 0;  // workers that died without a point: a broken set-up

  auto elapsed = [](const Worker& w) {
    return std::chrono::duration<double>(Clock::now() - w.started).count();
  };
  auto report_failure = [&](size_t index, double wall_s, const std::string& reason) {
    PointResult r;
    r.index = index;
    r.status = PointStatus::kFailed;
    r.reason = reason;
    r.wall_s = wall_s;
    on_result(std::move(r));
  };
  // The unreported rest of a worker's unit goes back to the front of the
  // queue (a worker that died or stopped after a point).
  auto requeue_rest = [&](Worker& w) {
    if (!w.unit.empty()) queue.emplace_front(w.unit.begin(), w.unit.end());
    w.unit.clear();
    w.busy = false;
  };
  auto fail_point = [&](Worker& w, const std::string& reason) {
    w.busy = false;
    if (!w.unit.empty()) w.unit.pop_front();
    report_failure(w.index, elapsed(w), reason);
    requeue_rest(w);
  };
  auto busy_count = [&] {
    size_t n = 0;
    for (auto& w : workers_) n += w->busy ? 1 : 0;
    return n;
  };

  while (!queue.empty() || busy_count() > 0) {
    if (stop && *stop) {
      for (auto& w : workers_) Retire(w.get());
      outcome.interrupted = true;
      return outcome;
    }
    // Start workers where needed and hand out points.
    for (auto& wp : workers_) {
      Worker& w = *wp;
      if (queue.empty()) break;
      if (!w.alive()) {
        if (!Spawn(&w, &outcome.error)) {
          outcome.ok = false;
          for (auto& x : workers_) Retire(x.get());
          return outcome;
        }
        ++outcome.workers_started;
      }
      if (w.busy) continue;
      std::vector<uint64_t> message = {queue.front().size()};
      message.insert(message.end(), queue.front().begin(), queue.front().end());
      if (!WriteAll(w.fd(), reinterpret_cast<const char*>(message.data()),
                    message.size() * sizeof(uint64_t))) {
        Retire(&w);  // died while idle; respawned on the next pass
        if (++idle_deaths > 3 * static_cast<size_t>(jobs_) + 3) {
          outcome.ok = false;
          outcome.error = "workers keep dying before they run a point";
          return outcome;
        }
        continue;
      }
      w.unit.assign(queue.front().begin(), queue.front().end());
      queue.pop_front();
      w.busy = true;
      w.index = w.unit.front();
      w.started = Clock::now();
      if (options_.on_dispatch) {
        for (size_t index : w.unit) options_.on_dispatch(index, w.child.pid());
      }
    }

    double timeout_s =
        options_.timeout_s > 0 ? options_.timeout_s : DerivedTimeout(first_durations);
    std::vector<pollfd> fds;
    std::vector<Worker*> polled;
    int wait_ms = 250;
    for (auto& wp : workers_) {
      if (!wp->alive()) continue;
      fds.push_back({wp->fd(), POLLIN, 0});
      polled.push_back(wp.get());
      if (wp->busy) {
        double left_ms = (timeout_s - elapsed(*wp)) * 1000;
        wait_ms = std::max(0, std::min(wait_ms, static_cast<int>(left_ms) + 1));
      }
    }
    int n = poll(fds.data(), fds.size(), wait_ms);
    if (n < 0 && errno != EINTR) {
      outcome.ok = false;
      outcome.error = std::string("poll: ") + std::strerror(errno);
      for (auto& w : workers_) Retire(w.get());
      return outcome;
    }
    if (options_.on_tick) options_.on_tick();
    if (stop && *stop) continue;

    for (size_t k = 0; n > 0 && k < fds.size(); ++k) {
      if (fds[k].revents == 0) continue;
      Worker& w = *polled[k];
      bool eof = false;
      char buf[65536];
      for (;;) {
        ssize_t got = read(w.fd(), buf, sizeof buf);
        if (got > 0) {
          w.inbox.append(buf, static_cast<size_t>(got));
          continue;
        }
        if (got < 0 && errno == EINTR) continue;
        if (got == 0 || (errno != EAGAIN && errno != EWOULDBLOCK)) eof = true;
        break;
      }
      bool exiting = false;
      while (w.inbox.size() >= kHeader) {
        uint32_t size = 0;
        std::memcpy(&size, w.inbox.data(), 4);
        if (w.inbox.size() < kHeader + size) break;
        exiting = exiting || (static_cast<uint8_t>(w.inbox[4]) & kFlagExiting);
        std::string payload = w.inbox.substr(kHeader, size);
        w.inbox.erase(0, kHeader + size);
        if (!w.busy) continue;  // nothing asked: ignore
        PointResult r;
        if (!DecodeResult(payload, &r) || r.index != w.index) {
          fail_point(w, "internal error: malformed result from the worker");
          exiting = true;
          continue;
        }
        if (first_durations.size() < 3) first_durations.push_back(elapsed(w));
        ++w.points_done;
        idle_deaths = 0;
        w.unit.pop_front();
        w.busy = !w.unit.empty();
        if (w.busy) {
          w.index = w.unit.front();
          w.started = Clock::now();
        }
        on_result(std::move(r));
      }
      if (exiting && w.busy) requeue_rest(w);  // it stops after this point
      if (eof && !exiting) {
        // Died: reap it and say how.
        ChildEnd end = w.child.Reap();
        w.inbox.clear();
        if (w.busy) {
          fail_point(w, CrashReason(end, options_.memory_bound_bytes));
        } else if (++idle_deaths > 3 * static_cast<size_t>(jobs_) + 3) {
          outcome.ok = false;
          outcome.error = "workers keep dying before they run a point: " + CrashReason(end, 0);
          for (auto& x : workers_) Retire(x.get());
          return outcome;
        }
        continue;
      }
      if (exiting || (options_.recycle_after > 0 && w.points_done >= options_.recycle_after)) {
        if (!w.busy) Retire(&w);
      }
    }

    // Points past their time limit: kill the worker, report, replace later.
    for (auto& wp : workers_) {
      Worker& w = *wp;
      if (w.busy && elapsed(w) > timeout_s) {
        double took = elapsed(w);
        size_t index = w.index;
        w.unit.pop_front();
        std::deque<size_t> rest = std::move(w.unit);
        Retire(&w);
        report_failure(index, took, TimeoutReason(timeout_s));
        if (!rest.empty()) queue.emplace_front(rest.begin(), rest.end());
      }
    }
  }
  for (auto& w : workers_) Retire(w.get());
  return outcome;
}

}  // namespace zvsmap
