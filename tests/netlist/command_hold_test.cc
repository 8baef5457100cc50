#include "netlist/command_hold.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

Deck Sample() {
  Deck d;
  d.AddGenerated("title");
  d.AddGenerated(".subckt sw d g s");
  d.AddGenerated("vch cmd_h dch 0");  // inside a subcircuit: not the command source
  d.AddGenerated(".ends sw");
  d.AddGenerated("vcmdh CMD_H 0 PULSE(0 1 {td} 1n 1n 1u 2u)");
  d.AddGenerated("bgh gh sw v = 10 * v(cmd_h)");
  d.AddGenerated(".end");
  return d;
}

TEST(CommandHoldTest, MovesTheSourceAndAddsTheHold) {
  Deck d = Sample();
  std::string why;
  ASSERT_TRUE(HoldCommandOff(&d, "cmd_h", 1.5e-8, &why)) << why;
  ASSERT_EQ(d.lines.size(), 8u);
  EXPECT_EQ(d.lines[2].text, "vch cmd_h dch 0");
  EXPECT_EQ(d.lines[4].text, "vcmdh zvsmap_probe_free 0 PULSE(0 1 {td} 1n 1n 1u 2u)");
  EXPECT_EQ(d.lines[5].text,
            "bzvsmap_probe_hold cmd_h 0 v = v(zvsmap_probe_free) * (1 - u(time - 1.4999999999999999e-08))");
  EXPECT_EQ(d.lines[6].text, "bgh gh sw v = 10 * v(cmd_h)");
}

TEST(CommandHoldTest, KeepsAReferenceNodeOtherThanGround) {
  Deck d;
  d.AddGenerated("title");
  d.AddGenerated("ecmd c ref x 0 1");
  std::string why;
  ASSERT_TRUE(HoldCommandOff(&d, "c", 1e-6, &why)) << why;
  EXPECT_EQ(d.lines[2].text,
            "bzvsmap_probe_hold c ref v = v(zvsmap_probe_free, ref) * (1 - u(time - 9.9999999999999995e-07))");
}

TEST(CommandHoldTest, RefusesANodeNoSourceDrives) {
  Deck d = Sample();
  std::string why;
  EXPECT_FALSE(HoldCommandOff(&d, "cmd_x", 1e-8, &why));
  EXPECT_EQ(why, "no top-level V, B or E source drives command node 'cmd_x'");
}

}  // namespace
}  // namespace zvsmap
