#include "sweep/chain_layout.h"

#include <algorithm>
#include <map>
#include <utility>

namespace zvsmap {

namespace {

// The chain a nominal point belongs to: its grid digits except the last,
// and its refinement round. Empty grids have no chain.
using ChainKey = std::pair<std::vector<int>, int>;

bool Chained(const Point& p) { return !p.variant && !p.grid.empty(); }

ChainKey KeyOf(const Point& p) {
  return {std::vector<int>(p.grid.begin(), p.grid.end() - 1), p.refine_round};
}

// The chains of points[begin..]: the nominal points of each key ordered by
// their innermost digit (then index, for points of a refined round that share
// a digit), split into ceil(n / kMaxChainPoints) near-equal consecutive parts.
std::vector<std::vector<size_t>> Chains(const std::vector<Point>& points, size_t begin) {
  std::map<ChainKey, std::map<std::pair<int, size_t>, size_t>> keyed;
  for (size_t k = begin; k < points.size(); ++k) {
    const Point& p = points[k];
    if (Chained(p)) keyed[KeyOf(p)][{p.grid.back(), k}] = k;
  }
  std::vector<std::vector<size_t>> chains;
  for (const auto& [key, members] : keyed) {
    const size_t n = members.size();
    const size_t parts = (n + kMaxChainPoints - 1) / kMaxChainPoints;
    size_t at = 0, part = 0;
    std::vector<size_t> chain;
    for (const auto& [order, k] : members) {
      chain.push_back(k);
      // Part j ends after floor((j + 1) n / parts) members.
      if (++at == (part + 1) * n / parts) {
        ++part;
        chains.push_back(std::move(chain));
        chain.clear();
      }
    }
  }
  return chains;
}

}  // namespace

bool InnermostIsDevice(const SweepSpec& spec) {
  if (spec.groups.empty()) return false;
  for (const AxisSpec& a : spec.groups.back().axes)
    if (!a.device_roles.empty()) return true;
  return false;
}

std::vector<ChainLink> ChainLinks(const std::vector<Point>& points, size_t begin,
                                  bool innermost_is_device) {
  std::vector<ChainLink> links(points.size());
  for (const auto& chain : Chains(points, begin)) {
    size_t prev = ChainLink::kNone, before = ChainLink::kNone;
    for (size_t k : chain) {
      // Increasing index and digit both: a predecessor with a higher index
      // (a grid not in nested-loop order) would break the run order.
      if (prev != ChainLink::kNone && prev < k) {
        links[k].previous = prev;
        if (!innermost_is_device && before != ChainLink::kNone && before < prev &&
            points[before].grid.back() < points[prev].grid.back() &&
            points[prev].grid.back() < points[k].grid.back()) {
          links[k].before_previous = before;
          links[k].step_ratio =
              static_cast<double>(points[k].grid.back() - points[prev].grid.back()) /
              static_cast<double>(points[prev].grid.back() - points[before].grid.back());
        }
      }
      before = prev;
      prev = k;
    }
  }
  for (size_t k = begin; k < points.size(); ++k) {
    const Point& p = points[k];
    if (p.variant && p.variant->nominal >= begin && p.variant->nominal < k) {
      links[k].previous = p.variant->nominal;
    }
  }
  return links;
}

std::vector<std::vector<size_t>> ChainUnits(const std::vector<Point>& points, size_t begin) {
  // Each point's unit, by the unit's first nominal point.
  std::map<size_t, std::vector<size_t>> units;
  std::vector<size_t> unit_of(points.size(), ChainLink::kNone);
  for (const auto& chain : Chains(points, begin)) {
    const size_t first = *std::min_element(chain.begin(), chain.end());
    for (size_t k : chain) {
      units[first].push_back(k);
      unit_of[k] = first;
    }
  }
  for (size_t k = begin; k < points.size(); ++k) {
    const Point& p = points[k];
    if (Chained(p)) continue;
    size_t nominal = p.variant ? p.variant->nominal : k;
    size_t unit =
        nominal >= begin && nominal < points.size() && unit_of[nominal] != ChainLink::kNone
            ? unit_of[nominal]
            : nominal;
    if (unit_of[k] == ChainLink::kNone) unit_of[k] = unit;
    units[unit].push_back(k);
  }
  std::vector<std::vector<size_t>> out;
  for (auto& [first, members] : units) out.push_back(std::move(members));
  return out;
}

}  // namespace zvsmap
