// Unit tests of the atomic whole-file write: complete or untouched, errors
// naming the path and the OS's reason, a real full file system.
#include "core/atomic_file.h"

#include <gtest/gtest.h>
#include <sched.h>
#include <sys/mount.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace zvsmap {
namespace {

namespace fs = std::filesystem;

std::string ReadText(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

// The names in `dir`, sorted, joined by spaces.
std::string Names(const std::string& dir) {
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(dir)) names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  std::string out;
  for (const auto& n : names) out += (out.empty() ? "" : " ") + n;
  return out;
}

class AtomicFileTest : public ::testing::Test {
 protected:
  void SetUp() override {
    char pattern[] = "/tmp/zvsmap-atomic-XXXXXX";
    ASSERT_NE(mkdtemp(pattern), nullptr);
    dir_ = pattern;
  }
  void TearDown() override { fs::remove_all(dir_); }
  std::string dir_;
};

TEST_F(AtomicFileTest, WritesTheWholeTextAndReplacesTheOldFile) {
  std::string path = dir_ + "/edges.csv";
  std::string error;
  ASSERT_TRUE(WriteFileAtomically(path, "old\n", &error)) << error;
  std::string big(300000, 'x');
  ASSERT_TRUE(WriteFileAtomically(path, big, &error)) << error;
  EXPECT_EQ(ReadText(path), big);
  EXPECT_EQ(Names(dir_), "edges.csv");  // no temporary file left
  struct stat st {};
  ASSERT_EQ(stat(path.c_str(), &st), 0);
  mode_t mask = umask(0);
  umask(mask);
  EXPECT_EQ(st.st_mode & 0777, 0666 & ~mask);  // like any file the user creates
}

TEST_F(AtomicFileTest, TheTemporaryFileIsHiddenBesideTheTarget) {
  EXPECT_EQ(AtomicTempPath("out/edges.csv"), "out/.edges.csv.tmp-" + std::to_string(getpid()));
  EXPECT_EQ(AtomicTempPath("x"), ".x.tmp-" + std::to_string(getpid()));
}

TEST_F(AtomicFileTest, MissingDirectoryNamesThePathAndTheReason) {
  std::string path = dir_ + "/absent/summary.xml";
  std::string error;
  EXPECT_FALSE(WriteFileAtomically(path, "<x/>", &error));
  EXPECT_EQ(error, path + ": cannot write: No such file or directory");
}

TEST_F(AtomicFileTest, ADirectoryInTheWayIsNotReplacedAndNoTemporaryStays) {
  std::string path = dir_ + "/index.html";
  fs::create_directory(path);
  std::string error;
  EXPECT_FALSE(WriteFileAtomically(path, "<html>", &error));
  EXPECT_EQ(error, path + ": cannot replace: Is a directory");
  EXPECT_EQ(Names(dir_), "index.html");
  EXPECT_TRUE(fs::is_directory(path));
}

TEST_F(AtomicFileTest, OsErrorMessageFormat) {
  EXPECT_EQ(OsErrorMessage("a/b.svg", "cannot write", ENOSPC),
            "a/b.svg: cannot write: No space left on device");
}

// A real full disk: a 64 KiB tmpfs mounted in a private mount namespace of a
// child process (needs root, or CAP_SYS_ADMIN). The child reports
// "error|contents of the old file|names in the directory" through a pipe.
TEST_F(AtomicFileTest, FullFileSystemLeavesTheOldFileWholeAndNoTemporary) {
  int fds[2];
  ASSERT_EQ(pipe(fds), 0);
  pid_t pid = fork();
  ASSERT_GE(pid, 0);
  if (pid == 0) {
    close(fds[0]);
    auto say = [&](const std::string& s) {
      ssize_t n = write(fds[1], s.data(), s.size());
      _exit(n == static_cast<ssize_t>(s.size()) ? 0 : 1);
    };
    if (unshare(CLONE_NEWNS) != 0) say(std::string("skip: unshare: ") + std::strerror(errno));
    if (mount(nullptr, "/", nullptr, MS_REC | MS_PRIVATE, nullptr) != 0 ||
        mount("tmpfs", dir_.c_str(), "tmpfs", 0, "size=64k") != 0) {
      say(std::string("skip: mount tmpfs: ") + std::strerror(errno));
    }
    std::string path = dir_ + "/edges.csv";
    std::string error;
    if (!WriteFileAtomically(path, "point,status\r\n0,ok\r\n", &error)) say("setup: " + error);
    bool ok = WriteFileAtomically(path, std::string(256 * 1024, 'x'), &error);
    say((ok ? std::string("written") : error) + "|" + ReadText(path) + "|" + Names(dir_));
  }
  close(fds[1]);
  std::string report;
  char buf[4096];
  ssize_t n;
  while ((n = read(fds[0], buf, sizeof buf)) > 0) report.append(buf, static_cast<size_t>(n));
  close(fds[0]);
  int status = 0;
  waitpid(pid, &status, 0);
  if (report.rfind("skip: ", 0) == 0) GTEST_SKIP() << "no private tmpfs here: " << report;
  EXPECT_EQ(report, dir_ + "/edges.csv: cannot write: No space left on device" +
                        "|point,status\r\n0,ok\r\n|edges.csv");
}

}  // namespace
}  // namespace zvsmap
