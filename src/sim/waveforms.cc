#include "sim/waveforms.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cstddef>

#include "core/diagnostic.h"
#include "core/text.h"

namespace zvsmap {
void Waveforms::Set(const std::string& name, std::vector<double> values) {
  if (values.size() != time_.size()) {
    throw Error(fmt::format("vector '{}' has {} samples but the time axis has {}", name,
                            values.size(), time_.size()));
  }
  vectors_[Lower(name)] = std::move(values);
}

bool Waveforms::Has(const std::string& name) const {
  std::string key = Lower(name);
  if (key == "time") return !time_.empty();
  return vectors_.count(key) != 0;
}

const std::vector<double>& Waveforms::Get(const std::string& name) const {
  std::string key = Lower(name);
  if (key == "time" && !time_.empty()) return time_;
  auto it = vectors_.find(key);
  if (it == vectors_.end()) throw Error(fmt::format("no vector '{}' in the waveforms", name));
  return it->second;
}

double Waveforms::At(const std::string& name, double t) const {
  return Interpolate(time_, Get(name), t);
}

std::vector<std::string> Waveforms::Names() const {
  std::vector<std::string> names;
  names.reserve(vectors_.size());
  for (const auto& entry : vectors_) names.push_back(entry.first);
  return names;  // std::map keeps them sorted
}

Waveforms Waveforms::Window(double t0, double t1) const {
  if (t0 > t1) throw Error(fmt::format("empty window [{}, {}]", t0, t1));
  // First sample at or after t0, minus one; first sample after t1, plus one.
  size_t lo = static_cast<size_t>(std::lower_bound(time_.begin(), time_.end(), t0) - time_.begin());
  size_t hi = static_cast<size_t>(std::upper_bound(time_.begin(), time_.end(), t1) - time_.begin());
  if (lo > 0) --lo;
  if (hi < time_.size()) ++hi;
  Waveforms out;
  if (lo >= hi) return out;
  out.time_.assign(time_.begin() + static_cast<std::ptrdiff_t>(lo),
                   time_.begin() + static_cast<std::ptrdiff_t>(hi));
  for (const auto& entry : vectors_) {
    out.vectors_[entry.first].assign(entry.second.begin() + static_cast<std::ptrdiff_t>(lo),
                                     entry.second.begin() + static_cast<std::ptrdiff_t>(hi));
  }
  return out;
}

double Interpolate(const std::vector<double>& t, const std::vector<double>& y, double x) {
  if (t.empty()) throw Error("interpolation over an empty time axis");
  if (t.size() != y.size()) {
    throw Error(fmt::format("interpolation with {} time points but {} values", t.size(), y.size()));
  }
  // i = first sample strictly after x, so t[i-1] <= x < t[i] and the interval
  // has non-zero width even where time points repeat.
  size_t i = static_cast<size_t>(std::upper_bound(t.begin(), t.end(), x) - t.begin());
  if (i == 0) return y.front();
  if (i == t.size()) return y.back();
  double frac = (x - t[i - 1]) / (t[i] - t[i - 1]);
  return y[i - 1] + frac * (y[i] - y[i - 1]);
}

double Average(const std::vector<double>& t, const std::vector<double>& y, double t0, double t1) {
  double sum = 0, tp = t0, yp = Interpolate(t, y, t0);
  for (size_t k = 0; k < t.size(); ++k) {
    if (t[k] <= t0 || t[k] >= t1) continue;
    sum += 0.5 * (y[k] + yp) * (t[k] - tp);
    tp = t[k];
    yp = y[k];
  }
  sum += 0.5 * (Interpolate(t, y, t1) + yp) * (t1 - tp);
  return sum / (t1 - t0);
}

}  // namespace zvsmap
