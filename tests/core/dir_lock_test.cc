// Unit tests of the output-directory lock: one holder at a time, the holder
// named in the refusal, and no stale lock after the holder dies.
#include "core/dir_lock.h"

#include <gtest/gtest.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>

namespace zvsmap {
namespace {

namespace fs = std::filesystem;

class DirLockTest : public ::testing::Test {
 protected:
  void SetUp() override {
    char pattern[] = "/tmp/zvsmap-lock-XXXXXX";
    ASSERT_NE(mkdtemp(pattern), nullptr);
    dir_ = pattern;
  }
  void TearDown() override { fs::remove_all(dir_); }
  std::string dir_;
};

TEST_F(DirLockTest, HolderTextFromTheRecord) {
  // 1764653401 s after the epoch is 2025-12-02 05:30:01 UTC (date -u -d @1764653401).
  EXPECT_EQ(DescribeLockHolder("pid=123\nstarted=1764653401\ncommand=run\n"),
            "zvsmap run (pid 123, started 2025-12-02 05:30:01 UTC)");
  EXPECT_EQ(DescribeLockHolder("pid=77\ncommand=merge\n"), "zvsmap merge (pid 77)");
  EXPECT_EQ(DescribeLockHolder(""), "another zvsmap process");
  EXPECT_EQ(DescribeLockHolder("pid=1x\n"), "another zvsmap process");
}

TEST_F(DirLockTest, SecondHolderIsRefusedWithTheFirstNamedUntilItLetsGo) {
  std::string error;
  std::unique_ptr<DirLock> first = DirLock::Acquire(dir_, "run", &error);
  ASSERT_NE(first, nullptr) << error;
  std::ifstream record(dir_ + "/zvsmap.lock");
  std::string text((std::istreambuf_iterator<char>(record)), std::istreambuf_iterator<char>());
  EXPECT_EQ(text.rfind("pid=" + std::to_string(getpid()) + "\nstarted=", 0), 0u) << text;
  EXPECT_NE(text.find("\ncommand=run\n"), std::string::npos) << text;

  // flock(2) locks belong to an open file: a second open conflicts even here.
  EXPECT_EQ(DirLock::Acquire(dir_, "merge", &error), nullptr);
  EXPECT_EQ(error, dir_ + ": in use by " + DescribeLockHolder(text) +
                       "; wait for it to finish or choose another output directory");
  EXPECT_EQ(
      error.find(dir_ + ": in use by zvsmap run (pid " + std::to_string(getpid()) + ", started "),
      0u)
      << error;
  first.reset();
  EXPECT_NE(DirLock::Acquire(dir_, "merge", &error), nullptr) << error;
}

TEST_F(DirLockTest, AHolderKilledWithSigkillLeavesNoStaleLock) {
  int ready[2];
  ASSERT_EQ(pipe(ready), 0);
  pid_t pid = fork();
  ASSERT_GE(pid, 0);
  if (pid == 0) {
    std::string why;
    std::unique_ptr<DirLock> held = DirLock::Acquire(dir_, "run", &why);
    char c = held ? 'y' : 'n';
    if (write(ready[1], &c, 1) != 1) _exit(1);
    for (;;) pause();
  }
  char c = 0;
  ASSERT_EQ(read(ready[0], &c, 1), 1);
  ASSERT_EQ(c, 'y');
  std::string error;
  EXPECT_EQ(DirLock::Acquire(dir_, "run", &error), nullptr);
  EXPECT_NE(error.find("(pid " + std::to_string(pid) + ", started "), std::string::npos) << error;
  kill(pid, SIGKILL);
  waitpid(pid, nullptr, 0);
  EXPECT_NE(DirLock::Acquire(dir_, "run", &error), nullptr) << error;
  close(ready[0]);
  close(ready[1]);
}

TEST_F(DirLockTest, MissingDirectoryNamesTheLockFileAndTheReason) {
  std::string error;
  EXPECT_EQ(DirLock::Acquire(dir_ + "/absent", "run", &error), nullptr);
  EXPECT_EQ(error,
            dir_ + "/absent/zvsmap.lock: cannot open the lock file: No such file or directory");
}

}  // namespace
}  // namespace zvsmap
