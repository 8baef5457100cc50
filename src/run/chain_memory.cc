#include "run/chain_memory.h"

#include <cstddef>
#include <utility>

namespace zvsmap {

ChainMemory::ChainMemory(std::vector<ChainLink> links)
    : links_(std::move(links)), settled_(links_.size()) {}

void ChainMemory::Remember(const PointResult& result) {
  if (result.index >= settled_.size()) return;
  settled_[result.index].reset();
  if (result.status != PointStatus::kOk || result.settle.initial_state.empty()) return;
  WarmStart w;
  for (const SettledState& s : result.settle.initial_state) w.unknowns.push_back(s.value);
  const size_t m = w.unknowns.size();
  const std::vector<double>& flat = result.settle.jacobian;
  if (flat.size() == m * m) {
    for (size_t i = 0; i < m; ++i) {
      w.jacobian.emplace_back(flat.begin() + static_cast<std::ptrdiff_t>(i * m),
                              flat.begin() + static_cast<std::ptrdiff_t>((i + 1) * m));
    }
  }
  settled_[result.index] = std::move(w);
}

std::optional<WarmStart> ChainMemory::For(size_t index) const {
  if (index >= links_.size()) return std::nullopt;
  const ChainLink& link = links_[index];
  if (link.previous == ChainLink::kNone || !settled_[link.previous]) return std::nullopt;
  WarmStart w = *settled_[link.previous];
  if (link.before_previous != ChainLink::kNone && settled_[link.before_previous] &&
      settled_[link.before_previous]->unknowns.size() == w.unknowns.size()) {
    const std::vector<double>& older = settled_[link.before_previous]->unknowns;
    for (size_t i = 0; i < w.unknowns.size(); ++i) {
      w.unknowns[i] += link.step_ratio * (w.unknowns[i] - older[i]);
    }
  }
  return w;
}

}  // namespace zvsmap
