// A hand-calculation value set beside the measurements of one edge.
#pragma once

#include <cmath>
#include <optional>
#include <string>
#include <vector>

namespace zvsmap {

/// One prediction at one edge. Paired (metric not empty): the prediction is
/// compared with the measured `metric`. Unpaired: a <predict> without
/// `compare`, shown on its own under its name (`tag`).
struct Comparison {
  std::string metric;  ///< the measured metric compared with, or "" (unpaired)
  std::string tag;     ///< "pred" (built-in model), the model's own tag, or the <predict> name
  double predicted = NAN;
  double difference = NAN;               ///< simulated - predicted
  double relative_difference = NAN;      ///< difference / |predicted|; NaN when predicted is 0
  std::optional<bool> beyond_tolerance;  ///< empty when nothing was predicted

  bool Paired() const { return !metric.empty(); }
  /// The name of the predicted value: "M__tag" when paired, else `tag`.
  std::string Name() const { return Paired() ? metric + "__" + tag : tag; }
};

/// A named number as the CSV shows it.
struct FlatColumn {
  std::string name;
  double value = NAN;
};

/// The CSV columns of a comparison: paired, M__tag, M__tag__diff,
/// M__tag__rel_diff and M__tag__beyond_tol (1/0, NaN when empty); unpaired,
/// one column named `tag`. The one place comparisons become column names.
std::vector<FlatColumn> FlatColumns(const Comparison& c);

}  // namespace zvsmap
