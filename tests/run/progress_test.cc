// Unit tests of the progress line.
#include "run/progress.h"

#include <gtest/gtest.h>

#include <chrono>
#include <cstdio>
#include <string>
#include <thread>

namespace zvsmap {
namespace {

TEST(ProgressTest, LineShowsCountsRateAndEta) {
  ProgressCounts c;
  c.total = 120;
  c.done = 40;
  c.failed = 2;
  c.run_now = 20;
  c.elapsed_s = 10;
  // 20 points in 10 s = 2 points/s; 80 left -> 40 s (arithmetic).
  EXPECT_EQ(FormatProgressLine(c), "40/120 done, 2 failed, 2 points/s, ETA 0:40");
}

TEST(ProgressTest, NoRateBeforeThePointsOfThisRun) {
  ProgressCounts c;
  c.total = 10;
  c.done = 4;
  EXPECT_EQ(FormatProgressLine(c), "4/10 done, 0 failed");
}

TEST(ProgressTest, DurationFormat) {
  EXPECT_EQ(FormatDuration(0), "0:00");
  EXPECT_EQ(FormatDuration(65), "1:05");
  EXPECT_EQ(FormatDuration(3723), "1:02:03");
  EXPECT_EQ(FormatDuration(-1), "?");
}

std::string Capture(ProgressReporter::Mode mode, bool fail) {
  char* buf = nullptr;
  size_t size = 0;
  FILE* f = open_memstream(&buf, &size);
  {
    ProgressReporter p(f, mode, 3, 0, 0, 1000);
    PointResult r;
    r.index = 1;
    r.status = fail ? PointStatus::kFailed : PointStatus::kOk;
    r.reason = "timeout after 30 s";
    p.PointDone(r, "L=1u");
    p.Finish();
  }
  std::fclose(f);
  std::string text(buf, size);
  free(buf);
  return text;
}

TEST(ProgressTest, QuietPrintsOnlyFailures) {
  EXPECT_EQ(Capture(ProgressReporter::Mode::kQuiet, false), "");
  EXPECT_EQ(Capture(ProgressReporter::Mode::kQuiet, true),
            "zvsmap: point 1 (L=1u) failed: timeout after 30 s\n");
}

TEST(ProgressTest, PlainModeWritesWholeLinesWithoutControlCharacters) {
  std::string text = Capture(ProgressReporter::Mode::kPlain, false);
  EXPECT_EQ(text.find('\r'), std::string::npos);
  EXPECT_EQ(text.find('\033'), std::string::npos);
  EXPECT_EQ(text.substr(0, 29), "zvsmap: 0/3 done, 0 failed\nzv");
}

TEST(ProgressTest, TerminalModeRedrawsInPlace) {
  std::string text = Capture(ProgressReporter::Mode::kTerminal, false);
  // Carriage return + ECMA-48 "erase in line" (CSI K), no newline.
  EXPECT_EQ(text.find('\n'), std::string::npos);
  EXPECT_NE(text.find("\r1/3 done, 0 failed"), std::string::npos);
}

TEST(ProgressTest, TickPrintsAPlainLineOncePerIntervalWhileNothingFinishes) {
  char* buf = nullptr;
  size_t size = 0;
  FILE* f = open_memstream(&buf, &size);
  {
    ProgressReporter p(f, ProgressReporter::Mode::kPlain, 6, 0, 0, 0.5);
    p.Tick();  // too soon after the first line
    std::this_thread::sleep_for(std::chrono::milliseconds(600));
    p.Tick();  // the interval has passed: a line although no point finished
    p.Tick();  // too soon again
  }
  std::fclose(f);
  std::string text(buf, size);
  free(buf);
  EXPECT_EQ(text, "zvsmap: 0/6 done, 0 failed\nzvsmap: 0/6 done, 0 failed\n");
}

TEST(ProgressTest, TickIsSilentWhenQuiet) {
  char* buf = nullptr;
  size_t size = 0;
  FILE* f = open_memstream(&buf, &size);
  {
    ProgressReporter p(f, ProgressReporter::Mode::kQuiet, 6, 0, 0, 0);
    p.Tick();
  }
  std::fclose(f);
  std::string text(buf, size);
  free(buf);
  EXPECT_EQ(text, "");
}

}  // namespace
}  // namespace zvsmap
