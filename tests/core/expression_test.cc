#include "core/expression.h"

#include <gtest/gtest.h>

#include <cmath>

namespace zvsmap {
namespace {

class ExpressionTest : public ::testing::Test {
 protected:
  // Evaluates and expects success.
  double Eval(const std::string& expr, const Variables& vars = {}) {
    double value = 0;
    std::string message;
    int column = -1;
    EXPECT_TRUE(EvaluateExpression(expr, vars, &value, &message, &column))
        << expr << ": " << message;
    return value;
  }
  // Evaluates and expects failure; returns the message, sets column_.
  std::string Error(const std::string& expr, const Variables& vars = {}) {
    double value = 0;
    std::string message;
    column_ = -1;
    EXPECT_FALSE(EvaluateExpression(expr, vars, &value, &message, &column_)) << expr;
    return message;
  }
  int column_ = -1;
};

TEST_F(ExpressionTest, Arithmetic) {
  // Ordinary operator precedence (from memory).
  EXPECT_DOUBLE_EQ(Eval("1 + 2*3"), 7.0);
  EXPECT_DOUBLE_EQ(Eval("(1 + 2)*3"), 9.0);
  EXPECT_DOUBLE_EQ(Eval("2^10"), 1024.0);
  EXPECT_DOUBLE_EQ(Eval("sqrt(16)"), 4.0);
  EXPECT_DOUBLE_EQ(Eval("2*_pi"), 2 * M_PI);  // full double precision, not 13 digits
}

TEST_F(ExpressionTest, DoubleStarIsPowerAsInSpice) {
  // ngspice manual, expression syntax: ** is exponentiation (from memory).
  EXPECT_DOUBLE_EQ(Eval("2**3"), 8.0);
  EXPECT_DOUBLE_EQ(Eval("3 ** 2 + 1"), 10.0);
}

TEST_F(ExpressionTest, SuffixLiterals) {
  // ngspice manual scale factors (from memory).
  EXPECT_DOUBLE_EQ(Eval("2.2u*2"), 4.4e-6);
  EXPECT_DOUBLE_EQ(Eval("1meg + 1m"), 1e6 + 1e-3);
  EXPECT_DOUBLE_EQ(Eval("500k"), 500e3);
  EXPECT_DOUBLE_EQ(Eval("1/(2*_pi*sqrt(1u*1n))"), 1 / (2 * M_PI * std::sqrt(1e-6 * 1e-9)));
  EXPECT_DOUBLE_EQ(Eval("1e3k"), 1e6);
}

TEST_F(ExpressionTest, NormalizeKeepsIdentifiersWithDigits) {
  // Names such as C1u or R2k are identifiers, not numbers (common practice).
  EXPECT_EQ(NormalizeSpiceExpression("C1u*2"), "C1u*2");
  EXPECT_EQ(NormalizeSpiceExpression("2.2u"), "2.2e-06");
  EXPECT_EQ(NormalizeSpiceExpression("a**2"), "a^2");
}

TEST_F(ExpressionTest, Variables) {
  // Buck duty cycle D = Vo/Vin: Erickson & Maksimovic 2001, ch. 2.
  EXPECT_DOUBLE_EQ(Eval("Vout/Vin", {{"Vout", 12}, {"Vin", 48}}), 0.25);
  // Buck ripple dI = (Vin - Vo)*D/(L*fs); check case of netlists/references.md section 8:
  // 48 V -> 12 V, 500 kHz, 1 uH gives 18 A (Erickson & Maksimovic 2001, ch. 2).
  EXPECT_NEAR(Eval("(Vin - Vout)*(Vout/Vin)/(L*fsw)",
                   {{"Vin", 48}, {"Vout", 12}, {"L", 1e-6}, {"fsw", 500e3}}),
              18.0, 1e-9);
}

TEST_F(ExpressionTest, UnknownVariable) {
  // muParser reports the unknown token at 0-based position 4; we give 1-based columns.
  EXPECT_EQ(Error("2 * Vinn", {{"Vin", 48}}), "unknown name 'Vinn'");
  EXPECT_EQ(column_, 5);
}

TEST_F(ExpressionTest, DivisionByZero) {
  // IEEE 754: 1/0 is infinite, 0/0 is NaN; both are refused.
  EXPECT_EQ(Error("1/x", {{"x", 0}}),
            "expression does not give a finite number (division by zero?)");
  EXPECT_EQ(Error("x/x", {{"x", 0}}),
            "expression does not give a finite number (division by zero?)");
  EXPECT_EQ(Error("sqrt(-1)"), "expression does not give a finite number (division by zero?)");
}

TEST_F(ExpressionTest, SyntaxErrorsCarryAColumn) {
  // muParser 2.3 texts without its 0-based "at position N"; the column is
  // 1-based and an unexpected end points just past the last character.
  EXPECT_EQ(Error("1 +"), "Unexpected end of expression");
  EXPECT_EQ(column_, 4);
  EXPECT_EQ(Error("3 4"), "Unexpected value \"4\" found");
  EXPECT_EQ(column_, 3);
}

TEST_F(ExpressionTest, ColumnsAfterTheTextWasRewritten) {
  // After "**" or suffix rewriting, muParser's positions no longer match the
  // user's text: an unknown name is found again by searching for it, other
  // errors get no column.
  EXPECT_EQ(Error("2u * Vinn"), "unknown name 'Vinn'");
  EXPECT_EQ(column_, 6);
  EXPECT_EQ(Error("2**"), "Unexpected end of expression");
  EXPECT_EQ(column_, 0);
}

}  // namespace
}  // namespace zvsmap
