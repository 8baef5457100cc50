#include "sweep/point.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

class PointTest : public ::testing::Test {};

TEST_F(PointTest, GetIsCaseInsensitive) {
  // SPICE names are case-insensitive (ngspice manual, from memory).
  Point p{3, {{"Vin", 48}, {"L", 1e-6}}};
  EXPECT_EQ(p.Get("vin").value_or(-1), 48);
  EXPECT_EQ(p.Get("VIN").value_or(-1), 48);
  EXPECT_EQ(p.Get("l").value_or(-1), 1e-6);
  EXPECT_FALSE(p.Get("Vout").has_value());
}

TEST_F(PointTest, DescribeUsesEngineeringSuffixes) {
  // SPICE scale factors (ngspice manual, from memory).
  Point p{0, {{"Iout", 2}, {"L", 1e-6}, {"fsw", 500e3}, {"Vin", 48}}};
  EXPECT_EQ(p.Describe(), "Iout=2 L=1u fsw=500k Vin=48");
  EXPECT_EQ(Point().Describe(), "");
}

}  // namespace
}  // namespace zvsmap
