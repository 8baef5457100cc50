#include "core/expression.h"

#include <muParser.h>

#include <cctype>
#include <cmath>
#include <regex>

#include "core/spice_number.h"

namespace zvsmap {

std::string NormalizeSpiceExpression(const std::string& expr) {
  // A numeric literal that does not follow an identifier character, with an
  // optional exponent and a SPICE scale suffix. The suffix must not run into
  // a longer identifier (so "2*k" or "3min" are left for muParser to reject).
  static const std::regex kLiteral(
      R"((^|[^A-Za-z0-9_.])((?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)(meg|MEG|Meg|[fpnumkgtFPNUMKGT])(?![A-Za-z0-9_]))");
  std::string out;
  std::string s = expr;
  // "**" -> "^"
  for (size_t pos; (pos = s.find("**")) != std::string::npos;) s.replace(pos, 2, "^");
  std::smatch m;
  auto begin = s.cbegin();
  while (std::regex_search(begin, s.cend(), m, kLiteral)) {
    out.append(begin, m[0].first);
    out += m[1].str();
    auto v = ParseSpiceNumber(m[2].str() + m[3].str());
    out += v ? FormatNumber(*v) : m[2].str() + m[3].str();
    begin = m[0].second;
  }
  out.append(begin, s.cend());
  return out;
}

namespace {

// 1-based column of `name` as a whole word in `expr`, or 0.
int FindName(const std::string& expr, const std::string& name) {
  auto word = [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; };
  if (name.empty()) return 0;
  for (size_t pos = expr.find(name); pos != std::string::npos; pos = expr.find(name, pos + 1)) {
    bool starts = pos == 0 || !word(expr[pos - 1]);
    bool ends = pos + name.size() == expr.size() || !word(expr[pos + name.size()]);
    if (starts && ends) return static_cast<int>(pos) + 1;
  }
  return 0;
}

// One parser per thread, built once: building a mu::Parser (its built-in
// functions and operators) cost more than parsing and evaluating a typical
// .param expression (measured with a profile of `zvsmap run`, 3 December
// 2026). EvaluateExpression clears its variables before each use.
mu::Parser& ThreadParser() {
  thread_local mu::Parser parser = [] {
    mu::Parser p;
    // muParser 2.3.3 (Debian 12) defines _pi as 3.141592653589 only.
    p.DefineConst("_pi", 3.14159265358979323846);
    return p;
  }();
  return parser;
}

}  // namespace

bool EvaluateExpression(const std::string& expr, const Variables& vars, double* value,
                        std::string* error_message, int* error_column) {
  *error_column = 0;
  std::string normalized = NormalizeSpiceExpression(expr);
  try {
    mu::Parser& parser = ThreadParser();
    parser.ClearVar();      // the previous call's variables pointed into its own copy
    Variables copy = vars;  // muParser binds variables by address
    for (auto& kv : copy) parser.DefineVar(kv.first, &kv.second);
    parser.SetExpr(normalized);
    double v = parser.Eval();
    if (!std::isfinite(v)) {
      *error_message = "expression does not give a finite number (division by zero?)";
      return false;
    }
    *value = v;
    return true;
  } catch (const mu::ParserError& e) {
    int pos = e.GetPos();
    // Map a position in the normalized text back to the original only when
    // normalization changed nothing; otherwise report no column.
    if (pos >= 0 && normalized == expr) *error_column = pos + 1;
    if (e.GetCode() == mu::ecUNASSIGNABLE_TOKEN) {
      // muParser's text ("Unexpected token ... at position N.") counts from 0
      // and says nothing about why; the usual cause is a name with no value.
      std::string name = e.GetToken();
      *error_message = "unknown name '" + name + "'";
      if (*error_column == 0) *error_column = FindName(expr, name);
    } else {
      // Drop muParser's own 0-based " at position N"; the column says where.
      static const std::regex kPosition(R"(\s*at position \d+\.?$)");
      *error_message = std::regex_replace(e.GetMsg(), kPosition, "");
    }
    // muParser puts "unexpected end" one past the end; keep the caret on the line.
    int last = static_cast<int>(expr.size()) + 1;
    if (*error_column > last) *error_column = last;
    return false;
  }
}

}  // namespace zvsmap
