#include "netlist/deck_rules.h"

#include <algorithm>
#include <cctype>
#include <cstdio>
#include <iterator>
#include <vector>

#include "core/diagnostic.h"
#include "core/text.h"

namespace zvsmap {

namespace {

// ngspice's ciprefix(): case-insensitive prefix.
bool CiPrefix(const std::string& s, const char* prefix) {
  size_t n = std::char_traits<char>::length(prefix);
  return s.size() >= n && Lower(s.substr(0, n)) == prefix;
}

// Control cards passed to ngspice as they are.
const char* const kKeptCards[] = {".param",  ".subckt", ".ends",    ".model",  ".ic",  ".nodeset",
                                  ".global", ".func",   ".options", ".option", ".opt", ".temp",
                                  ".if",     ".elseif", ".else",    ".endif"};
// Analysis and output cards: zvsmap sets its own analysis and saves its own
// vectors, so these are left out of the deck.
const char* const kDroppedCards[] = {".tran",  ".op",    ".ac",      ".dc",    ".noise",
                                     ".tf",    ".disto", ".pz",      ".sens",  ".sp",
                                     ".pss",   ".four",  ".save",    ".print", ".plot",
                                     ".probe", ".meas",  ".measure", ".width", ".title"};

const char* const kAcceptedOptions[] = {
    "abstol", "reltol",    "vntol",    "chgtol",    "trtol",    "pivtol",     "pivrel",
    "gmin",   "gminsteps", "srcsteps", "itl1",      "itl2",     "itl3",       "itl4",
    "itl5",   "itl6",      "maxord",   "method",    "temp",     "tnom",       "rshunt",
    "cshunt", "xmu",       "noopiter", "nodamping", "oldlimit", "maxopalter", "maxevtiter",
    "defad",  "defas",     "defl",     "defw",      "scale",    "badmos3",    "trytocompact",
    "klu",    "sparse",    "seed",     "ramptime",  "warn",     "maxwarns",   "noacct",
    "nomod",  "nopage",    "noinit",   "norefvalue"};

struct RefusedOption {
  const char* name;
  const char* reason;
};
const RefusedOption kRefusedOptions[] = {
    {"interp",
     "interpolates the saved data onto the print step, so the waveforms zvsmap measures are "
     "no longer the simulated ones (measured in ngspice 39: a turn-on voltage halved)"},
    {"autostop", "stops the transient before its end time, so the measured periods are missing"},
    {"savecurrents",
     "saves every device current; zvsmap saves the vectors it measures, and each point's memory "
     "would grow many-fold"},
};

std::string Join(const std::vector<std::string>& v) {
  std::string out;
  for (const auto& s : v) out += (out.empty() ? "" : " ") + s;
  return out;
}

bool IsIdentifier(const std::string& s) {
  if (s.empty() || !(std::isalpha(static_cast<unsigned char>(s[0])) || s[0] == '_')) return false;
  for (char c : s) {
    if (!std::isalnum(static_cast<unsigned char>(c)) && c != '_') return false;
  }
  return true;
}

bool ClassifyDotCard(const std::string& t, CardClass* out, std::string* reason) {
  // Prefix rules first, exactly as ngspice matches them.
  if (CiPrefix(t, ".control")) {
    *reason = "'" + t.substr(0, t.find_first_of(" \t")) +
              "' starts a control section (ngspice runs its lines as commands); "
              "a zvsmap deck holds no commands";
    return false;
  }
  if (CiPrefix(t, ".endc")) {
    *reason = "'.endc' ends a control section; a zvsmap deck holds no control sections";
    return false;
  }
  size_t end = 1;
  while (end < t.size() && !std::isspace(static_cast<unsigned char>(t[end]))) ++end;
  std::string word = Lower(t.substr(0, end));
  out->keyword = word;
  if (CiPrefix(t, ".inc")) {
    out->kind = CardKind::kInclude;
    return true;
  }
  if (word == ".endl") {
    out->kind = CardKind::kEndLibrary;
    return true;
  }
  if (CiPrefix(t, ".lib")) {
    out->kind = CardKind::kLibrary;
    return true;
  }
  if (word == ".end") {
    out->kind = CardKind::kEnd;
    return true;
  }
  for (const char* k : kKeptCards) {
    if (word == k) {
      out->kind = CardKind::kKept;
      if (word.compare(0, 4, ".opt") == 0) return CheckOptions(t.substr(end), reason);
      return true;
    }
  }
  for (const char* k : kDroppedCards) {
    if (word == k) {
      out->kind = CardKind::kDropped;
      return true;
    }
  }
  std::vector<std::string> known(std::begin(kKeptCards), std::end(kKeptCards));
  known.insert(known.end(), {".include", ".lib", ".endl", ".end"});
  std::string hint = ClosestName(word, known);
  *reason = "'" + word + "' is not a card zvsmap passes to ngspice" +
            (hint.empty() ? "" : " (did you mean '" + hint + "'?)") + "; allowed: " + Join(known) +
            ", and analysis/output cards, which zvsmap replaces";
  return false;
}

// A parameter whose name ends in "file" (`file=`, `input_file=`, ...): a code
// model or source that ngspice would open a file for by itself.
bool NamesAFile(const std::string& t, std::string* reason, int* column, size_t offset) {
  std::string lower = Lower(t);
  for (size_t at = lower.find("file"); at != std::string::npos; at = lower.find("file", at + 1)) {
    size_t after = at + 4;
    while (after < lower.size() && lower[after] == ' ') ++after;
    if (after >= lower.size() || lower[after] != '=') continue;
    size_t start = at;
    while (start > 0 &&
           (std::isalnum(static_cast<unsigned char>(lower[start - 1])) || lower[start - 1] == '_'))
      --start;
    *column = static_cast<int>(offset + start + 1);
    *reason = "'" + t.substr(start, at + 4 - start) +
              "=' names a file ngspice would open by itself; zvsmap passes on only what it has "
              "read (put the data in the netlist)";
    return true;
  }
  return false;
}

}  // namespace

std::string DescribeChar(unsigned char c) {
  if (c == '\n') return "a line break (LF)";
  if (c == '\r') return "a carriage return (CR)";
  if (c == 0) return "a NUL byte";
  char buf[40];
  std::snprintf(buf, sizeof buf, c >= 0x80 ? "a non-ASCII byte 0x%02x" : "control character 0x%02x",
                c);
  return buf;
}

size_t FindForbiddenChar(const std::string& text, bool allow_tab) {
  for (size_t i = 0; i < text.size(); ++i) {
    unsigned char c = static_cast<unsigned char>(text[i]);
    if (c == '\t' && allow_tab) continue;
    if (c < 0x20 || c >= 0x7f) return i;
  }
  return std::string::npos;
}

bool ClassifyCard(const std::string& card, CardClass* out, std::string* reason, int* column) {
  *out = CardClass{};
  size_t b = card.find_first_not_of(" \t");
  *column = static_cast<int>(b == std::string::npos ? 1 : b + 1);
  if (b == std::string::npos) return true;
  std::string t = card.substr(b);
  // ngspice removes trailing CR itself; any other control character could
  // read differently there than here.
  for (size_t i = 0; i < t.size(); ++i) {
    unsigned char c = static_cast<unsigned char>(t[i]);
    if ((c < 0x20 && c != '\t') || c == 0x7f) {
      *column = static_cast<int>(b + i + 1);
      *reason = "the card holds " + DescribeChar(c) + ", which no SPICE card may contain";
      return false;
    }
  }
  char first = t[0];
  if (first == '*') {
    if (t.size() > 1 && t[1] == '#') {
      *reason =
          "'*#' lines are commands to ngspice (run like a control section); "
          "a zvsmap deck holds no commands";
      return false;
    }
    if (CiPrefix(t, "*ng_script")) {
      *reason =
          "'*ng_script' makes ngspice read the file as a command script; "
          "a zvsmap deck holds no commands";
      return false;
    }
    out->kind = CardKind::kComment;
    return true;
  }
  if (first == '+') {
    out->kind = CardKind::kContinuation;
    return true;
  }
  if (std::isalpha(static_cast<unsigned char>(first))) {
    out->kind = CardKind::kElement;
    return !NamesAFile(t, reason, column, b);
  }
  if (first == '.') return ClassifyDotCard(t, out, reason) && !NamesAFile(t, reason, column, b);
  *reason = std::string(
                "a card starts with a letter (an element), '.' (a control card), '*' (a "
                "comment) or '+' (a continuation), not '") +
            first + "'";
  return false;
}

bool CheckOptions(const std::string& body, std::string* reason) {
  // Tokens split at blanks and '='; a token right after '=' is a value.
  std::vector<std::string> names;
  bool value_next = false;
  std::string cur;
  auto flush = [&] {
    if (!cur.empty() && !value_next) names.push_back(Lower(cur));
    if (!cur.empty()) value_next = false;
    cur.clear();
  };
  for (char c : body) {
    if (c == '=') {
      flush();
      value_next = true;
    } else if (std::isspace(static_cast<unsigned char>(c))) {
      flush();
    } else {
      cur += c;
    }
  }
  flush();
  for (const auto& name : names) {
    for (const auto& r : kRefusedOptions) {
      if (name == r.name) {
        *reason = "option '" + name + "' is refused: it " + r.reason;
        return false;
      }
    }
    bool known = false;
    for (const char* k : kAcceptedOptions) known = known || name == k;
    if (!known) {
      std::vector<std::string> accepted(std::begin(kAcceptedOptions), std::end(kAcceptedOptions));
      std::string hint = ClosestName(name, accepted);
      *reason = "option '" + name + "' is not one zvsmap passes to ngspice" +
                (hint.empty() ? "" : " (did you mean '" + hint + "'?)") +
                "; accepted: " + Join(accepted);
      return false;
    }
  }
  return true;
}

bool IsNameToken(const std::string& text) {
  if (text.empty() || text[0] == '.' || text[0] == '*' || text[0] == '+') return false;
  for (char c : text) {
    if (!std::isalnum(static_cast<unsigned char>(c)) &&
        std::string("_.:#[]-$/").find(c) == std::string::npos)
      return false;
  }
  return true;
}

bool CheckParamListToken(const std::string& text, std::string* reason) {
  size_t bad = FindForbiddenChar(text, /*allow_tab=*/false);
  if (bad != std::string::npos) {
    *reason = "holds " + DescribeChar(static_cast<unsigned char>(text[bad])) + " at character " +
              std::to_string(bad + 1) + "; a parameter list stays on one card";
    return false;
  }
  // Items: name=value, blanks around '=' allowed; values without blanks
  // unless braced or quoted.
  size_t i = 0;
  auto skip = [&] {
    while (i < text.size() && text[i] == ' ') ++i;
  };
  static const std::string kExprChars = "_.+-*/^(),<>=!&|?:% ";
  while (true) {
    skip();
    if (i >= text.size()) return true;
    size_t start = i;
    while (i < text.size() && text[i] != '=' && text[i] != ' ') ++i;
    std::string name = text.substr(start, i - start);
    skip();
    if (!IsIdentifier(name) || i >= text.size() || text[i] != '=') {
      *reason = "expected name=value items, got '" + text.substr(start) + "'";
      return false;
    }
    ++i;
    skip();
    std::string value;
    if (i < text.size() && (text[i] == '{' || text[i] == '\'')) {
      char close = text[i] == '{' ? '}' : '\'';
      size_t end = text.find(close, i + 1);
      if (end == std::string::npos) {
        *reason = "unclosed '" + std::string(1, text[i]) + "' in the value of '" + name + "'";
        return false;
      }
      value = text.substr(i + 1, end - i - 1);
      i = end + 1;
      for (char c : value) {
        if (!std::isalnum(static_cast<unsigned char>(c)) &&
            kExprChars.find(c) == std::string::npos) {
          *reason = "the value of '" + name + "' holds '" + std::string(1, c) +
                    "', which is no part of an expression";
          return false;
        }
      }
    } else {
      size_t vstart = i;
      while (i < text.size() && text[i] != ' ') ++i;
      value = text.substr(vstart, i - vstart);
      for (char c : value) {
        if (!std::isalnum(static_cast<unsigned char>(c)) && c != '.' && c != '+' && c != '-' &&
            c != '_') {
          *reason = "the value of '" + name + "' holds '" + std::string(1, c) +
                    "'; write a number, a name or a braced expression {...}";
          return false;
        }
      }
    }
    if (Trim(value).empty()) {
      *reason = "empty value for '" + name + "'";
      return false;
    }
  }
}

bool CheckFileName(const std::string& path, std::string* reason) {
  for (unsigned char c : path) {
    if (c < 0x20 || c == 0x7f) {
      *reason = "the file name '" + Printable(path) + "' holds " + DescribeChar(c) +
                "; zvsmap reads no file whose name holds a control character";
      return false;
    }
  }
  return true;
}

}  // namespace zvsmap
