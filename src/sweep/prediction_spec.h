// The sweep file's own hand formulas: `<predict name=... expr=... [compare=...
// edge=... cell=... tolerance=...]/>` (see README "Predictions").
#pragma once

#include <string>
#include <vector>

#include "core/diagnostic.h"

namespace zvsmap {

/// One `<predict>` element: a named expression over the point's parameters,
/// the built-in model's predictions and earlier predictions, optionally
/// paired with a simulated metric of one edge.
struct PredictionSpec {
  std::string name;             ///< identifier, unique in the file; carries its unit by convention
  std::string expression;       ///< muParser syntax, as in <derive>
  std::string compare;          ///< metric column to pair with, or ""
  std::string edge;             ///< "high_on"/"low_on" (required with compare), or ""
  std::string cell;             ///< "" = every cell
  double tolerance_rel = 0.05;  ///< relative tolerance ("5%"), 0 if absolute given
  double tolerance_abs = 0;     ///< absolute tolerance ("0.5n"), 0 if relative given
  std::vector<std::string> names;  ///< the names the expression uses, as written
  SourceLocation where;            ///< the <predict> element
  SourceLocation expr_where;       ///< the `expr=` attribute (its column: the 'e')
};

}  // namespace zvsmap
