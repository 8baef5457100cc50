#include "run/progress.h"

#include <cmath>

namespace zvsmap {

std::string FormatDuration(double seconds) {
  if (!(seconds >= 0) || seconds > 1e8) return "?";
  long s = static_cast<long>(std::lround(seconds));
  char buf[32];
  if (s >= 3600) {
    std::snprintf(buf, sizeof buf, "%ld:%02ld:%02ld", s / 3600, (s / 60) % 60, s % 60);
  } else {
    std::snprintf(buf, sizeof buf, "%ld:%02ld", s / 60, s % 60);
  }
  return buf;
}

std::string FormatProgressLine(const ProgressCounts& c) {
  char buf[160];
  int n = std::snprintf(buf, sizeof buf, "%zu/%zu done, %zu failed", c.done, c.total, c.failed);
  std::string line(buf, static_cast<size_t>(n));
  if (c.run_now > 0 && c.elapsed_s > 0) {
    double rate = c.run_now / c.elapsed_s;
    std::snprintf(buf, sizeof buf, ", %.3g points/s, ETA %s", rate,
                  FormatDuration((c.total - c.done) / rate).c_str());
    line += buf;
  }
  return line;
}

ProgressReporter::ProgressReporter(std::FILE* out, Mode mode, size_t total, size_t already_done,
                                   size_t already_failed, double plain_interval_s)
    : out_(out),
      mode_(mode),
      plain_interval_s_(plain_interval_s),
      started_(std::chrono::steady_clock::now()) {
  counts_.total = total;
  counts_.done = already_done;
  counts_.failed = already_failed;
  Draw(true);
}

double ProgressReporter::Elapsed() const {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - started_).count();
}

void ProgressReporter::Draw(bool force) {
  counts_.elapsed_s = Elapsed();
  if (mode_ == Mode::kTerminal) {
    // \r plus "erase to end of line" (ECMA-48 EL) redraws in place.
    std::fprintf(out_, "\r%s\033[K", FormatProgressLine(counts_).c_str());
    line_shown_ = true;
  } else if (mode_ == Mode::kPlain &&
             (force || counts_.elapsed_s - last_plain_s_ >= plain_interval_s_)) {
    std::fprintf(out_, "zvsmap: %s\n", FormatProgressLine(counts_).c_str());
    last_plain_s_ = counts_.elapsed_s;
  }
  std::fflush(out_);
}

void ProgressReporter::PointDone(const PointResult& r, const std::string& description) {
  ++counts_.done;
  ++counts_.run_now;
  if (r.status != PointStatus::kOk) {
    ++counts_.failed;
    if (line_shown_) std::fputs("\r\033[K", out_);
    std::fprintf(out_, "zvsmap: point %zu (%s) %s: %s\n", r.index, description.c_str(),
                 PointStatusName(r.status), r.reason.c_str());
  }
  Draw(false);
}

void ProgressReporter::Tick() {
  if (mode_ != Mode::kQuiet) Draw(false);
}

void ProgressReporter::Finish() {
  if (mode_ == Mode::kTerminal && line_shown_) {
    std::fputs("\r\033[K", out_);
  } else if (mode_ == Mode::kPlain) {
    Draw(true);
  }
  std::fflush(out_);
}

}  // namespace zvsmap
