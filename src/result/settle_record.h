// How a point reached (or did not reach) periodic steady state.
#pragma once

#include <limits>
#include <string>
#include <utility>
#include <vector>

namespace zvsmap {

/// The way the settled state was found. kNotAttempted: the point failed
/// before settling; kNone: the template has no slow state, every period is
/// already periodic; kShooting: Newton shooting on the slow states;
/// kPeriods: period-by-period simulation until the residual is small.
enum class SettleMethod { kNotAttempted, kNone, kShooting, kPeriods };

/// "", "none", "shooting", "periods": the one place a method becomes text.
const char* SettleMethodName(SettleMethod m);

/// The inverse of SettleMethodName. Returns false (and leaves `out` alone)
/// for any other text.
bool SettleMethodFromName(const std::string& name, SettleMethod* out);

/// One slow state at the start of the settled period: the template's
/// `*@ state` init parameter and its value.
struct SettledState {
  std::string init_param;
  double value = 0;
  bool operator==(const SettledState& o) const {
    return init_param == o.init_param && value == o.value;
  }
};

/// How a point was settled, as stored and reported.
struct SettleRecord {
  SettleMethod method = SettleMethod::kNotAttempted;
  int iterations = 0;  ///< Newton iterations (shooting) or 0
  /// Switching periods simulated in all: every run's length, a measured run's
  /// tail beyond its last whole period included (run/point_evaluator.h).
  double periods = 0;
  double residual = std::numeric_limits<double>::quiet_NaN();  ///< final relative residual
  /// The settled start-of-period state, in template order, then (regulated
  /// loop) the control parameter's settled value: the parameters that
  /// reproduce the settled period when set on the point.
  std::vector<SettledState> initial_state;
  /// When shooting settled: the Jacobian of the shooting function at the
  /// settled unknowns (same order as initial_state), row-major, for the warm
  /// start of the next point of its chain (run/chain_memory.h); empty when
  /// none (not shooting, or an entry was not finite).
  std::vector<double> jacobian;
};

}  // namespace zvsmap
