#include "core/spice_number.h"

#include <gtest/gtest.h>

#include <cstdlib>

namespace zvsmap {
namespace {

// Scale factors and their spelling: ngspice User's Manual, section "Circuit
// elements and models" / number syntax (from memory): f=1e-15 p=1e-12 n=1e-9
// u=1e-6 m=1e-3 k=1e3 meg=1e6 g=1e9 t=1e12, case-insensitive, letters after
// the factor are ignored as a unit.
class SpiceNumberTest : public ::testing::Test {
 protected:
  static double Parse(const std::string& text) {
    std::optional<double> v = ParseSpiceNumber(text);
    EXPECT_TRUE(v.has_value()) << "'" << text << "' should parse";
    return v.value_or(-12345);
  }
  static bool Rejected(const std::string& text) { return !ParseSpiceNumber(text).has_value(); }
};

TEST_F(SpiceNumberTest, PlainNumbers) {
  // C strtod syntax (ISO C99 7.20.1.3), from memory.
  EXPECT_DOUBLE_EQ(Parse("48"), 48.0);
  EXPECT_DOUBLE_EQ(Parse("-3.5"), -3.5);
  EXPECT_DOUBLE_EQ(Parse("+.5"), 0.5);
  EXPECT_DOUBLE_EQ(Parse("5."), 5.0);
  EXPECT_DOUBLE_EQ(Parse("1e-4"), 1e-4);
  EXPECT_DOUBLE_EQ(Parse("2.5E3"), 2500.0);
  EXPECT_DOUBLE_EQ(Parse("  12  "), 12.0);
}

TEST_F(SpiceNumberTest, EveryScaleFactor) {
  // ngspice manual scale factors (from memory).
  EXPECT_DOUBLE_EQ(Parse("1f"), 1e-15);
  EXPECT_DOUBLE_EQ(Parse("1p"), 1e-12);
  EXPECT_DOUBLE_EQ(Parse("1n"), 1e-9);
  EXPECT_DOUBLE_EQ(Parse("1u"), 1e-6);
  EXPECT_DOUBLE_EQ(Parse("1m"), 1e-3);
  EXPECT_DOUBLE_EQ(Parse("1k"), 1e3);
  EXPECT_DOUBLE_EQ(Parse("1meg"), 1e6);
  EXPECT_DOUBLE_EQ(Parse("1g"), 1e9);
  EXPECT_DOUBLE_EQ(Parse("1t"), 1e12);
}

TEST_F(SpiceNumberTest, MilliIsNotMega) {
  // SPICE's classic trap: "m" is milli, "meg" is mega (ngspice manual, from memory).
  EXPECT_DOUBLE_EQ(Parse("1m"), 1e-3);
  EXPECT_DOUBLE_EQ(Parse("1meg"), 1e6);
  EXPECT_DOUBLE_EQ(Parse("1MEG"), 1e6);
  EXPECT_DOUBLE_EQ(Parse("1Meg"), 1e6);
  EXPECT_DOUBLE_EQ(Parse("1M"), 1e-3);
  EXPECT_DOUBLE_EQ(Parse("200K"), 200e3);
}

TEST_F(SpiceNumberTest, UnitLettersAfterTheFactorAreIgnored) {
  // ngspice manual: "10V", "10Volts" and "10" are the same number (from memory).
  EXPECT_DOUBLE_EQ(Parse("10nF"), 10e-9);
  EXPECT_DOUBLE_EQ(Parse("2.2u"), 2.2e-6);
  EXPECT_DOUBLE_EQ(Parse("2.2uH"), 2.2e-6);
  EXPECT_DOUBLE_EQ(Parse("48V"), 48.0);
  EXPECT_DOUBLE_EQ(Parse("1megHz"), 1e6);
  EXPECT_DOUBLE_EQ(Parse("4.7e-3k"), 4.7);
}

TEST_F(SpiceNumberTest, SuffixedValuesAreTheNearestDouble) {
  // "0.47u" means the decimal 0.47e-6; the same number as "470n" and "0.47e-6"
  // (IEEE 754 round-to-nearest of the decimal value; C99 strtod, from memory).
  EXPECT_EQ(Parse("0.47u"), 0.47e-6);
  EXPECT_EQ(Parse("470n"), 0.47e-6);
  EXPECT_EQ(Parse("2.2u"), 2.2e-6);
  EXPECT_EQ(Parse("0.1meg"), 1e5);
}

TEST_F(SpiceNumberTest, RejectsJunk) {
  // common practice, no source: anything that is not one number is refused.
  EXPECT_TRUE(Rejected(""));
  EXPECT_TRUE(Rejected("   "));
  EXPECT_TRUE(Rejected("abc"));
  EXPECT_TRUE(Rejected("1.2.3"));
  EXPECT_TRUE(Rejected("1e"));
  EXPECT_TRUE(Rejected("1e+"));
  EXPECT_TRUE(Rejected("inf"));
  EXPECT_TRUE(Rejected("-inf"));
  EXPECT_TRUE(Rejected("nan"));
  EXPECT_TRUE(Rejected("0x10"));
  EXPECT_TRUE(Rejected("10 k"));
  EXPECT_TRUE(Rejected("5u3"));
  EXPECT_TRUE(Rejected("k"));
  EXPECT_TRUE(Rejected("1e999"));
}

TEST_F(SpiceNumberTest, MilIsRefused) {
  // The header's contract: "mil" (SPICE's 25.4e-6) is not accepted, so it must
  // not silently read as milli.
  EXPECT_TRUE(Rejected("10mil"));
}

TEST_F(SpiceNumberTest, FormatNumberReadsBack) {
  // %.Ng of ISO C printf (from memory): short where 12 digits read back
  // exactly, 17 digits where they do not (0.1 + 0.2 is not 0.3 in binary64,
  // IEEE 754-2008).
  EXPECT_EQ(FormatNumber(48), "48");
  EXPECT_EQ(FormatNumber(2.2e-6), "2.2e-06");
  EXPECT_EQ(FormatNumber(0.1 + 0.2), "0.30000000000000004");
  for (double x : {1.0 / 3.0, 2.0 / 3.0e5, 6.02214076e23, 1e-300, -4.9e-7}) {
    EXPECT_EQ(std::strtod(FormatNumber(x).c_str(), nullptr), x) << FormatNumber(x);
  }
}

TEST_F(SpiceNumberTest, FormatEngineeringUsesSpiceFactors) {
  // Suffixes as in the ngspice manual (from memory); "meg", not "M".
  EXPECT_EQ(FormatEngineering(4.7e-6), "4.7u");
  EXPECT_EQ(FormatEngineering(500e3), "500k");
  EXPECT_EQ(FormatEngineering(1e6), "1meg");
  EXPECT_EQ(FormatEngineering(2e-9), "2n");
  EXPECT_EQ(FormatEngineering(0.47e-6), "470n");
  EXPECT_EQ(FormatEngineering(-12), "-12");
  EXPECT_EQ(FormatEngineering(0), "0");
  EXPECT_EQ(FormatEngineering(1.23456e3), "1.235k");
}

// ---- spellings judged against ngspice's reading ----
// The reading: ngspice source, src/spicelib/parser/inpeval.c (INPevaluate: a
// number, then the scale factor chosen by the first letter, t g k u n p f a,
// m = milli unless "meg" or "mil" follows, any case; later letters skipped)
// and src/frontend/numparam/xpressn.c (parseunit, the same letters for .param
// expressions, "mil" read as milli there); ngspice User's Manual, section 2.3.3
// "Naming conventions" ("Letters immediately following a number that are not
// scale factors are ignored").

std::string Refused(const std::string& text) {
  NumberSpelling s = JudgeSpiceSpelling(text);
  EXPECT_EQ(s.kind, NumberSpelling::Kind::kRefused) << text;
  return s.message;
}

std::string Noted(const std::string& text) {
  NumberSpelling s = JudgeSpiceSpelling(text);
  EXPECT_EQ(s.kind, NumberSpelling::Kind::kUnitNote) << text;
  return s.message;
}

TEST(JudgeSpiceSpellingTest, PlainSpellingsSayNothing) {
  for (const char* text : {"48", "-3.5", "1e-4", "500k", "200K", "1meg", "1Meg", "1MEG", "2.2u",
                           "10U", "1m", "100p", "1f", "3g", "1t", "  12  "}) {
    NumberSpelling s = JudgeSpiceSpelling(text);
    EXPECT_EQ(s.kind, NumberSpelling::Kind::kPlain) << text;
    EXPECT_EQ(s.message, "") << text;
  }
}

TEST(JudgeSpiceSpellingTest, NotANumberIsLeftToTheReader) {
  // ParseSpiceNumber refuses these itself ("bad number ...").
  for (const char* text : {"", "abc", "1e", "5u3", "10 k", "inf", "1e999meg"}) {
    EXPECT_EQ(JudgeSpiceSpelling(text).kind, NumberSpelling::Kind::kPlain) << text;
  }
}

TEST(JudgeSpiceSpellingTest, UpperCaseMIsMilliNotMega) {
  // inpeval.c: 'M' without "EG" is milli, so 0.5MHz is 0.5e-3.
  EXPECT_EQ(Refused("0.5MHz"),
            "'0.5MHz' is 0.5 milli (0.0005) in SPICE, which reads 'M' as milli; write "
            "'0.5meg' for mega or '0.5m' for milli");
  EXPECT_EQ(Refused("1M"),
            "'1M' is 1 milli (0.001) in SPICE, which reads 'M' as milli; write '1meg' for mega or "
            "'1m' for milli");
}

TEST(JudgeSpiceSpellingTest, AIsAttoNotAmperes) {
  // inpeval.c and xpressn.c: 'a'/'A' is atto, 1e-18.
  EXPECT_EQ(Refused("2A"),
            "'2A' is 2 atto (2e-18) in SPICE, which reads 'A' as atto; write '2' for 2 amperes, "
            "or '2e-18' for atto");
  Refused("3a");
}

TEST(JudgeSpiceSpellingTest, UpperCaseFAloneIsFemtoNotFarad) {
  EXPECT_EQ(Refused("1F"),
            "'1F' is 1 femto (1e-15) in SPICE, which reads 'F' as femto; write '1' for 1 farad, "
            "or '1f' for femto");
}

TEST(JudgeSpiceSpellingTest, UnknownTrailingLettersAreRefused) {
  // ngspice manual 2.3.3: such letters are ignored, so "1xyz" is 1.
  EXPECT_EQ(Refused("1xyz"),
            "SPICE ignores the letters 'xyz' in '1xyz' and reads 1; write '1' (after a number and "
            "its scale factor zvsmap takes only the unit symbols V, A, H, F, Hz, s, Ohm, W, J)");
  EXPECT_EQ(Refused("10uxyz").substr(0, 64),
            "SPICE ignores the letters 'xyz' in '10uxyz' and reads 1e-05; wri");
  Refused("10Volts");
}

TEST(JudgeSpiceSpellingTest, MilIsRefusedWithItsTwoReadings) {
  // inpeval.c reads "mil" as 25.4e-6; xpressn.c's parseunit reads it as milli.
  EXPECT_EQ(Refused("10mil"),
            "'10mil' is 10 mil (254u) in ngspice's device lines but 10 milli in its .param "
            "expressions; write '254u'");
}

TEST(JudgeSpiceSpellingTest, UnitSymbolsAfterAScaleFactorAreNoted) {
  EXPECT_EQ(Noted("10uH"),
            "'10uH' is read as 10u (1e-05): SPICE ignores the unit letters 'H', and zvsmap does "
            "not check them against the parameter");
  EXPECT_EQ(Noted("5V"),
            "'5V' is read as 5: SPICE ignores the unit letters 'V', and zvsmap does not check them "
            "against the parameter");
  for (const char* text :
       {"100nF", "1fF", "10mA", "1megHz", "1MEGHZ", "1e3Hz", "2us", "1kOhm", "1H", "5W", "3J"}) {
    Noted(text);
  }
}

}  // namespace
}  // namespace zvsmap
