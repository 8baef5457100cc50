#include "run/child_process.h"

#include <fcntl.h>
#include <signal.h>
#include <sys/resource.h>
#include <sys/socket.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <thread>

#include "run/memory_bound.h"

namespace zvsmap {

double DerivedTimeout(const std::vector<double>& first_durations_s) {
  if (first_durations_s.empty()) return 300;
  double longest = 0;
  for (size_t i = 0; i < first_durations_s.size() && i < 3; ++i) {
    longest = std::max(longest, first_durations_s[i]);
  }
  return std::max(30.0, 20 * longest);
}

std::string TimeoutReason(double timeout_s) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3g", timeout_s);
  return "timeout after " + std::string(buf) + " s";
}

std::string CrashReason(const ChildEnd& end, uint64_t memory_bound_bytes) {
  std::string reason = "crash";
  if (end.kind == ChildEnd::Kind::kSignaled) {
    reason = "crash (signal " + std::to_string(end.code) + ")";
  } else if (end.kind == ChildEnd::Kind::kExited) {
    reason = "crash (exit " + std::to_string(end.code) + ")";
  }
  if (memory_bound_bytes > 0 && end.peak_rss_bytes >= memory_bound_bytes / 2) {
    return MemoryBoundReason(memory_bound_bytes, reason);
  }
  return reason;
}

ChildProcess::~ChildProcess() {
  if (running()) Kill();
}

bool ChildProcess::Start(const std::function<int(int fd)>& body,
                         const std::vector<int>& close_in_child, std::string* error) {
  int fds[2];
  if (socketpair(AF_UNIX, SOCK_STREAM, 0, fds) != 0) {
    *error = std::string("socketpair: ") + std::strerror(errno);
    return false;
  }
  std::fflush(nullptr);  // nothing buffered may be written twice
  pid_t pid = fork();
  if (pid < 0) {
    *error = std::string("fork: ") + std::strerror(errno);
    close(fds[0]);
    close(fds[1]);
    return false;
  }
  if (pid == 0) {
    close(fds[0]);
    // Other children's sockets must close here, or their EOF never arrives.
    for (int fd : close_in_child) {
      if (fd >= 0) close(fd);
    }
    int rc = body(fds[1]);
    std::fflush(nullptr);
    _exit(rc);
  }
  close(fds[1]);
  fcntl(fds[0], F_SETFD, FD_CLOEXEC);
  pid_ = pid;
  fd_ = fds[0];
  return true;
}

ChildEnd ChildProcess::Collect(int options, bool* done) {
  ChildEnd end;
  int status = 0;
  struct rusage usage {};
  pid_t got;
  while ((got = wait4(pid_, &status, options, &usage)) < 0 && errno == EINTR) {
  }
  *done = got == pid_ || got < 0;  // < 0: not our child any more; nothing to wait for
  if (!*done) return end;
  if (got == pid_ && WIFSIGNALED(status)) {
    end.kind = ChildEnd::Kind::kSignaled;
    end.code = WTERMSIG(status);
  } else if (got == pid_ && WIFEXITED(status)) {
    end.code = WEXITSTATUS(status);
  } else {
    end.code = -1;
  }
  end.peak_rss_bytes = static_cast<uint64_t>(usage.ru_maxrss) * 1024;  // ru_maxrss is in KiB
  if (fd_ >= 0) close(fd_);
  pid_ = -1;
  fd_ = -1;
  return end;
}

ChildEnd ChildProcess::Kill() {
  if (!running()) return {};
  close(fd_);
  fd_ = -1;
  kill(pid_, SIGKILL);
  return Reap();
}

ChildEnd ChildProcess::Reap() {
  if (!running()) return {};
  if (fd_ >= 0) close(fd_);
  fd_ = -1;
  bool done = false;
  return Collect(0, &done);
}

ChildEnd ChildProcess::WaitFor(double timeout_s) {
  if (timeout_s <= 0) return Reap();
  auto deadline = std::chrono::steady_clock::now() + std::chrono::duration<double>(timeout_s);
  for (;;) {
    bool done = false;
    ChildEnd end = Collect(WNOHANG, &done);
    if (done) return end;
    if (std::chrono::steady_clock::now() > deadline) {
      end = Kill();
      end.kind = ChildEnd::Kind::kTimedOut;
      return end;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  }
}

}  // namespace zvsmap
