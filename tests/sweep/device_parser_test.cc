// <device> elements, pin maps and device axes in the sweep file. Inputs inline;
// the expected values are the documented syntax (README "Switch models").
#include "sweep/device_parser.h"

#include <gtest/gtest.h>

#include "sweep/sweep_expand.h"
#include "sweep/sweep_parser.h"

namespace zvsmap {
namespace {

class DeviceParserTest : public ::testing::Test {
 protected:
  bool Parse(const std::string& body) {
    return ParseSweepText("<sweep>\n<template file=\"t.cir\"/>\n" + body + "</sweep>\n", "/w/s.xml",
                          &spec_, &error_);
  }
  SweepSpec spec_;
  Diagnostic error_;
};

TEST_F(DeviceParserTest, PinMapByNameOrByPosition) {
  std::vector<PinTie> ties;
  bool positional = false;
  std::string message;
  ASSERT_TRUE(ParsePinMap("D=d G=g S=s KS=s TJ=25 SUB=@0", &ties, &positional, &message));
  EXPECT_FALSE(positional);
  ASSERT_EQ(ties.size(), 6u);
  EXPECT_EQ(ties[3].pin, "ks");
  EXPECT_EQ(ties[3].to, "s");
  EXPECT_EQ(ties[4].to, "25");
  EXPECT_EQ(ties[5].to, "@0");
  ASSERT_TRUE(ParsePinMap("s d g", &ties, &positional, &message));
  EXPECT_TRUE(positional);
  EXPECT_EQ(ties[0].pin, "");
  EXPECT_FALSE(ParsePinMap("D=d s", &ties, &positional, &message));
  EXPECT_EQ(message, "pin map mixes plain entries and pin=target entries; use one form");
  EXPECT_FALSE(ParsePinMap("D=d D=s", &ties, &positional, &message));
  EXPECT_EQ(message, "pin 'D' is mapped twice");
}

TEST_F(DeviceParserTest, DevicesAndADeviceAxisExpandToNamedChoices) {
  ASSERT_TRUE(
      Parse("<device name=\"a\" model=\"zsw_linear\"/>\n"
            "<device name=\"b\" file=\"m/x.lib\" subckt=\"X\" pins=\"s d g\"/>\n"
            "<axis param=\"Iout\" values=\"1 2\"/>\n"
            "<axis device=\"leg.high leg.low\" values=\"a b\"/>\n"))
      << error_.Format();
  ASSERT_EQ(spec_.devices.size(), 2u);
  EXPECT_TRUE(spec_.devices[0].generic);
  EXPECT_EQ(spec_.devices[1].file, "/w/m/x.lib");
  EXPECT_EQ(spec_.NamedParams().size(), 1u);  // the device axis names no parameter
  std::vector<Point> points;
  ASSERT_TRUE(ExpandSweep(spec_, &points, &error_)) << error_.Format();
  ASSERT_EQ(points.size(), 4u);
  EXPECT_EQ(points[1].values.size(), 1u);
  EXPECT_EQ(points[1].devices, (std::vector<std::pair<std::string, std::string>>{
                                   {"leg.high", "b"}, {"leg.low", "b"}}));
  EXPECT_EQ(points[2].Describe(), "Iout=2 leg.high=a leg.low=a");
}

TEST_F(DeviceParserTest, DeviceAxisInLockstepWithAParameter) {
  ASSERT_TRUE(
      Parse("<device name=\"a\" model=\"zsw_linear\"/>\n"
            "<device name=\"b\" model=\"zsw_junction\"/>\n"
            "<lockstep><axis device=\"leg.low\" values=\"a b\"/>"
            "<axis param=\"td\" values=\"10n 40n\"/></lockstep>\n"))
      << error_.Format();
  std::vector<Point> points;
  ASSERT_TRUE(ExpandSweep(spec_, &points, &error_)) << error_.Format();
  ASSERT_EQ(points.size(), 2u);
  EXPECT_EQ(points[1].Describe(), "td=40n leg.low=b");
}

TEST_F(DeviceParserTest, Errors) {
  EXPECT_FALSE(Parse("<device name=\"a\" model=\"zsw_linear\" file=\"x.lib\"/>\n"));
  EXPECT_EQ(error_.message,
            "<device> takes either model=\"zsw_...\" (a generic library model) or file, subckt "
            "and pins (your own subcircuit)");
  EXPECT_FALSE(Parse("<device name=\"a\" file=\"x.lib\" subckt=\"X\"/>\n"));
  EXPECT_EQ(error_.message, "missing attribute 'pins' on <device>");
  EXPECT_FALSE(
      Parse("<device name=\"a\" model=\"zsw_linear\"/>\n"
            "<device name=\"A\" model=\"zsw_junction\"/>\n"));
  EXPECT_EQ(error_.message, "device 'A' is declared twice (first on line 3)");
  EXPECT_EQ(error_.where.line, 4);
  EXPECT_FALSE(
      Parse("<device name=\"a\" model=\"zsw_linear\"/>\n"
            "<axis device=\"leg.high\" values=\"a\"/>\n"
            "<axis device=\"leg.high leg.low\" values=\"a\"/>\n"));
  EXPECT_EQ(error_.message, "switch role 'leg.high' is assigned twice (first on line 4)");
}

}  // namespace
}  // namespace zvsmap
