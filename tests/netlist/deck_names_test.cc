// Names the annotations use, checked against the assembled deck before any
// simulation (common practice: a typo is an input error, not a design
// failure). The messages are our own wording.
#include "netlist/deck_names.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

const char* kTemplate = R"(half bridge
.param fsw=500k
.param il0=0
*@ period 1/fsw
*@ cell leg node=sw rail_high=in rail_low=0 current=vsense
*@+ high=xhs low=xls high_cmd=ch low_cmd=cl
*@ state i(l1) init=il0
vin in 0 48
vch ch 0 0
vcl cl 0 0
xhs in gh sw zsw
xls sw gl 0 zsw
vsense sw sx 0
l1 sx out 1u
.subckt zsw d g s
rin d s 1
.ends
)";

std::vector<Diagnostic> Check(const std::string& from, const std::string& to) {
  std::string text = kTemplate;
  text.replace(text.find(from), from.size(), to);
  Template tmpl;
  Diagnostic error;
  EXPECT_TRUE(ParseTemplateText(text, "t.cir", &tmpl, &error)) << error.Format();
  return CheckAnnotationNames(tmpl);
}

TEST(DeckNamesTest, ACompleteTemplatePasses) { EXPECT_TRUE(Check("half", "half").empty()); }

TEST(DeckNamesTest, MissingNodeHasCaretAndSuggestion) {
  std::vector<Diagnostic> e = Check("node=sw ", "node=sww ");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_EQ(e[0].Format(),
            "t.cir:5: cell 'leg': node 'sww' (node) is not in the template's deck (did you mean "
            "'sw'?)\n  *@ cell leg node=sww rail_high=in rail_low=0 current=vsense\n"
            "              ^");
}

TEST(DeckNamesTest, SwitchSenseSourceAndStateOnContinuationLines) {
  std::vector<Diagnostic> e = Check("high=xhs", "high=xhx");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_EQ(e[0].where.line, 6);  // the *@+ line that names it
  EXPECT_EQ(e[0].message,
            "cell 'leg': switch instance 'xhx' (high) is not in the template's deck (did you "
            "mean 'xhs'?)");
  e = Check("current=vsense", "current=vsens");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_EQ(e[0].message,
            "cell 'leg': sense source 'vsens' (current) is not in the template's deck (did you "
            "mean 'vsense'?)");
  e = Check("i(l1)", "i(l2)");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_EQ(e[0].message,
            "state: element 'l2' (i) is not in the template's deck (did you mean 'l1'?)");
  // A node only inside a subcircuit is not a node of the deck.
  e = Check("low_cmd=cl", "low_cmd=d");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_EQ(e[0].Format(),
            "t.cir:6: cell 'leg': node 'd' (low_cmd) is not in the template's deck (did you mean "
            "'0'?)\n  *@+ high=xhs low=xls high_cmd=ch low_cmd=d\n"
            "  " +
                std::string(33, ' ') + "^");
}

}  // namespace
}  // namespace zvsmap
