#include "core/diagnostic.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace zvsmap {
namespace {

class DiagnosticTest : public ::testing::Test {};

TEST_F(DiagnosticTest, FormatsFileLineMessage) {
  // The GNU Coding Standards "Formatting Error Messages": file:line: message.
  Diagnostic d{{"sweeps/demo.xml", 12, 0}, "unknown parameter 'Lout'", {}};
  EXPECT_EQ(d.Format(), "sweeps/demo.xml:12: unknown parameter 'Lout'");
}

TEST_F(DiagnosticTest, NoLineNoNumber) {
  // GNU Coding Standards: "program: message" style when there is no line (from memory).
  Diagnostic d{{"sweeps/demo.xml", 0, 0}, "cannot read", {}};
  EXPECT_EQ(d.Format(), "sweeps/demo.xml: cannot read");
  Diagnostic bare{{}, "plain", {}};
  EXPECT_EQ(bare.Format(), "plain");
}

TEST_F(DiagnosticTest, CaretUnderTheColumn) {
  // Source line then a caret under the 1-based column (common practice, no source).
  Diagnostic d{{"a.xml", 3, 5}, "bad", "<set param=\"x\"/>"};
  EXPECT_EQ(d.Format(), "a.xml:3: bad\n  <set param=\"x\"/>\n      ^");
}

// A message and its quoted line hold the user's bytes: an escape sequence must not reach
// the terminal (ECMA-48 control functions start with ESC, 0x1b); a tab shows
// as a space. The caret stays under the column as shown.
TEST_F(DiagnosticTest, QuotedLineShowsControlBytesEscaped) {
  Diagnostic d{{"a.xml", 3, 9}, "bad 'x\x1b[2J'", "<a\x1b[2J\tb=\"x\"/>"};
  EXPECT_EQ(d.Format(), "a.xml:3: bad 'x\\x1b[2J'\n  <a\\x1b[2J b=\"x\"/>\n             ^");
}

TEST_F(DiagnosticTest, ErrorCarriesTheDiagnostic) {
  Diagnostic d{{"f", 1, 0}, "boom", {}};
  Error e(d);
  EXPECT_STREQ(e.what(), "f:1: boom");
  EXPECT_EQ(e.diagnostic().message, "boom");
}

TEST_F(DiagnosticTest, EditDistance) {
  // Levenshtein distance; kitten/sitting = 3 is the textbook example
  // (Wikipedia "Levenshtein distance", from memory).
  EXPECT_EQ(EditDistance("kitten", "sitting"), 3);
  EXPECT_EQ(EditDistance("", "abc"), 3);
  EXPECT_EQ(EditDistance("flaw", "lawn"), 2);
  EXPECT_EQ(EditDistance("Vin", "vin"), 0);  // case-insensitive by contract
}

TEST_F(DiagnosticTest, ClosestName) {
  // common practice, no source: suggest only near misses.
  std::vector<std::string> names = {"L_out", "Vin", "fsw"};
  EXPECT_EQ(ClosestName("Lout", names), "L_out");
  EXPECT_EQ(ClosestName("vin", names), "Vin");
  EXPECT_EQ(ClosestName("frequency", names), "");
}

}  // namespace
}  // namespace zvsmap
