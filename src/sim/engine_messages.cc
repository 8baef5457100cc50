#include "sim/engine_messages.h"

#include <cctype>
#include <sstream>

#include "core/text.h"

namespace zvsmap {

namespace {

std::string Where(const SourceLocation& o) { return o.file + ":" + std::to_string(o.line); }

// The phrases after which ngspice 39 writes a deck line number.
const char* const kLinePhrases[] = {"line no. ", "on line "};

// One text line: numbered references mapped in place.
std::string MapNumbered(const std::string& line, const Deck& deck, bool* mapped) {
  std::string lower = Lower(line);
  std::string out;
  size_t pos = 0;
  while (pos < line.size()) {
    size_t best = std::string::npos, len = 0;
    for (const char* p : kLinePhrases) {
      size_t at = lower.find(p, pos);
      if (at < best) {
        best = at;
        len = std::char_traits<char>::length(p);
      }
    }
    if (best == std::string::npos) break;
    size_t digits = best + len, end = digits;
    while (end < line.size() && std::isdigit(static_cast<unsigned char>(line[end]))) ++end;
    out += line.substr(pos, end - pos);
    pos = end;
    if (end == digits || end - digits > 9) continue;
    const SourceLocation* origin = deck.Origin(std::stoi(line.substr(digits, end - digits)));
    if (origin) {
      out += " [" + Where(*origin) + "]";
      *mapped = true;
    }
  }
  return out + line.substr(pos);
}

// The user card a message quotes (ngspice lower-cases cards), or nullptr.
const SourceLocation* QuotedCard(const std::string& message, const Deck& deck) {
  std::string lower = Lower(message);
  const SourceLocation* best = nullptr;
  size_t best_size = 0;
  for (size_t i = 1; i < deck.lines.size(); ++i) {  // line 1 is the title
    const DeckLine& l = deck.lines[i];
    if (l.origin.file.empty() || IsCommentOrBlank(l.text)) continue;
    std::string card = Lower(Trim(l.text));
    if (card.size() < 6 || card.size() <= best_size) continue;
    if (lower.find(card) != std::string::npos) {
      best = &l.origin;
      best_size = card.size();
    }
  }
  return best;
}

bool IsNameChar(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; }

// "Undefined parameter [name]" inside a subcircuit comes with "line no. 0":
// the first user card that uses the name.
const SourceLocation* CardUsingParameter(const std::string& message, const Deck& deck) {
  std::string lower = Lower(message);
  size_t at = lower.find("undefined parameter [");
  if (at == std::string::npos) return nullptr;
  size_t begin = at + std::char_traits<char>::length("undefined parameter [");
  size_t end = lower.find(']', begin);
  if (end == std::string::npos || end == begin) return nullptr;
  std::string name = lower.substr(begin, end - begin);
  for (size_t i = 1; i < deck.lines.size(); ++i) {
    const DeckLine& l = deck.lines[i];
    if (l.origin.file.empty() || IsCommentOrBlank(l.text)) continue;
    std::string card = Lower(l.text);
    for (size_t p = card.find(name); p != std::string::npos; p = card.find(name, p + 1)) {
      bool starts = p == 0 || !IsNameChar(card[p - 1]);
      bool ends = p + name.size() >= card.size() || !IsNameChar(card[p + name.size()]);
      if (starts && ends) return &l.origin;
    }
  }
  return nullptr;
}

}  // namespace

std::string MapEngineLines(const std::string& message, const Deck& deck) {
  std::istringstream in(message);
  std::string out, line;
  bool mapped = false, first = true;
  while (std::getline(in, line)) {
    out += (first ? "" : "\n") + MapNumbered(line, deck, &mapped);
    first = false;
  }
  if (!message.empty() && message.back() == '\n') out += "\n";
  if (!mapped) {
    const SourceLocation* origin = QuotedCard(message, deck);
    if (!origin) origin = CardUsingParameter(message, deck);
    if (origin) {
      bool newline = !out.empty() && out.back() == '\n';
      if (newline) out.pop_back();
      out += " [" + Where(*origin) + "]";
      if (newline) out += "\n";
    }
  }
  return out;
}

}  // namespace zvsmap
