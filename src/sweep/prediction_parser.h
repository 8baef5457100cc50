// Reads <predict> elements of a sweep file into PredictionSpecs.
#pragma once

#include <functional>
#include <pugixml.hpp>
#include <string>
#include <vector>

#include "core/diagnostic.h"
#include "sweep/prediction_spec.h"

namespace zvsmap {

/// Reports a problem in the element being parsed: `attribute` is the
/// attribute at fault (nullptr for the element); returns false.
using PredictionFail = std::function<bool(const char* attribute, const std::string& message)>;

/// Parses one <predict> element (attributes: name, expr, optional compare,
/// edge, cell, tolerance). Checks the name (an identifier, not used by an
/// earlier prediction in `earlier`), the edge, that compare comes with an
/// edge, the tolerance ("5%" relative or a number, absolute) and the
/// expression's syntax. Names in the expression are checked later, against the
/// template and its model. On a problem calls `fail` and returns its result.
bool ParsePrediction(pugi::xml_node node, const SourceLocation& where,
                     const SourceLocation& expr_where, const std::vector<PredictionSpec>& earlier,
                     const PredictionFail& fail, PredictionSpec* out);

}  // namespace zvsmap
