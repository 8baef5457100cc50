#include "result/comparison.h"

namespace zvsmap {

std::vector<FlatColumn> FlatColumns(const Comparison& c) {
  if (!c.Paired()) return {{c.tag, c.predicted}};
  const std::string base = c.Name();
  double beyond = c.beyond_tolerance ? (*c.beyond_tolerance ? 1.0 : 0.0) : NAN;
  return {{base, c.predicted},
          {base + "__diff", c.difference},
          {base + "__rel_diff", c.relative_difference},
          {base + "__beyond_tol", beyond}};
}

}  // namespace zvsmap
