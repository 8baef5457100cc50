// One supervisor for forked children (the worker pool's workers, the
// waveform export's child): fork a function, talk over a socketpair, kill on
// a wall-clock limit, reap with wait4 and say how the child ended.
#pragma once

#include <sys/types.h>

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

namespace zvsmap {

/// How a child process ended.
struct ChildEnd {
  enum class Kind { kExited, kSignaled, kTimedOut };
  Kind kind = Kind::kExited;
  /// Exit status (kExited; -1 when the child could not be waited for) or
  /// signal number (kSignaled).
  int code = 0;
  uint64_t peak_rss_bytes = 0;  ///< peak resident size (wait4's ru_maxrss)
};

/// The one timeout rule for a child's unit of work (a point). Without a set
/// timeout, until a point has finished: 300 s. Afterwards max(30 s, 20 x the
/// longest of the first three finished points). The worker pool applies it to
/// the run's first points, the waveform export to each stored point's time.
double DerivedTimeout(const std::vector<double>& first_durations_s);

/// "timeout after N s" (N with three significant digits).
std::string TimeoutReason(double timeout_s);

/// How a child that died unasked is worded: "crash (signal N)" or
/// "crash (exit N)"; when `memory_bound_bytes` > 0 and its peak resident size
/// reached half of it, MemoryBoundReason(bound, that) (run/memory_bound.h).
std::string CrashReason(const ChildEnd& end, uint64_t memory_bound_bytes);

/// A forked child running a function, joined to the parent by a socketpair.
/// The destructor kills and reaps a child still running.
class ChildProcess {
 public:
  ChildProcess() = default;
  ~ChildProcess();
  ChildProcess(const ChildProcess&) = delete;
  ChildProcess& operator=(const ChildProcess&) = delete;

  /// Flushes stdio and forks. The child closes the parent's socket end and
  /// every fd in `close_in_child`, runs `body(its socket end)` and _exits
  /// with the value returned (no atexit handlers or static destructors). The
  /// parent's end is close-on-exec. False with `error` when socketpair or
  /// fork fail.
  bool Start(const std::function<int(int fd)>& body, const std::vector<int>& close_in_child,
             std::string* error);

  /// True between a successful Start and the reap.
  bool running() const { return pid_ > 0; }
  /// The child's pid (-1 when none runs).
  pid_t pid() const { return pid_; }
  /// The parent's socket end (-1 when none runs).
  int fd() const { return fd_; }

  /// Closes the socket, kills the child with SIGKILL and reaps it.
  ChildEnd Kill();
  /// Closes the socket and waits (blocking) for the child to end.
  ChildEnd Reap();
  /// Waits for the child to end, at most `timeout_s` (<= 0: no limit); past
  /// it the child is killed and the end is kTimedOut.
  ChildEnd WaitFor(double timeout_s);

 private:
  ChildEnd Collect(int options, bool* done);

  pid_t pid_ = -1;
  int fd_ = -1;
};

}  // namespace zvsmap
