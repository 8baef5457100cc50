// ngspice's messages about netlist lines mapped to the user's file:line.
// The message forms were taken from libngspice 39.3 runs (e.g. an undefined
// parameter gives "Netlist line no. 4:" on one stderr line and "Undefined
// parameter [bogus]" on the next; an unknown subcircuit gives "Error:
// unknown subckt: x1 a 0 nosuch"), line numbers counting the lines handed to
// ngSpice_Circ from 1.
#include "sim/engine_messages.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

Deck Sample() {
  Deck deck;
  deck.lines.push_back({"title", {"t.cir", 1, 0}});
  deck.lines.push_back({"* a comment", {"t.cir", 2, 0}});
  deck.lines.push_back({"r1 a 0 {bogus}", {"inc/a.inc", 7, 0}});
  deck.lines.push_back({"X1 a 0 nosuch", {"t.cir", 12, 0}});
  deck.AddGenerated(".end");
  return deck;
}

TEST(EngineMessagesTest, NumberedLinesGetTheirOrigin) {
  Deck deck = Sample();
  EXPECT_EQ(MapEngineLines("engine error: Netlist line no. 3: Undefined parameter [bogus]", deck),
            "engine error: Netlist line no. 3 [inc/a.inc:7]: Undefined parameter [bogus]");
  EXPECT_EQ(MapEngineLines("Error on line 4 :", deck), "Error on line 4 [t.cir:12] :");
  EXPECT_EQ(MapEngineLines("Warning: Model issue on line 3 :", deck),
            "Warning: Model issue on line 3 [inc/a.inc:7] :");
  // A line zvsmap added, or none at all: unchanged.
  EXPECT_EQ(MapEngineLines("Netlist line no. 5:", deck), "Netlist line no. 5:");
  EXPECT_EQ(MapEngineLines("Netlist line no. 99:", deck), "Netlist line no. 99:");
}

TEST(EngineMessagesTest, QuotedCardsGetTheirOrigin) {
  Deck deck = Sample();
  EXPECT_EQ(MapEngineLines("engine error: Error: unknown subckt: x1 a 0 nosuch", deck),
            "engine error: Error: unknown subckt: x1 a 0 nosuch [t.cir:12]");
  EXPECT_EQ(MapEngineLines("Timestep too small", deck), "Timestep too small");
  // Inside a subcircuit ngspice 39 says "line no. 0": the card using the name.
  EXPECT_EQ(MapEngineLines("Netlist line no. 0: Undefined parameter [bogus]", deck),
            "Netlist line no. 0: Undefined parameter [bogus] [inc/a.inc:7]");
}

}  // namespace
}  // namespace zvsmap
