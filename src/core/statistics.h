// Small statistics for the tolerance reports: the normal distribution and the
// Wilson score interval of a proportion.
#pragma once

namespace zvsmap {

/// Phi(x), the standard normal distribution function (via std::erfc).
double NormalCdf(double x);

/// The x with Phi(x) = p, 0 < p < 1 (bisection on NormalCdf to double precision).
double NormalQuantile(double p);

/// A two-sided interval of a proportion.
struct ProportionInterval {
  double low = 0;
  double high = 1;
};

/// The Wilson score interval for `passes` of `trials` at two-sided confidence
/// `confidence` (0.95 for 95 %): with p = passes/trials, z = Phi^-1(1 - (1 -
/// confidence)/2),
///   (p + z²/2n ± z·sqrt(p(1-p)/n + z²/4n²)) / (1 + z²/n)
/// (E. B. Wilson, "Probable inference, the law of succession, and statistical
/// inference", JASA 22, 1927). trials == 0 gives [0, 1].
ProportionInterval WilsonInterval(int passes, int trials, double confidence);

}  // namespace zvsmap
