// Simulated waveforms: a time axis and named vectors sampled on it.
#pragma once

#include <map>
#include <string>
#include <vector>

namespace zvsmap {

/// A transient result copied out of the simulator. Vector names are stored
/// lower-cased, under the name the caller asked the simulator for (e.g.
/// "v(sw)", "i(vsense)", "i(l1)").
class Waveforms {
 public:
  /// Sets the time axis (strictly increasing is not required; ngspice may
  /// repeat a time point at a breakpoint). It must be non-decreasing.
  void SetTime(std::vector<double> t) { time_ = std::move(t); }
  /// Adds or replaces a vector; its size must equal the time axis's (throws
  /// Error otherwise: a bug). The name is stored lower-cased.
  void Set(const std::string& name, std::vector<double> values);

  const std::vector<double>& time() const { return time_; }
  /// True when a vector of that name (case-insensitive) is present. "time"
  /// names the time axis and is present once SetTime was given samples.
  bool Has(const std::string& name) const;
  /// The samples of a vector ("time" gives the time axis); throws Error when
  /// absent (a bug: callers ask only for vectors they requested).
  const std::vector<double>& Get(const std::string& name) const;
  /// Linear interpolation of a vector at time t (clamped to the ends); see
  /// Interpolate(). Throws Error when the vector is absent or empty.
  double At(const std::string& name, double t) const;
  /// Names of all stored vectors, sorted, lower-case; the time axis is not
  /// listed.
  std::vector<std::string> Names() const;
  /// Keeps only samples with time in [t0, t1] plus one sample either side
  /// (when there is one), so interpolation at the window's edges stays exact.
  /// Throws Error when t0 > t1.
  Waveforms Window(double t0, double t1) const;

 private:
  std::vector<double> time_;
  std::map<std::string, std::vector<double>> vectors_;
};

/// Linear interpolation of samples (t, y) at time x; clamps outside the range
/// (x before t.front() gives y.front(), after t.back() gives y.back()).
/// `t` must be non-decreasing. Where a time point repeats (a discontinuity at
/// a breakpoint), x exactly at it gives the value of the LAST repeated sample
/// (right-continuous). Throws Error when t is empty or sizes differ.
double Interpolate(const std::vector<double>& t, const std::vector<double>& y, double x);

/// The average of samples (t, y) over [t0, t1] (t0 < t1): trapezoids between
/// the samples inside, the end points interpolated (Interpolate).
double Average(const std::vector<double>& t, const std::vector<double>& y, double t0, double t1);

}  // namespace zvsmap
