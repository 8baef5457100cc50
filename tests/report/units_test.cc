#include "report/units.h"

#include <gtest/gtest.h>

#include <cmath>

namespace zvsmap {
namespace {

// SI prefixes and unit symbols: BIPM, The International System of Units
// (SI Brochure), 9th ed., 2019, tables 7 and 4 (from memory).
TEST(UnitsTest, EngineeringNotationWithTheUnitsOwnSymbols) {
  EXPECT_EQ(FormatQuantity(4.7e-6, "H"), "4.7 \u00b5H");
  EXPECT_EQ(FormatQuantity(-0.107, "V"), "-107 mV");
  EXPECT_EQ(FormatQuantity(2, "A"), "2 A");
  EXPECT_EQ(FormatQuantity(500e3, "Hz"), "500 kHz");
  EXPECT_EQ(FormatQuantity(999.7e-9, "s"), "1 \u00b5s");  // rounding carries the prefix
  EXPECT_EQ(FormatQuantity(0, "s"), "0 s");
  EXPECT_EQ(FormatQuantity(-0.0, "A"), "0 A");
}

// A dimensionless margin is a plain number, never "-107u" (common practice).
TEST(UnitsTest, DimensionlessPrintedPlainly) {
  EXPECT_EQ(FormatQuantity(-0.000107, ""), "-0.000107");
  EXPECT_EQ(FormatQuantity(0.25, ""), "0.25");
}

TEST(UnitsTest, UnitsFromNames) {
  EXPECT_EQ(MetricUnit("t_transition_s"), "s");
  EXPECT_EQ(MetricUnit("v_turn_on_v"), "V");
  EXPECT_EQ(MetricUnit("i_commutated_a"), "A");
  EXPECT_EQ(MetricUnit("e_on_j"), "J");
  EXPECT_EQ(MetricUnit("dvdt_peak_v_per_s"), "V/s");
  EXPECT_EQ(MetricUnit("zvs_energy_margin"), "");
  EXPECT_EQ(MetricUnit("t_transition_s__pred__diff"), "s");
  EXPECT_EQ(MetricUnit("t_transition_s__pred__rel_diff"), "");
  EXPECT_EQ(ParamUnit("L"), "H");
  EXPECT_EQ(ParamUnit("Iout"), "A");
  EXPECT_EQ(ParamUnit("Vin"), "V");
  EXPECT_EQ(ParamUnit("fsw"), "Hz");
  EXPECT_EQ(ParamUnit("td_lh"), "s");
  EXPECT_EQ(ParamUnit("Coss"), "F");
  EXPECT_EQ(ParamUnit("D"), "");
  EXPECT_EQ(ParamUnit("n"), "");
}

// Ticks at 1, 2 or 5 times a power of ten (common practice).
TEST(UnitsTest, OneTwoFiveTicks) {
  EXPECT_EQ(NiceTicks(-4.75, 18.2, 8), std::vector<double>({0, 5, 10, 15}));
  std::vector<double> t = NiceTicks(0.47e-6, 2.2e-6, 8);
  ASSERT_GE(t.size(), 2u);
  EXPECT_NEAR(t.front(), 0.5e-6, 1e-15);
  EXPECT_NEAR(t[1] - t[0], 0.5e-6, 1e-15);
  EXPECT_EQ(NiceTicks(0, 8, 5), std::vector<double>({0, 2, 4, 6, 8}));
  EXPECT_FALSE(std::signbit(NiceTicks(-0.3, 8, 5).front()));
}

}  // namespace
}  // namespace zvsmap
