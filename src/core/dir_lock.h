// An exclusive lock on an output directory, so that two zvsmap processes never
// write one run store and one set of reports at the same time.
#pragma once

#include <memory>
#include <string>

namespace zvsmap {

/// The lock file's name inside the directory it guards.
inline constexpr const char kDirLockName[] = "zvsmap.lock";

/// Held while it lives: flock(2) on DIR/zvsmap.lock, which records the
/// holder's pid, start time and command. The kernel drops the lock when the
/// holder exits in any way (also kill -9), so a lock is never stale; the file
/// itself stays. Forked children share the lock and never release it early.
class DirLock {
 public:
  ~DirLock();
  DirLock(const DirLock&) = delete;
  DirLock& operator=(const DirLock&) = delete;

  /// Takes the lock of `dir` (which exists) for `command` ("run", "merge",
  /// "waveforms") without waiting. When another process holds it, returns
  /// null with `error` =
  /// "DIR: in use by zvsmap run (pid 123, started 2026-12-02 05:30:01 UTC); wait for it to
  /// finish or choose another output directory"
  /// (the holder as recorded; "another zvsmap process" when it recorded
  /// nothing yet). Other failures name the lock file and the OS's reason.
  static std::unique_ptr<DirLock> Acquire(const std::string& dir, const std::string& command,
                                          std::string* error);

 private:
  explicit DirLock(int fd) : fd_(fd) {}
  int fd_;
};

/// The holder text a lock file records, e.g. "zvsmap run (pid 123, started
/// 2026-12-02 05:30:01 UTC)", from the file's contents ("pid=123\nstarted=
/// 1764653401\ncommand=run\n"); "another zvsmap process" when it holds none.
std::string DescribeLockHolder(const std::string& lock_file_text);

}  // namespace zvsmap
