// Tests of the child-process supervisor: a forked function, its socket, how
// it ended (exit, signal, timeout, peak size) and the one timeout rule.
#include "run/child_process.h"

#include <gtest/gtest.h>
#include <signal.h>
#include <unistd.h>

#include <cstring>
#include <string>
#include <vector>

#include "run/memory_bound.h"

namespace zvsmap {
namespace {

TEST(ChildProcessTest, ReportsTheExitStatusAndTalksOverTheSocket) {
  ChildProcess child;
  std::string error;
  ASSERT_TRUE(child.Start(
      [](int fd) {
        const char hello[] = "hi";
        return write(fd, hello, 2) == 2 ? 7 : 1;
      },
      {}, &error))
      << error;
  EXPECT_TRUE(child.running());
  char buf[2] = {};
  ASSERT_EQ(read(child.fd(), buf, 2), 2);
  EXPECT_EQ(std::string(buf, 2), "hi");
  ChildEnd end = child.Reap();
  EXPECT_FALSE(child.running());
  EXPECT_EQ(end.kind, ChildEnd::Kind::kExited);
  EXPECT_EQ(end.code, 7);
  EXPECT_EQ(CrashReason(end, 0), "crash (exit 7)");
}

TEST(ChildProcessTest, ReportsTheSignalThatEndedTheChild) {
  ChildProcess child;
  std::string error;
  ASSERT_TRUE(child.Start(
      [](int) {
        signal(SIGSEGV, SIG_DFL);
        raise(SIGSEGV);
        return 0;
      },
      {}, &error));
  ChildEnd end = child.WaitFor(30);
  EXPECT_EQ(end.kind, ChildEnd::Kind::kSignaled);
  EXPECT_EQ(end.code, SIGSEGV);
  EXPECT_EQ(CrashReason(end, 4ull << 30), "crash (signal 11)");  // SIGSEGV is 11 on Linux
}

TEST(ChildProcessTest, KillsAChildPastItsTimeLimit) {
  ChildProcess child;
  std::string error;
  ASSERT_TRUE(child.Start(
      [](int) {
        for (;;) pause();
        return 0;
      },
      {}, &error));
  ChildEnd end = child.WaitFor(0.3);
  EXPECT_EQ(end.kind, ChildEnd::Kind::kTimedOut);
  EXPECT_FALSE(child.running());
  EXPECT_EQ(TimeoutReason(0.3), "timeout after 0.3 s");
}

TEST(ChildProcessTest, APeakNearTheMemoryBoundIsWordedAsTheBound) {
  ChildEnd end;
  end.kind = ChildEnd::Kind::kSignaled;
  end.code = 9;
  end.peak_rss_bytes = 200ull << 20;
  EXPECT_EQ(CrashReason(end, 256ull << 20),
            "memory bound: the worker reached its 256 MiB limit (--worker-memory); crash "
            "(signal 9)");
  EXPECT_EQ(CrashReason(end, 1ull << 30), "crash (signal 9)");  // 200 MiB < half of 1 GiB
}

TEST(ChildProcessTest, DestroyingARunningChildKillsAndReapsIt) {
  pid_t pid = -1;
  {
    ChildProcess child;
    std::string error;
    ASSERT_TRUE(child.Start(
        [](int) {
          for (;;) pause();
          return 0;
        },
        {}, &error));
    pid = child.pid();
  }
  EXPECT_EQ(kill(pid, 0), -1);  // reaped: no such process
}

}  // namespace
}  // namespace zvsmap
