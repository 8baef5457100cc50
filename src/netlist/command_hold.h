// Holding a logic command off from a given instant: the deck edit behind a
// probe run (the incoming switch's turn-on withheld, everything else as it is).
#pragma once

#include <string>

#include "netlist/deck.h"

namespace zvsmap {

/// Rewrites `deck` so that the logic command on node `command_node` is held at
/// 0 from `t_from_s` on and is the template's own signal before. The source
/// that drives the node (the one top-level V, B or E card whose first node it
/// is) is moved to a node of zvsmap's own, and a behavioural source passes its
/// voltage on, multiplied by a step that falls to 0 at `t_from_s` (an instant
/// at which the command is off, so the held signal is continuous). False with
/// `why` when no such card, or more than one, drives the node.
bool HoldCommandOff(Deck* deck, const std::string& command_node, double t_from_s,
                    std::string* why);

}  // namespace zvsmap
