#include "result/edge_identity.h"

#include "core/text.h"

namespace zvsmap {

const char* EdgeKindName(EdgeKind kind) { return kind == EdgeKind::kHighOn ? "high_on" : "low_on"; }

bool ParseEdgeKind(const std::string& name, EdgeKind* out) {
  for (EdgeKind k : kEdgeKinds) {
    if (name == EdgeKindName(k)) {
      *out = k;
      return true;
    }
  }
  return false;
}

std::string EdgeId::Label() const { return cell + "." + EdgeKindName(kind); }

const char* SwitchSideName(SwitchSide side) { return side == SwitchSide::kHigh ? "high" : "low"; }

std::string SwitchRole::Name() const { return cell + "." + SwitchSideName(side); }

bool ParseSwitchRole(const std::string& text, SwitchRole* out) {
  size_t dot = text.rfind('.');
  if (dot == std::string::npos || dot == 0) return false;
  std::string side = Lower(text.substr(dot + 1));
  for (SwitchSide s : {SwitchSide::kHigh, SwitchSide::kLow}) {
    if (side == SwitchSideName(s)) {
      out->cell = text.substr(0, dot);
      out->side = s;
      return true;
    }
  }
  return false;
}

}  // namespace zvsmap
