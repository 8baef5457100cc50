// ngspice's messages about netlist lines, mapped back to the user's files.
// ngspice 39 numbers the lines of the text it was given from 1 (the title):
// "Netlist line no. 84:", "Error on line 84 :", "Warning: Model issue on
// line 84 :"; some messages quote the card instead ("unknown subckt: x1 a 0
// nosuch", lower-cased). Checked against libngspice 39.3.
#pragma once

#include <string>

#include "netlist/deck.h"

namespace zvsmap {

/// `message` with each reference to a line of `deck` followed by the
/// user's file:line in brackets, e.g. "Netlist line no. 4 [buck.cir:12]:".
/// A message that names no line number but quotes a card of the deck gets
/// " [file:line]" appended, as does "Undefined parameter [name]" (ngspice
/// gives "line no. 0" inside subcircuits) the first card using the name.
/// Lines zvsmap added are left as they are.
std::string MapEngineLines(const std::string& message, const Deck& deck);

}  // namespace zvsmap
