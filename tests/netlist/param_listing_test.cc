#include "netlist/param_listing.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

const char* kTemplate = R"(half bridge for the listing (an invented scenario)
.param Vin=48 fsw=500k L=1u td_lh=40n td_hl=30n
.param il0={Vin/(8*L*fsw)}
*@ period 1/fsw
*@ model buck vin=Vin
*@ cell leg node=sw rail_high=in rail_low=0 current=vsense
*@+ high=xhs low=xls high_cmd=ch low_cmd=cl high_dead=td_lh low_dead=td_hl inductance=L
*@ state i(l1) init=il0
.end
)";

TEST(ParamListingTest, NamesEachAnnotationThatReadsAParameter) {
  Template tmpl;
  Diagnostic error;
  ASSERT_TRUE(ParseTemplateText(kTemplate, "t.cir", &tmpl, &error)) << error.Format();
  std::vector<ParamListing> list = ListParams(tmpl, {"vin", "l"});
  ASSERT_EQ(list.size(), 6u);
  EXPECT_EQ(list[0].name, "vin");
  EXPECT_EQ(list[0].uses, std::vector<std::string>({"model input vin"}));
  EXPECT_EQ(list[1].uses, std::vector<std::string>({"period"}));
  EXPECT_EQ(list[2].uses, std::vector<std::string>({"cell leg inductance", "model input l"}));
  EXPECT_EQ(list[3].uses, std::vector<std::string>({"cell leg high_dead"}));
  EXPECT_EQ(list[4].uses, std::vector<std::string>({"cell leg low_dead"}));
  EXPECT_EQ(list[5].uses, std::vector<std::string>({"state i(l1) init"}));
  EXPECT_FALSE(list[0].computed);
  EXPECT_TRUE(list[5].computed);
}

// SPICE numbers carry scale suffixes (ngspice manual, "Notation", from
// memory): "500k" and "1e-3" hold no names.
TEST(ParamListingTest, ExpressionNamesSkipNumberSuffixes) {
  EXPECT_EQ(ExpressionNames("Vin/(8*L*500k) + 1e-3*max(Iout, 2meg)"),
            std::vector<std::string>({"vin", "l", "max", "iout"}));
  EXPECT_TRUE(ExpressionNames("20n + 1.5u").empty());
}

}  // namespace
}  // namespace zvsmap
