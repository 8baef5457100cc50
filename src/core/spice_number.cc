#include "core/spice_number.h"

#include <cctype>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "core/text.h"

namespace zvsmap {

std::optional<double> ParseSpiceNumber(const std::string& raw) {
  // Trim surrounding blanks.
  size_t b = raw.find_first_not_of(" \t\r\n");
  if (b == std::string::npos) return std::nullopt;
  size_t e = raw.find_last_not_of(" \t\r\n");
  std::string text = raw.substr(b, e - b + 1);

  const char* start = text.c_str();
  char* end = nullptr;
  double value = std::strtod(start, &end);
  if (end == start) return std::nullopt;
  std::string rest = Lower(std::string(end));
  // strtod accepts "inf"/"nan" and hex; refuse them.
  std::string head = Lower(std::string(start, static_cast<const char*>(end)));
  if (head.find_first_of("xinp") != std::string::npos) return std::nullopt;

  // "1e" or "2e+": strtod stopped before an incomplete exponent; that is a
  // typo, not a unit. "mil" (SPICE's 25.4u) is refused rather than read as milli.
  if (!rest.empty() && rest[0] == 'e') return std::nullopt;
  if (rest.compare(0, 3, "mil") == 0) return std::nullopt;

  int exponent = 0;
  size_t used = 0;
  if (rest.compare(0, 3, "meg") == 0) {
    exponent = 6;
    used = 3;
  } else if (!rest.empty()) {
    switch (rest[0]) {
      case 'f':
        exponent = -15;
        used = 1;
        break;
      case 'p':
        exponent = -12;
        used = 1;
        break;
      case 'n':
        exponent = -9;
        used = 1;
        break;
      case 'u':
        exponent = -6;
        used = 1;
        break;
      case 'm':
        exponent = -3;
        used = 1;
        break;
      case 'k':
        exponent = 3;
        used = 1;
        break;
      case 'g':
        exponent = 9;
        used = 1;
        break;
      case 't':
        exponent = 12;
        used = 1;
        break;
      default:
        break;
    }
  }
  // What follows the suffix may only be a unit annotation made of letters.
  for (size_t i = used; i < rest.size(); ++i) {
    if (!std::isalpha(static_cast<unsigned char>(rest[i]))) return std::nullopt;
  }
  if (exponent != 0) {
    // Read "0.47u" as the decimal 0.47e-6 (correctly rounded) rather than
    // 0.47 * 1e-6, which is one bit off and then differs from "470n".
    if (head.find('e') == std::string::npos) {
      std::string exact = head + "e" + std::to_string(exponent);
      value = std::strtod(exact.c_str(), nullptr);
    } else {
      value *= std::pow(10.0, exponent);
    }
  }
  if (!std::isfinite(value)) return std::nullopt;
  return value;
}

namespace {

// The unit symbols a number may carry after its scale factor (compared
// case-insensitively): the ones a power stage's parameters use.
bool IsUnitSymbol(const std::string& lower) {
  static const char* const kUnits[] = {"v", "a", "h", "f", "hz", "s", "ohm", "w", "j"};
  for (const char* u : kUnits) {
    if (lower == u) return true;
  }
  return false;
}

NumberSpelling Refuse(std::string message) {
  NumberSpelling s;
  s.kind = NumberSpelling::Kind::kRefused;
  s.message = std::move(message);
  return s;
}

}  // namespace

NumberSpelling JudgeSpiceSpelling(const std::string& raw) {
  std::string text = Trim(raw);
  const char* start = text.c_str();
  char* end = nullptr;
  std::strtod(start, &end);
  if (end == start) return {};
  std::string head(start, static_cast<const char*>(end));
  std::string rest(end);
  std::string lower = Lower(rest);
  // Not a number ParseSpiceNumber would take: it says so itself.
  if (Lower(head).find_first_of("xinp") != std::string::npos) return {};
  if (rest.empty() || lower[0] == 'e') return {};
  for (char c : rest) {
    if (!std::isalpha(static_cast<unsigned char>(c))) return {};
  }
  if (!ParseSpiceNumber(head)) return {};
  const std::string quoted = "'" + text + "'";
  if (lower.compare(0, 3, "mil") == 0) {
    double mils = std::strtod(head.c_str(), nullptr);
    return Refuse(quoted + " is " + head + " mil (" + FormatEngineering(mils * 25.4e-6) +
                  ") in ngspice's device lines but " + head +
                  " milli in its .param expressions; write '" + FormatEngineering(mils * 25.4e-6) +
                  "'");
  }
  std::optional<double> value = ParseSpiceNumber(text);
  if (!value) return {};
  const std::string reading = FormatNumber(*value);
  size_t scale = lower.compare(0, 3, "meg") == 0                                ? 3
                 : std::string("tgkmunpfa").find(lower[0]) != std::string::npos ? 1
                                                                                : 0;
  if (scale == 1 && rest[0] == 'M') {
    return Refuse(quoted + " is " + head + " milli (" + reading +
                  ") in SPICE, which reads 'M' as milli; write '" + head + "meg' for mega or '" +
                  head + "m' for milli");
  }
  if (scale == 1 && lower[0] == 'a') {
    double atto = std::strtod((head + "e-18").c_str(), nullptr);
    return Refuse(quoted + " is " + head + " atto (" + FormatNumber(atto) +
                  ") in SPICE, which reads '" + rest.substr(0, 1) + "' as atto; write '" + head +
                  "' for " + head + " amperes, or '" + FormatNumber(atto) + "' for atto");
  }
  if (scale == 1 && rest[0] == 'F') {
    return Refuse(quoted + " is " + head + " femto (" + reading +
                  ") in SPICE, which reads 'F' as femto; write '" + head + "' for " + head +
                  " farad, or '" + head + "f' for femto");
  }
  std::string number = head + rest.substr(0, scale);
  std::string unit = rest.substr(scale);
  if (unit.empty()) return {};
  if (!IsUnitSymbol(Lower(unit))) {
    return Refuse("SPICE ignores the letters '" + unit + "' in " + quoted + " and reads " +
                  reading + "; write '" + number +
                  "' (after a number and its scale factor zvsmap takes only the unit symbols V, "
                  "A, H, F, Hz, s, Ohm, W, J)");
  }
  std::string as = scale > 0 ? number + " (" + reading + ")" : number;
  return {NumberSpelling::Kind::kUnitNote,
          quoted + " is read as " + as + ": SPICE ignores the unit letters '" + unit +
              "', and zvsmap does not check them against the parameter",
          number};
}

std::string FormatNumber(double value) {
  // The shortest of 12, 15 and 17 significant digits that reads back exactly,
  // so rendered netlists keep full precision (a period that is not a round
  // number must land exactly on the command edges) and stay readable.
  char buf[64];
  for (int digits : {12, 15, 17}) {
    std::snprintf(buf, sizeof buf, "%.*g", digits, value);
    if (std::strtod(buf, nullptr) == value) break;
  }
  return buf;
}

std::string FormatEngineering(double value, int digits) {
  if (value == 0 || !std::isfinite(value)) return FormatNumber(value);
  static const struct {
    double scale;
    const char* suffix;
  } kSteps[] = {{1e12, "t"}, {1e9, "g"},  {1e6, "meg"}, {1e3, "k"},   {1, ""},
                {1e-3, "m"}, {1e-6, "u"}, {1e-9, "n"},  {1e-12, "p"}, {1e-15, "f"}};
  double mag = std::fabs(value);
  for (const auto& s : kSteps) {
    if (mag >= s.scale * 0.9999999) {
      char buf[64];
      std::snprintf(buf, sizeof buf, "%.*g%s", digits, value / s.scale, s.suffix);
      return buf;
    }
  }
  return FormatNumber(value);
}

}  // namespace zvsmap
