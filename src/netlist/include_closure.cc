#include "netlist/include_closure.h"

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "core/text.h"
#include "netlist/deck_rules.h"

namespace zvsmap {

namespace {

namespace fs = std::filesystem;

constexpr int kMaxDepth = 32;

struct Card {
  int line = 0;
  std::string text;
  CardClass cls;
};

Diagnostic At(const std::string& path, int line, int column, const std::string& message,
              const std::string& source_line) {
  return Diagnostic{{path, line, column}, message, source_line};
}

bool CiPrefix(const std::string& s, const char* prefix) {
  size_t n = std::char_traits<char>::length(prefix);
  return s.size() >= n && Lower(s.substr(0, n)) == prefix;
}

// The title is not a card, but ngspice's reader still looks at it.
bool CheckTitle(const std::string& title, const std::string& path, Diagnostic* error) {
  std::string t = Trim(title);
  for (const char* p : {".", "+", "@", "*#", "*ng_script"}) {
    if (CiPrefix(t, p)) {
      *error = At(path, 1, 1,
                  std::string("the title line starts with '") + p +
                      "', which ngspice may read as a card, a control section or a script; the "
                      "first line of a template is its title: write a plain title there",
                  title);
      return false;
    }
  }
  size_t bad = FindForbiddenChar(title, /*allow_tab=*/true);
  if (bad != std::string::npos && static_cast<unsigned char>(title[bad]) < 0x80) {
    *error = At(path, 1, static_cast<int>(bad + 1),
                "the title holds " + DescribeChar(static_cast<unsigned char>(title[bad])), title);
    return false;
  }
  return true;
}

// Physical lines -> checked logical cards (continuations joined to the card
// before them, skipping comments, as ngspice does).
bool SplitCards(const std::string& text, const std::string& path, bool has_title,
                std::vector<Card>* cards, Diagnostic* error) {
  std::istringstream in(text);
  std::string raw;
  int number = 0;
  while (std::getline(in, raw)) {
    ++number;
    if (!raw.empty() && raw.back() == '\r') raw.pop_back();
    if (number == 1 && has_title) {
      if (!CheckTitle(raw, path, error)) return false;
      continue;
    }
    Card card;
    card.line = number;
    card.text = raw;
    std::string reason;
    int column = 1;
    if (!ClassifyCard(raw, &card.cls, &reason, &column)) {
      *error = At(path, number, column, reason, raw);
      return false;
    }
    if (card.cls.kind != CardKind::kContinuation) {
      cards->push_back(std::move(card));
      continue;
    }
    Card* target = nullptr;
    for (auto it = cards->rbegin(); it != cards->rend() && !target; ++it) {
      if (it->cls.kind != CardKind::kComment && it->cls.kind != CardKind::kBlank) target = &*it;
    }
    if (!target) {
      *error = At(path, number, column,
                  "a continuation line ('+') with no card before it in this file", raw);
      return false;
    }
    target->text += " " + Trim(Trim(raw).substr(1));
    // The joined card is checked again as a whole (e.g. `.options` + `+ interp`).
    if (!ClassifyCard(target->text, &target->cls, &reason, &column)) {
      *error = At(
          path, number, 1,
          reason + " (in the card continued here from line " + std::to_string(target->line) + ")",
          raw);
      return false;
    }
  }
  return true;
}

// The words after a card's keyword; quoted words ("a b" or 'a b') stay whole.
// `columns` receives each word's 1-based column.
std::vector<std::string> Arguments(const std::string& card, std::vector<int>* columns) {
  std::vector<std::string> out;
  size_t i = card.find_first_not_of(" \t");
  while (i < card.size() && !std::isspace(static_cast<unsigned char>(card[i]))) ++i;
  while (true) {
    while (i < card.size() && std::isspace(static_cast<unsigned char>(card[i]))) ++i;
    if (i >= card.size()) break;
    columns->push_back(static_cast<int>(i + 1));
    if (card[i] == '"' || card[i] == '\'') {
      size_t end = card.find(card[i], i + 1);
      if (end == std::string::npos) end = card.size();
      out.push_back(card.substr(i + 1, end - i - 1));
      i = end + 1;
    } else {
      size_t start = i;
      while (i < card.size() && !std::isspace(static_cast<unsigned char>(card[i]))) ++i;
      out.push_back(card.substr(start, i - start));
    }
  }
  return out;
}

class Expander {
 public:
  bool File(const std::string& path, const SourceLocation& named_at, const std::string& named_line,
            std::vector<DeckLine>* out, Diagnostic* error) {
    std::vector<Card> cards;
    if (!Load(path, path, named_at, named_line, &cards, error)) return false;
    bool ok = Emit(path, cards, 0, cards.size(), false, out, error);
    stack_.pop_back();
    return ok;
  }

  bool Text(const std::string& text, const std::string& path, bool has_title,
            std::vector<DeckLine>* out, Diagnostic* error) {
    std::vector<Card> cards;
    if (!SplitCards(text, path, has_title, &cards, error)) return false;
    stack_.push_back(Key(path));
    bool ok = Emit(path, cards, 0, cards.size(), false, out, error);
    stack_.pop_back();
    return ok;
  }

  bool Section(const std::string& path, const std::string& section, const SourceLocation& named_at,
               const std::string& named_line, std::vector<DeckLine>* out, Diagnostic* error) {
    std::vector<Card> cards;
    if (!Load(path, path + "#" + Lower(section), named_at, named_line, &cards, error)) {
      return false;
    }
    bool ok = EmitSection(path, section, cards, named_at, named_line, out, error);
    stack_.pop_back();
    return ok;
  }

 private:
  static std::string Key(const std::string& path) {
    std::error_code ec;
    fs::path canonical = fs::weakly_canonical(path, ec);
    return ec ? fs::path(path).lexically_normal().string() : canonical.string();
  }

  // Reads and splits `path`; pushes `key` on the include stack on success.
  bool Load(const std::string& path, const std::string& key_text, const SourceLocation& named_at,
            const std::string& named_line, std::vector<Card>* cards, Diagnostic* error) {
    std::string key = Key(path) + key_text.substr(path.size());
    for (size_t i = 0; i < stack_.size(); ++i) {
      if (stack_[i] != key) continue;
      *error =
          Diagnostic{named_at, "include cycle: '" + path + "' is already being read", named_line};
      return false;
    }
    if (static_cast<int>(stack_.size()) >= kMaxDepth) {
      *error = Diagnostic{named_at,
                          "includes nested deeper than " + std::to_string(kMaxDepth) + " files",
                          named_line};
      return false;
    }
    std::string text, message;
    if (!CheckFileName(path, &message) || !ReadDeckFile(path, &text, &message)) {
      *error = Diagnostic{named_at, message, named_line};
      return false;
    }
    if (!SplitCards(text, path, false, cards, error)) return false;
    stack_.push_back(key);
    return true;
  }

  // The file a card names, relative to the naming file's folder.
  static std::string Resolve(const std::string& naming_file, const std::string& named) {
    fs::path p(named);
    if (p.is_absolute()) return p.lexically_normal().string();
    return (fs::path(naming_file).parent_path() / p).lexically_normal().string();
  }

  bool EmitSection(const std::string& path, const std::string& section,
                   const std::vector<Card>& cards, const SourceLocation& named_at,
                   const std::string& named_line, std::vector<DeckLine>* out, Diagnostic* error) {
    std::vector<std::string> names;
    for (size_t i = 0; i < cards.size(); ++i) {
      if (cards[i].cls.kind != CardKind::kLibrary) continue;
      std::vector<int> columns;
      std::vector<std::string> args = Arguments(cards[i].text, &columns);
      if (args.size() != 1) continue;
      names.push_back(args[0]);
      if (Lower(args[0]) != Lower(section)) continue;
      for (size_t j = i + 1; j < cards.size(); ++j) {
        if (cards[j].cls.kind == CardKind::kEndLibrary) {
          return Emit(path, cards, i + 1, j, true, out, error);
        }
      }
      *error = At(path, cards[i].line, 1, "library section '" + args[0] + "' has no '.endl'",
                  cards[i].text);
      return false;
    }
    std::string hint = ClosestName(section, names);
    std::string list;
    for (const auto& n : names) list += (list.empty() ? "" : ", ") + n;
    *error = Diagnostic{named_at,
                        "'" + path + "' has no library section '" + section + "' (" +
                            (names.empty() ? std::string("it defines none") : "it has: " + list) +
                            (hint.empty() ? "" : "; did you mean '" + hint + "'?") + ")",
                        named_line};
    return false;
  }

  bool Emit(const std::string& path, const std::vector<Card>& cards, size_t begin, size_t end,
            bool in_section, std::vector<DeckLine>* out, Diagnostic* error) {
    for (size_t i = begin; i < end; ++i) {
      const Card& c = cards[i];
      SourceLocation where{path, c.line, 0};
      std::vector<int> columns;
      switch (c.cls.kind) {
        case CardKind::kBlank:
        case CardKind::kDropped:
        case CardKind::kContinuation:
          break;
        case CardKind::kComment:
        case CardKind::kElement:
        case CardKind::kKept:
          out->push_back({c.text, where});
          break;
        case CardKind::kEnd:
          return true;  // ngspice reads nothing after .end
        case CardKind::kEndLibrary:
          *error = At(path, c.line, 1, "'.endl' closes no '.lib' section", c.text);
          return false;
        case CardKind::kInclude: {
          std::vector<std::string> args = Arguments(c.text, &columns);
          if (args.empty() || args[0].empty()) {
            *error = At(path, c.line, 1, "'" + c.cls.keyword + "' names no file", c.text);
            return false;
          }
          where.column = columns[0];
          if (!File(Resolve(path, args[0]), where, c.text, out, error)) return false;
          break;
        }
        case CardKind::kLibrary: {
          std::vector<std::string> args = Arguments(c.text, &columns);
          if (args.size() == 1 && !in_section) {
            // A section definition: read only when a `.lib FILE SECTION` names it.
            size_t j = i + 1;
            while (j < end && cards[j].cls.kind != CardKind::kEndLibrary) ++j;
            if (j >= end) {
              *error =
                  At(path, c.line, 1, "library section '" + args[0] + "' has no '.endl'", c.text);
              return false;
            }
            i = j;
            break;
          }
          if (args.size() != 2) {
            *error = At(path, c.line, 1,
                        in_section && args.size() == 1
                            ? "a library section cannot define another ('.lib " + args[0] + "')"
                            : "expected '.lib FILE SECTION'",
                        c.text);
            return false;
          }
          where.column = columns[0];
          if (!Section(Resolve(path, args[0]), args[1], where, c.text, out, error)) return false;
          break;
        }
      }
    }
    return true;
  }

  std::vector<std::string> stack_;
};

}  // namespace

bool ReadDeckFile(const std::string& path, std::string* text, std::string* message) {
  std::error_code ec;
  if (!fs::exists(path, ec)) {
    *message = "cannot read '" + path + "': no such file";
    return false;
  }
  if (!fs::is_regular_file(path, ec)) {
    *message = "cannot read '" + path + "': not a regular file";
    return false;
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    *message = "cannot read '" + path + "': " + std::strerror(errno);
    return false;
  }
  std::ostringstream buffer;
  buffer << in.rdbuf();
  *text = buffer.str();
  if (text->find('\0') != std::string::npos) {
    *message = "'" + path + "' is a binary file (it holds NUL bytes), not a SPICE netlist";
    return false;
  }
  return true;
}

bool ExpandNetlistText(const std::string& text, const std::string& path, bool has_title,
                       std::vector<DeckLine>* out, Diagnostic* error) {
  if (text.find('\0') != std::string::npos) {
    *error = At(path, 0, 0,
                "'" + path +
                    "' is a binary file (it holds NUL bytes), not a SPICE "
                    "netlist",
                "");
    return false;
  }
  Expander expander;
  return expander.Text(text, path, has_title, out, error);
}

bool ExpandNetlistFile(const std::string& path, const SourceLocation& named_at,
                       const std::string& named_line, std::vector<DeckLine>* out,
                       Diagnostic* error) {
  Expander expander;
  return expander.File(path, named_at, named_line, out, error);
}

bool ExpandLibrarySection(const std::string& path, const std::string& section,
                          const SourceLocation& named_at, const std::string& named_line,
                          std::vector<DeckLine>* out, Diagnostic* error) {
  Expander expander;
  return expander.Section(path, section, named_at, named_line, out, error);
}

}  // namespace zvsmap
