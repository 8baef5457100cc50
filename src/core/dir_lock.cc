#include "core/dir_lock.h"

#include <fcntl.h>
#include <sys/file.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <ctime>
#include <map>
#include <sstream>

#include "core/atomic_file.h"

namespace zvsmap {

namespace {

std::string ReadFd(int fd) {
  std::string text;
  char buf[512];
  off_t at = 0;
  for (;;) {
    ssize_t n = pread(fd, buf, sizeof buf, at);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) break;
    text.append(buf, static_cast<size_t>(n));
    at += n;
    if (text.size() > 4096) break;
  }
  return text;
}

std::string UtcTime(time_t t) {
  struct tm parts {};
  gmtime_r(&t, &parts);
  char buf[40];
  strftime(buf, sizeof buf, "%Y-%m-%d %H:%M:%S UTC", &parts);
  return buf;
}

}  // namespace

std::string DescribeLockHolder(const std::string& text) {
  std::map<std::string, std::string> fields;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) {
    size_t eq = line.find('=');
    if (eq != std::string::npos) fields[line.substr(0, eq)] = line.substr(eq + 1);
  }
  const std::string& pid = fields["pid"];
  if (pid.empty() || pid.find_first_not_of("0123456789") != std::string::npos) {
    return "another zvsmap process";
  }
  std::string command = fields["command"];
  if (command.find_first_not_of("abcdefghijklmnopqrstuvwxyz") != std::string::npos) command = "";
  std::string out = "zvsmap" + (command.empty() ? "" : " " + command) + " (pid " + pid;
  const std::string& started = fields["started"];
  if (!started.empty() && started.find_first_not_of("0123456789") == std::string::npos) {
    out += ", started " + UtcTime(static_cast<time_t>(std::strtoll(started.c_str(), nullptr, 10)));
  }
  return out + ")";
}

std::unique_ptr<DirLock> DirLock::Acquire(const std::string& dir, const std::string& command,
                                          std::string* error) {
  std::string path = dir + "/" + kDirLockName;
  int fd = open(path.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0666);
  if (fd < 0) {
    *error = OsErrorMessage(path, "cannot open the lock file", errno);
    return nullptr;
  }
  int rc;
  do {
    rc = flock(fd, LOCK_EX | LOCK_NB);
  } while (rc != 0 && errno == EINTR);
  if (rc != 0) {
    int saved = errno;
    if (saved == EWOULDBLOCK) {
      *error = dir + ": in use by " + DescribeLockHolder(ReadFd(fd)) +
               "; wait for it to finish or choose another output directory";
    } else {
      *error = OsErrorMessage(path, "cannot lock", saved);
    }
    close(fd);
    return nullptr;
  }
  // Ours now: record who holds it, for the message another process prints.
  // Best effort: on a full disk the lock holds all the same.
  std::string holder = "pid=" + std::to_string(getpid()) +
                       "\nstarted=" + std::to_string(static_cast<long long>(time(nullptr))) +
                       "\ncommand=" + command + "\n";
  bool partial = ftruncate(fd, 0) == 0 &&
                 pwrite(fd, holder.data(), holder.size(), 0) != static_cast<ssize_t>(holder.size());
  if (partial && ftruncate(fd, 0) != 0) {
    // A torn record would misname the holder; an empty one says "another process".
  }
  return std::unique_ptr<DirLock>(new DirLock(fd));
}

DirLock::~DirLock() { close(fd_); }

}  // namespace zvsmap
