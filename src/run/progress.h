// Progress of a run on stderr: a line redrawn in place on a terminal, plain
// lines every few seconds elsewhere (CI logs), nothing but errors when quiet.
#pragma once

#include <chrono>
#include <cstddef>
#include <cstdio>
#include <string>

#include "result/point_result.h"

namespace zvsmap {

/// Counts shown in a progress line.
struct ProgressCounts {
  size_t total = 0;      ///< points in the sweep
  size_t done = 0;       ///< finished, including those kept from an earlier run
  size_t failed = 0;     ///< failed or unsettled among `done`
  size_t run_now = 0;    ///< finished in this run (the rate counts these)
  double elapsed_s = 0;  ///< since this run started
};

/// "37/120 done, 2 failed, 1.8 points/s, ETA 0:46" (rate and ETA once known).
std::string FormatProgressLine(const ProgressCounts& counts);

/// "1:02:03" or "4:05" for a duration in seconds.
std::string FormatDuration(double seconds);

/// Writes progress to a stream (normally stderr).
class ProgressReporter {
 public:
  enum class Mode { kTerminal, kPlain, kQuiet };
  /// `already_done`/`already_failed`: points kept from an earlier run.
  ProgressReporter(std::FILE* out, Mode mode, size_t total, size_t already_done,
                   size_t already_failed, double plain_interval_s = 5);

  /// Records a finished point. A failed or unsettled point is always printed
  /// as "zvsmap: point N (description) failed: reason" (also when quiet).
  void PointDone(const PointResult& result, const std::string& description);
  /// Redraws the line when its interval has passed (always on a terminal),
  /// also while no point finishes; call it often (the pool's on_tick).
  void Tick();
  /// Ends the progress line (a terminal's line is cleared).
  void Finish();
  /// The counts so far.
  const ProgressCounts& counts() const { return counts_; }

 private:
  void Draw(bool force);
  double Elapsed() const;

  std::FILE* out_;
  Mode mode_;
  ProgressCounts counts_;
  double plain_interval_s_;
  double last_plain_s_ = 0;
  bool line_shown_ = false;
  std::chrono::steady_clock::time_point started_;
};

}  // namespace zvsmap
