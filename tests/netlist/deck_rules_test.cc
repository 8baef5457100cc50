// The deck allow-list: which cards pass to ngspice, which are refused and
// why. The prefix, case and blank rules follow ngspice 39's input reader
// (ngspice source, src/frontend/inpcom.c inp_read: ciprefix(".control"),
// ciprefix(".endc"), ciprefix(".inc"), ciprefix(".lib"); src/frontend/inp.c
// inp_spsource: "*#" lines and lines in a control section are commands, a
// "pre_" command runs before parsing). The messages are our own wording.
#include "netlist/deck_rules.h"

#include <gtest/gtest.h>

namespace zvsmap {
namespace {

// The reason `card` is refused, or "" when it passes.
std::string Refusal(const std::string& card, int* column = nullptr) {
  CardClass c;
  std::string reason;
  int col = 0;
  bool ok = ClassifyCard(card, &c, &reason, &col);
  if (column) *column = col;
  return ok ? "" : reason;
}

CardKind KindOf(const std::string& card) {
  CardClass c;
  std::string reason;
  int col = 0;
  EXPECT_TRUE(ClassifyCard(card, &c, &reason, &col)) << card << ": " << reason;
  return c.kind;
}

TEST(DeckRulesTest, ControlSectionInEverySpellingNgspiceAccepts) {
  const std::string kWhy =
      "starts a control section (ngspice runs its lines as commands); a zvsmap deck holds no "
      "commands";
  EXPECT_EQ(Refusal(".control"), "'.control' " + kWhy);
  EXPECT_EQ(Refusal(".CONTROL"), "'.CONTROL' " + kWhy);
  EXPECT_EQ(Refusal(".Controls"), "'.Controls' " + kWhy);  // prefix match
  EXPECT_EQ(Refusal(".controlxyz run"), "'.controlxyz' " + kWhy);
  int column = 0;
  EXPECT_EQ(Refusal("   .control", &column), "'.control' " + kWhy);  // leading blanks stripped
  EXPECT_EQ(column, 4);
  EXPECT_EQ(Refusal(".endc"),
            "'.endc' ends a control section; a zvsmap deck holds no control sections");
  EXPECT_EQ(Refusal(".ENDCX"),
            "'.endc' ends a control section; a zvsmap deck holds no control sections");
}

TEST(DeckRulesTest, CommandCommentsAndScriptModeAreRefused) {
  EXPECT_EQ(Refusal("*#shell touch x"),
            "'*#' lines are commands to ngspice (run like a control section); a zvsmap deck "
            "holds no commands");
  EXPECT_EQ(Refusal("  *# echo"), Refusal("*#"));
  EXPECT_EQ(Refusal("*NG_SCRIPT"),
            "'*ng_script' makes ngspice read the file as a command script; a zvsmap deck holds no "
            "commands");
  EXPECT_EQ(Refusal("* an ordinary comment with .control in it"), "");
  EXPECT_EQ(Refusal("*@ cell leg node=sw"), "");
}

TEST(DeckRulesTest, OnlyKnownControlCardsPass) {
  EXPECT_EQ(KindOf(".param a=1"), CardKind::kKept);
  EXPECT_EQ(KindOf(".SUBCKT sw d g s"), CardKind::kKept);
  EXPECT_EQ(KindOf(".model dd d(is=1e-14)"), CardKind::kKept);
  EXPECT_EQ(KindOf(".tran 1n 1u"), CardKind::kDropped);
  EXPECT_EQ(KindOf(".meas tran x find v(a) at=1u"), CardKind::kDropped);
  EXPECT_EQ(KindOf(".include a.cir"), CardKind::kInclude);
  EXPECT_EQ(KindOf(".INCL a.cir"), CardKind::kInclude);  // ngspice: ciprefix(".inc")
  EXPECT_EQ(KindOf(".lib m.lib typ"), CardKind::kLibrary);
  EXPECT_EQ(KindOf(".endl"), CardKind::kEndLibrary);
  EXPECT_EQ(KindOf(".end"), CardKind::kEnd);
  EXPECT_EQ(KindOf("xhs in gh sw zsw"), CardKind::kElement);
  EXPECT_EQ(KindOf("+ ron=1"), CardKind::kContinuation);
  EXPECT_EQ(Refusal(".paramx a=1"),
            "'.paramx' is not a card zvsmap passes to ngspice (did you mean '.param'?); allowed: "
            ".param .subckt .ends .model .ic .nodeset .global .func .options .option .opt .temp "
            ".if .elseif .else .endif .include .lib .endl .end, and analysis/output cards, which "
            "zvsmap replaces");
  EXPECT_NE(Refusal(".exec shell x"), "");
  EXPECT_NE(Refusal(".csparam a=1"), "");
}

TEST(DeckRulesTest, CardsStartWithALetterDotStarOrPlus) {
  // '@' ends ngspice's reading of the deck (inpcom.c: `if (*buffer == '@') break;`).
  EXPECT_EQ(Refusal("@ stop"),
            "a card starts with a letter (an element), '.' (a control card), '*' (a comment) or "
            "'+' (a continuation), not '@'");
  EXPECT_NE(Refusal("1 a b"), "");
  EXPECT_NE(Refusal("$ x"), "");
}

TEST(DeckRulesTest, CardsThatMakeNgspiceOpenAFileAreRefused) {
  int column = 0;
  EXPECT_EQ(Refusal(".model src filesource(file=\"/etc/x\" amploffset=[0])", &column),
            "'file=' names a file ngspice would open by itself; zvsmap passes on only what it has "
            "read (put the data in the netlist)");
  EXPECT_EQ(column, 23);
  EXPECT_NE(Refusal(".model dsrc d_source(input_file = \"x.txt\")").find("'input_file='"),
            std::string::npos);
  EXPECT_EQ(Refusal("rfile a 0 1"), "");
}

TEST(DeckRulesTest, ControlCharactersNeverReachACard) {
  int column = 0;
  EXPECT_EQ(Refusal("r1 a b 1\r.control", &column),
            "the card holds a carriage return (CR), which no SPICE card may contain");
  EXPECT_EQ(column, 9);
  EXPECT_EQ(Refusal(std::string("r1 a b \x1b")),
            "the card holds control character 0x1b, which no SPICE card may contain");
  EXPECT_EQ(Refusal("r1\ta\tb\t1"), "");  // tabs separate words
}

TEST(DeckRulesTest, OptionsThatChangeSavedDataAreRefusedWithTheReason) {
  EXPECT_EQ(Refusal(".options interp"),
            "option 'interp' is refused: it interpolates the saved data onto the print step, so "
            "the waveforms zvsmap measures are no longer the simulated ones (measured in ngspice "
            "39: a turn-on voltage halved)");
  EXPECT_EQ(Refusal(".OPTION reltol=1e-4 AUTOSTOP"),
            "option 'autostop' is refused: it stops the transient before its end time, so the "
            "measured periods are missing");
  std::string reason;
  EXPECT_FALSE(CheckOptions(" savecurrents", &reason));
  EXPECT_TRUE(CheckOptions(" method = gear reltol= 1e-4 abstol =1e-9 rshunt=1e9", &reason))
      << reason;
  EXPECT_FALSE(CheckOptions(" reltl=1e-3", &reason));
  EXPECT_EQ(
      reason.rfind("option 'reltl' is not one zvsmap passes to ngspice (did you mean 'reltol'?); "
                   "accepted: abstol reltol",
                   0),
      0u)
      << reason;
}

TEST(DeckRulesTest, ParameterListsStayOnOneCard) {
  std::string reason;
  EXPECT_TRUE(CheckParamListToken("rg=2 c0_f = 2n vth={vgs*0.5} k='a+1'", &reason)) << reason;
  EXPECT_FALSE(CheckParamListToken("rg=2\n.control", &reason));
  EXPECT_EQ(reason, "holds a line break (LF) at character 5; a parameter list stays on one card");
  EXPECT_FALSE(CheckParamListToken("rg=2;shell", &reason));
  EXPECT_EQ(reason,
            "the value of 'rg' holds ';'; write a number, a name or a braced expression {...}");
  EXPECT_FALSE(CheckParamListToken("rg={1} .control", &reason));
  EXPECT_EQ(reason, "expected name=value items, got '.control'");
  EXPECT_FALSE(CheckParamListToken("rg={\"x\"}", &reason));
  EXPECT_EQ(reason, "the value of 'rg' holds '\"', which is no part of an expression");
  EXPECT_TRUE(IsNameToken("typ_25"));
  EXPECT_FALSE(IsNameToken(".control"));
  EXPECT_FALSE(IsNameToken("typ\n"));
}

}  // namespace
}  // namespace zvsmap
