// Which edge and which switch a result belongs to: typed, with their names
// (as the sweep file, the template and the reports spell them) in one place.
#pragma once

#include <string>

namespace zvsmap {

/// A commutation edge of a cell: kHighOn (the node rises, the high-side switch
/// turns on) or kLowOn (the node falls, the low-side switch turns on).
enum class EdgeKind { kHighOn, kLowOn };

/// Both edge kinds, in the order every cell is measured.
inline constexpr EdgeKind kEdgeKinds[] = {EdgeKind::kHighOn, EdgeKind::kLowOn};

/// "high_on", "low_on".
const char* EdgeKindName(EdgeKind kind);

/// The inverse of EdgeKindName (exact spelling). False for any other text.
bool ParseEdgeKind(const std::string& name, EdgeKind* out);

/// One edge of one cell, e.g. leg.high_on.
struct EdgeId {
  std::string cell;
  EdgeKind kind = EdgeKind::kHighOn;
  /// "leg.high_on".
  std::string Label() const;
  bool operator==(const EdgeId& o) const { return cell == o.cell && kind == o.kind; }
};

/// A switch position in a cell.
enum class SwitchSide { kHigh, kLow };

/// "high", "low".
const char* SwitchSideName(SwitchSide side);

/// A switch role as device axes name it: CELL.high or CELL.low.
struct SwitchRole {
  std::string cell;
  SwitchSide side = SwitchSide::kHigh;
  /// "leg.high".
  std::string Name() const;
};

/// Parses "CELL.high" / "CELL.low" (the side compared case-insensitively, the
/// cell kept as written). False when there is no cell name or no valid side.
bool ParseSwitchRole(const std::string& text, SwitchRole* out);

}  // namespace zvsmap
