#include "netlist/cell_vectors.h"

#include <gtest/gtest.h>

#include "netlist/render.h"

namespace zvsmap {
namespace {

// Vector names as ngspice spells them: a node voltage is v(node), a voltage
// source's current i(source), and a device inside a subcircuit instance is
// reached by its path, v.<instance>.vch for the source vch in instance
// <instance>. // ngspice User's Manual, section 17.2 (vectors) and 2.4.3
// (subcircuit element names) // from memory (section numbers)

CellSpec Cell() {
  CellSpec c;
  c.name = "leg";
  c.node = "sw";
  c.rail_high = "in";
  c.rail_low = "0";
  c.current = "vsense";
  c.high = "xhs";
  c.low = "xls";
  c.high_cmd = "ch";
  c.low_cmd = "cl";
  c.high_gate = "gh";
  c.high_source = "sw";
  c.low_gate = "gl";
  c.low_source = "gnd";
  return c;
}

TEST(CellVectorsTest, SpellsEachSignalOnce) {
  CellVectors v = CellVectorsFor(Cell());
  EXPECT_EQ(v.node, "v(sw)");
  EXPECT_EQ(v.rail_high, "v(in)");
  EXPECT_EQ(v.current, "i(vsense)");
  EXPECT_EQ(v.high_cmd, "v(ch)");
  EXPECT_EQ(v.low_cmd, "v(cl)");
  EXPECT_EQ(v.high_gate, "v(gh)");
  EXPECT_EQ(v.high_source, "v(sw)");
  EXPECT_EQ(v.high_channel, "i(v.xhs.vch)");
  EXPECT_EQ(v.low_channel, "i(v.xls.vch)");
}

// SPICE's ground node is 0 (ngspice also accepts gnd); it has no vector and
// reads 0 V. // ngspice User's Manual, section 2.1.2 (ground node) // from memory
TEST(CellVectorsTest, GroundAndAbsentNodesHaveNoVector) {
  CellSpec c = Cell();
  c.high_gate.clear();
  CellVectors v = CellVectorsFor(c);
  EXPECT_EQ(v.rail_low, "");
  EXPECT_EQ(v.low_source, "");
  EXPECT_EQ(v.high_gate, "");
  EXPECT_TRUE(IsGroundNode("0"));
  EXPECT_TRUE(IsGroundNode("gnd"));
  EXPECT_FALSE(IsGroundNode("g0"));
  EXPECT_EQ(ChannelCurrentVector(""), "");
}

TEST(CellVectorsTest, TheRendererSavesEveryCellVectorOnce) {
  Template tmpl;
  tmpl.cells = {Cell()};
  std::vector<std::string> saved = VectorsToSave(tmpl);
  // v(sw) is both the node and the high switch's source: saved once.
  std::vector<std::string> want = {"v(sw)", "v(in)", "i(vsense)",    "v(ch)",       "v(cl)",
                                   "v(gh)", "v(gl)", "i(v.xhs.vch)", "i(v.xls.vch)"};
  EXPECT_EQ(saved, want);
}

}  // namespace
}  // namespace zvsmap
