#include "sweep/prediction_parser.h"

#include <muParser.h>

#include <algorithm>
#include <cctype>
#include <optional>
#include <regex>

#include "core/expression.h"
#include "core/spice_number.h"
#include "core/text.h"
#include "result/edge_identity.h"

namespace zvsmap {

namespace {

bool IsName(const std::string& s) {
  if (s.empty() || std::isdigit(static_cast<unsigned char>(s[0]))) return false;
  return std::all_of(s.begin(), s.end(), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_';
  });
}

}  // namespace

bool ParsePrediction(pugi::xml_node node, const SourceLocation& where,
                     const SourceLocation& expr_where, const std::vector<PredictionSpec>& earlier,
                     const PredictionFail& fail, PredictionSpec* out) {
  static const std::vector<std::string> kAttributes = {"name", "expr", "compare",
                                                       "edge", "cell", "tolerance"};
  for (pugi::xml_attribute a : node.attributes()) {
    std::string name = a.name();
    if (std::find(kAttributes.begin(), kAttributes.end(), name) == kAttributes.end()) {
      std::string best = ClosestName(name, kAttributes);
      return fail(a.name(), "unknown attribute '" + name + "' on <predict>" +
                                (best.empty() ? "" : " (did you mean '" + best + "'?)"));
    }
  }
  *out = PredictionSpec();
  out->where = where;
  out->expr_where = expr_where;
  out->name = Trim(node.attribute("name").value());
  out->expression = Trim(node.attribute("expr").value());
  out->compare = Trim(node.attribute("compare").value());
  out->edge = Trim(node.attribute("edge").value());
  out->cell = Trim(node.attribute("cell").value());
  if (!node.attribute("name")) return fail(nullptr, "missing attribute 'name' on <predict>");
  if (!IsName(out->name)) {
    return fail("name", "bad prediction name '" + out->name +
                            "' (letters, digits and '_', not starting with a digit)");
  }
  for (const PredictionSpec& p : earlier) {
    if (EditDistance(p.name, out->name) == 0) {
      return fail("name", "prediction '" + out->name + "' is named twice (first on line " +
                              std::to_string(p.where.line) + ")");
    }
  }
  if (out->expression.empty())
    return fail(node.attribute("expr") ? "expr" : nullptr, "<predict> needs a non-empty 'expr'");
  EdgeKind kind;
  if (!out->edge.empty() && !ParseEdgeKind(out->edge, &kind)) {
    return fail("edge", "bad edge '" + out->edge + "' (use 'high_on' or 'low_on')");
  }
  if (!out->compare.empty() && out->edge.empty()) {
    return fail("compare", "'compare' needs 'edge' (the metric is measured per edge)");
  }
  if (node.attribute("tolerance")) {
    std::string raw = Trim(node.attribute("tolerance").value());
    bool percent = !raw.empty() && raw.back() == '%';
    std::optional<double> v = ParseSpiceNumber(percent ? raw.substr(0, raw.size() - 1) : raw);
    if (!v || *v < 0) {
      return fail("tolerance", "bad tolerance '" + raw + "' (e.g. '5%' or an absolute '0.5n')");
    }
    if (percent && *v > 100) {
      return fail("tolerance", "tolerance '" + raw +
                                   "' is above 100% (it would accept any prediction of the "
                                   "right sign)");
    }
    out->tolerance_rel = percent ? *v / 100 : 0;
    out->tolerance_abs = percent ? 0 : *v;
  }
  // Syntax only; which names exist depends on the template and its model.
  try {
    mu::Parser parser;
    parser.DefineConst("_pi", 3.14159265358979323846);
    parser.SetExpr(NormalizeSpiceExpression(out->expression));
    for (const auto& kv : parser.GetUsedVar()) out->names.push_back(kv.first);
  } catch (const mu::ParserError& e) {
    // muParser counts from 0 in the text it saw; map to a 1-based column of
    // the expression as written when normalization left it unchanged.
    int column = 0;
    if (e.GetPos() >= 0 && NormalizeSpiceExpression(out->expression) == out->expression) {
      column =
          std::min(static_cast<int>(e.GetPos()) + 1, static_cast<int>(out->expression.size()) + 1);
    }
    static const std::regex kPosition(R"(\s*at position \d+\.?$)");
    std::string message = std::regex_replace(e.GetMsg(), kPosition, "");
    return fail("expr", "bad expression '" + out->expression + "'" +
                            (column > 0 ? " at column " + std::to_string(column) : "") + ": " +
                            message);
  }
  return true;
}

}  // namespace zvsmap
