#include "core/atomic_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

namespace zvsmap {

namespace {

// The directory part of `path` ("." when it has none).
std::string DirectoryOf(const std::string& path) {
  size_t slash = path.find_last_of('/');
  if (slash == std::string::npos) return ".";
  if (slash == 0) return "/";
  return path.substr(0, slash);
}

bool WriteAllBytes(int fd, const char* data, size_t size) {
  while (size > 0) {
    ssize_t n = write(fd, data, size);
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) return false;
    if (n == 0) {
      errno = ENOSPC;  // a regular file that takes nothing is full
      return false;
    }
    data += n;
    size -= static_cast<size_t>(n);
  }
  return true;
}

int FsyncRetrying(int fd) {
  int rc;
  do {
    rc = fsync(fd);
  } while (rc != 0 && errno == EINTR);
  return rc;
}

}  // namespace

std::string OsErrorMessage(const std::string& path, const std::string& what, int errno_value) {
  return path + ": " + what + ": " + std::strerror(errno_value);
}

std::string AtomicTempPath(const std::string& path) {
  size_t slash = path.find_last_of('/');
  std::string dir = slash == std::string::npos ? "" : path.substr(0, slash + 1);
  std::string name = slash == std::string::npos ? path : path.substr(slash + 1);
  return dir + "." + name + ".tmp-" + std::to_string(getpid());
}

bool WriteFileAtomically(const std::string& path, const std::string& contents, std::string* error) {
  std::string temp = AtomicTempPath(path);
  int fd = open(temp.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0666);
  if (fd < 0) {
    *error = OsErrorMessage(path, "cannot write", errno);
    return false;
  }
  bool ok = WriteAllBytes(fd, contents.data(), contents.size()) && FsyncRetrying(fd) == 0;
  int saved = errno;
  if (close(fd) != 0 && ok) {
    ok = false;
    saved = errno;
  }
  if (!ok) {
    unlink(temp.c_str());
    *error = OsErrorMessage(path, "cannot write", saved);
    return false;
  }
  if (rename(temp.c_str(), path.c_str()) != 0) {
    saved = errno;
    unlink(temp.c_str());
    *error = OsErrorMessage(path, "cannot replace", saved);
    return false;
  }
  // The rename itself reaches the disk with the directory (best effort: some
  // file systems refuse to fsync a directory, and the data is safe anyway).
  int dir = open(DirectoryOf(path).c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (dir >= 0) {
    FsyncRetrying(dir);
    close(dir);
  }
  return true;
}

}  // namespace zvsmap
