#include "netlist/wiring_checks.h"

#include <gtest/gtest.h>

#include <string>

namespace zvsmap {
namespace {

// A half bridge written as the templates in netlists/ are: switches d g s,
// the sense source from the switch node toward the inductor.
std::string Bridge(const std::string& sense, const std::string& high) {
  return "bridge\n.param fsw=1Meg\n*@ period 1/fsw\n"
         "*@ cell leg node=sw rail_high=in rail_low=0 current=vsense\n"
         "*@+ high=xhs low=xls high_cmd=ch low_cmd=cl high_gate=gh low_gate=gl\n"
         "vin in 0 48\n" +
         high + "\nxls sw gl 0 sw_model\n" + sense +
         "\nl1 swl out 1u\n.subckt sw_model d g s\nr1 d s 1k\n.ends\n.end\n";
}

std::vector<Diagnostic> Check(const std::string& text,
                              const std::vector<ResolvedDevice>& devices = {}) {
  Template tmpl;
  Diagnostic error;
  EXPECT_TRUE(ParseTemplateText(text, "t.cir", &tmpl, &error)) << error.Format();
  return CheckWiring(tmpl, devices);
}

// i(V) of a SPICE voltage source flows from its + node through it to its -
// node (SPICE convention, e.g. the ngspice manual ch. 4.1), so the sense
// source must start at the switch node for i > 0 to mean "out of the node".
TEST(WiringChecksTest, SenseSourceStartingAtTheNodeIsAcceptedReversedIsRefused) {
  EXPECT_TRUE(Check(Bridge("vsense sw swl 0", "xhs in gh sw sw_model")).empty());
  std::vector<Diagnostic> d = Check(Bridge("vsense swl sw 0", "xhs in gh sw sw_model"));
  ASSERT_EQ(d.size(), 1u);
  EXPECT_NE(d[0].message.find("'vsense' is reversed"), std::string::npos) << d[0].message;
  EXPECT_EQ(d[0].where.line, 9);  // the vsense line
}

TEST(WiringChecksTest, GateOnThePowerLoopOrDrainOnADriveNodeIsRefused) {
  std::vector<Diagnostic> d = Check(Bridge("vsense sw swl 0", "xhs gh in sw sw_model"));
  ASSERT_EQ(d.size(), 2u);
  EXPECT_NE(d[0].message.find("gate pin (its second node) on 'in'"), std::string::npos);
  EXPECT_NE(d[1].message.find("drain pin (its first node) on the drive node 'gh'"),
            std::string::npos);
}

ResolvedDevice Device(const std::string& text, const std::vector<std::string>& pins,
                      const std::vector<std::string>& targets) {
  ResolvedDevice device;
  device.spec.name = "mine";
  device.subckt.name = "vend";
  device.subckt.pins = pins;
  device.subckt.text = text;
  device.targets = targets;
  return device;
}

// A vendor-style subcircuit: pins S D G, an internal gate resistance, VDMOS.
const char kVendor[] =
    ".subckt vend S D G\nrg G gi 2\nm1 D gi S core\n"
    ".model core vdmos(vto=3)\n.ends vend\n";

TEST(WiringChecksTest, PinMapSwapsAreSeenThroughTheInternalGateResistance) {
  std::string ok = Bridge("vsense sw swl 0", "xhs in gh sw sw_model");
  EXPECT_TRUE(Check(ok, {Device(kVendor, {"s", "d", "g"}, {"s", "d", "g"})}).empty());
  auto gd = Check(ok, {Device(kVendor, {"s", "d", "g"}, {"s", "g", "d"})});
  ASSERT_EQ(gd.size(), 1u);
  EXPECT_NE(gd[0].message.find("gate and drain swapped"), std::string::npos) << gd[0].message;
  auto ds = Check(ok, {Device(kVendor, {"s", "d", "g"}, {"d", "s", "g"})});
  ASSERT_EQ(ds.size(), 1u);
  EXPECT_NE(ds[0].message.find("body diode would conduct at the rail"), std::string::npos);
}

// A body diode conducts from source (anode) to drain (cathode) in an
// n-channel switch (common practice); mapped the other way it conducts at the rail.
TEST(WiringChecksTest, ADiodeFromDrainToSourceIsRefused) {
  std::string ok = Bridge("vsense sw swl 0", "xhs in gh sw sw_model");
  const char text[] = ".subckt sw2 a b c\nd1 b a dm\nrch a b 1k\n.ends\n";
  EXPECT_TRUE(Check(ok, {Device(text, {"a", "b", "c"}, {"d", "s", "g"})}).empty());
  auto d = Check(ok, {Device(text, {"a", "b", "c"}, {"s", "d", "g"})});
  ASSERT_EQ(d.size(), 1u);
  EXPECT_NE(d[0].message.find("conduct at the rail instead of blocking"), std::string::npos);
}

}  // namespace
}  // namespace zvsmap
