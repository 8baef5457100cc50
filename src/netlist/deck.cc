#include "netlist/deck.h"

#include <sstream>

namespace zvsmap {

void Deck::AddGenerated(const std::string& text) { AddText(text, SourceLocation{}); }

void Deck::AddText(const std::string& text, const SourceLocation& origin) {
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    lines.push_back({line, origin});
  }
}

std::string Deck::Text() const {
  std::string out;
  for (const auto& l : lines) out += l.text + "\n";
  return out;
}

std::string Deck::Canonical() const {
  std::string out;
  for (size_t i = 1; i < lines.size(); ++i) {  // line 1 is the title
    const DeckLine& l = lines[i];
    if (IsCommentOrBlank(l.text)) continue;
    size_t end = l.text.find_last_not_of(" \t");
    out += l.text.substr(0, end + 1) + "\n";
  }
  return out;
}

const SourceLocation* Deck::Origin(int number) const {
  if (number < 1 || number > static_cast<int>(lines.size())) return nullptr;
  const SourceLocation& o = lines[static_cast<size_t>(number - 1)].origin;
  return o.file.empty() ? nullptr : &o;
}

bool IsCommentOrBlank(const std::string& line) {
  size_t b = line.find_first_not_of(" \t\r");
  return b == std::string::npos || line[b] == '*';
}

}  // namespace zvsmap
