#include "core/statistics.h"

#include <algorithm>
#include <cmath>

namespace zvsmap {

double NormalCdf(double x) { return 0.5 * std::erfc(-x / std::sqrt(2.0)); }

double NormalQuantile(double p) {
  double lo = -40, hi = 40;
  for (int i = 0; i < 200 && hi - lo > 1e-15 * std::max(1.0, std::fabs(lo)); ++i) {
    double mid = 0.5 * (lo + hi);
    (NormalCdf(mid) < p ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

ProportionInterval WilsonInterval(int passes, int trials, double confidence) {
  if (trials <= 0) return {};
  double n = trials;
  double p = passes / n;
  double z = NormalQuantile(1 - (1 - confidence) / 2);
  double z2 = z * z;
  double denominator = 1 + z2 / n;
  double center = (p + z2 / (2 * n)) / denominator;
  double half = z * std::sqrt(p * (1 - p) / n + z2 / (4 * n * n)) / denominator;
  return {std::max(0.0, center - half), std::min(1.0, center + half)};
}

}  // namespace zvsmap
