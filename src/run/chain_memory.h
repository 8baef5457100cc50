// The settled unknowns a worker remembers along its chains, and the warm
// start each point takes from them (sweep/chain_layout.h says which point
// starts from which).
#pragma once

#include <optional>
#include <vector>

#include "result/point_result.h"
#include "sim/steady_state.h"
#include "sweep/chain_layout.h"

namespace zvsmap {

/// Settled unknowns by point index, and the warm start of a point from its
/// chain predecessor. A point remembered only when it ended ok (a failed or
/// unsettled predecessor gives no warm start: its successor starts cold).
class ChainMemory {
 public:
  /// `links` as ChainLinks gives them, one per point of the sweep.
  explicit ChainMemory(std::vector<ChainLink> links);

  /// A point's result, just evaluated or from the store (the same numbers:
  /// the store keeps the settled state and Jacobian exactly, so a resumed
  /// run warm-starts as the uninterrupted one did): its settled unknowns
  /// (SettleRecord::initial_state) and Jacobian (SettleRecord::jacobian,
  /// when it has one). A result that is not ok is forgotten.
  void Remember(const PointResult& result);

  /// The warm start of point `index`: null when it starts cold. With both
  /// predecessors remembered (same number of unknowns) the unknowns are
  /// predicted linearly from the two (the secant predictor of continuation
  /// methods: Allgower & Georg, "Numerical Continuation Methods", Springer
  /// 1990, REFERENCES sec. 11; chapter not checked),
  /// else they are the predecessor's; the Jacobian is the predecessor's.
  std::optional<WarmStart> For(size_t index) const;

 private:
  std::vector<ChainLink> links_;
  std::vector<std::optional<WarmStart>> settled_;
};

}  // namespace zvsmap
