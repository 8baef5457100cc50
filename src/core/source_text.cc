#include "core/source_text.h"

#include <algorithm>
#include <cctype>
#include <fstream>
#include <sstream>

#include "core/text.h"

namespace zvsmap {

SourceText::SourceText(const std::string& path) : path_(path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream buffer;
  if (in) buffer << in.rdbuf();
  *this = SourceText(path, buffer.str());
}

SourceText::SourceText(const std::string& path, const std::string& text)
    : path_(path), text_(text) {
  if (text_.empty()) return;
  starts_.push_back(0);
  for (size_t i = 0; i + 1 < text_.size(); ++i) {
    if (text_[i] == '\n') starts_.push_back(i + 1);
  }
}

std::string SourceText::LineText(int line) const {
  if (line < 1 || static_cast<size_t>(line) > starts_.size()) return "";
  size_t b = starts_[line - 1];
  size_t e = text_.find('\n', b);
  std::string out = text_.substr(b, e == std::string::npos ? std::string::npos : e - b);
  if (!out.empty() && out.back() == '\r') out.pop_back();
  return out;
}

Diagnostic SourceText::At(int line, int column, std::string message) const {
  Diagnostic d({path_, line, column}, std::move(message));
  std::string text = LineText(line);
  if (text.empty()) {
    d.where.column = 0;
    return d;
  }
  size_t indent = std::min(text.find_first_not_of(" \t"), text.size());
  d.source_line = text.substr(indent);
  d.where.column = column > static_cast<int>(indent) ? column - static_cast<int>(indent) : 0;
  return d;
}

SourceLocation SourceText::FindAttribute(const SourceLocation& element,
                                         const std::string& attribute) const {
  if (element.line < 1 || static_cast<size_t>(element.line) > starts_.size()) return element;
  size_t start = starts_[element.line - 1] + static_cast<size_t>(std::max(element.column - 1, 0));
  char quote = 0;
  for (size_t i = start; i < text_.size(); ++i) {
    char c = text_[i];
    if (quote) {
      if (c == quote) quote = 0;
      continue;
    }
    if (c == '"' || c == '\'') quote = c;
    if (c == '>') break;
    if (i > start && std::isspace(static_cast<unsigned char>(text_[i - 1])) &&
        text_.compare(i, attribute.size(), attribute) == 0) {
      size_t j = text_.find_first_not_of(" \t\r\n", i + attribute.size());
      if (j == std::string::npos || text_[j] != '=') continue;
      auto it = std::upper_bound(starts_.begin(), starts_.end(), i);
      int line = static_cast<int>(it - starts_.begin());
      return {path_, line, static_cast<int>(i - starts_[line - 1]) + 1};
    }
  }
  return element;
}

int SourceText::FindWord(int line, const std::string& word, int from) const {
  std::string text = Lower(LineText(line));
  std::string key = Lower(word);
  if (key.empty()) return 0;
  auto is_word = [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; };
  for (size_t pos = text.find(key, static_cast<size_t>(std::max(from - 1, 0)));
       pos != std::string::npos; pos = text.find(key, pos + 1)) {
    bool starts = pos == 0 || !is_word(text[pos - 1]);
    bool ends = pos + key.size() >= text.size() || !is_word(text[pos + key.size()]);
    if (starts && ends) return static_cast<int>(pos) + 1;
  }
  return 0;
}

int SourceText::FindText(int line, const std::string& text) const {
  if (text.empty()) return 0;
  size_t pos = Lower(LineText(line)).find(Lower(text));
  return pos == std::string::npos ? 0 : static_cast<int>(pos) + 1;
}

}  // namespace zvsmap
