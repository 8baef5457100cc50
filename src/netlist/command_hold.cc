#include "netlist/command_hold.h"

#include <cstdio>
#include <sstream>
#include <vector>

#include "core/text.h"

namespace zvsmap {

namespace {

// The free-running command's node: a name of zvsmap's own.
constexpr const char* kFreeNode = "zvsmap_probe_free";

std::vector<std::string> Words(const std::string& text) {
  std::istringstream in(text);
  std::vector<std::string> words;
  for (std::string w; in >> w;) words.push_back(w);
  return words;
}

bool IsGround(const std::string& node) { return node == "0" || Lower(node) == "gnd"; }

}  // namespace

bool HoldCommandOff(Deck* deck, const std::string& command_node, double t_from_s,
                    std::string* why) {
  const std::string node = Lower(command_node);
  int depth = 0;
  size_t found = deck->lines.size();
  int count = 0;
  for (size_t i = 1; i < deck->lines.size(); ++i) {  // line 0 is the title
    const std::string& text = deck->lines[i].text;
    if (IsCommentOrBlank(text)) continue;
    std::vector<std::string> w = Words(text);
    std::string first = Lower(w[0]);
    if (first == ".subckt") ++depth;
    if (first == ".ends" && depth > 0) --depth;
    if (depth > 0 || w.size() < 3) continue;
    char kind = first[0];
    if ((kind == 'v' || kind == 'b' || kind == 'e') && Lower(w[1]) == node) {
      found = i;
      ++count;
    }
  }
  if (count != 1) {
    *why = count == 0 ? "no top-level V, B or E source drives command node '" + command_node + "'"
                      : "more than one source drives command node '" + command_node + "'";
    return false;
  }
  DeckLine& card = deck->lines[found];
  std::vector<std::string> w = Words(card.text);
  const std::string reference = w[2];
  // Replace the first node (the second word) in place, keeping the rest verbatim.
  size_t name_end = card.text.find_first_of(" \t", card.text.find_first_not_of(" \t"));
  size_t node_start = card.text.find_first_not_of(" \t", name_end);
  card.text.replace(node_start, w[1].size(), kFreeNode);
  char step[64];
  std::snprintf(step, sizeof step, "%.17g", t_from_s);
  std::string free_v = IsGround(reference) ? std::string("v(") + kFreeNode + ")"
                                           : std::string("v(") + kFreeNode + ", " + reference + ")";
  DeckLine hold{"bzvsmap_probe_hold " + command_node + " " + reference + " v = " + free_v +
                    " * (1 - u(time - " + step + "))",
                SourceLocation{}};
  deck->lines.insert(deck->lines.begin() + static_cast<long>(found) + 1, hold);
  return true;
}

}  // namespace zvsmap
