// Calibration of the generic output-capacitance forms from datasheet-style
// numbers (netlists/references.md section 6). The reference values are computed here by
// numerical integration of C(V), independently of the closed forms.
#include "handcalc/coss_calibration.h"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>

namespace zvsmap {
namespace {

// integral_0^V f(u) du with u = V*s^4 (clusters samples near 0, where C(V)
// is steep or, for a power law, infinite), composite Simpson in s with 20000
// intervals; the s = 0 end contributes nothing (f(u) du -> 0 there).
double Integrate(const std::function<double(double)>& f, double v) {
  const int n = 20000;
  double sum = 0;
  for (int k = 1; k <= n; ++k) {
    double s = static_cast<double>(k) / n;
    double w = k == n ? 1 : (k % 2 ? 4 : 2);
    sum += w * f(v * s * s * s * s) * 4 * v * s * s * s;
  }
  return sum / (3.0 * n);
}

// Co(tr) = Q/V and Co(er) = 2E/V^2 of a C(V) by numerical integration.
void Equivalents(const std::function<double(double)>& c, double v, double* co_tr, double* co_er) {
  *co_tr = Integrate(c, v) / v;
  *co_er = 2 * Integrate([&](double u) { return u * c(u); }, v) / (v * v);
}

class CossCalibrationTest : public ::testing::Test {};

TEST_F(CossCalibrationTest, PowerLawReproducesBothNumbersAndTheExponentFollowsTheRatio) {
  // Invented datasheet numbers of a wide-bandgap-like switch at 48 V.
  CossDatasheet data;
  data.v_rated_v = 48;
  data.co_tr_f = 452e-12;
  data.co_er_f = 298e-12;
  PowerLawFit fit;
  std::string error;
  ASSERT_TRUE(FitPowerLaw(data, &fit, &error)) << error;
  double r = 452.0 / 298.0;
  // netlists/references.md sec. 6, g = (2r-2)/(2r-1)
  EXPECT_NEAR(fit.g, (2 * r - 2) / (2 * r - 1), 1e-12);
  // Both numbers from the fitted C = K V^-g, integrated numerically: within 1 %.
  double co_tr = 0, co_er = 0;
  Equivalents([&](double u) { return fit.k * std::pow(u, -fit.g); }, 48, &co_tr, &co_er);
  EXPECT_NEAR(co_tr, data.co_tr_f, 0.01 * data.co_tr_f);  // netlists/references.md sec. 6, Co(tr) = Q/V
  // netlists/references.md sec. 6, Co(er) = 2E/V^2
  EXPECT_NEAR(co_er, data.co_er_f, 0.01 * data.co_er_f);
  ASSERT_EQ(fit.reproduced.size(), 2u);
  for (const auto& row : fit.reproduced)
    EXPECT_LT(std::fabs(row.RelativeError()), 0.01) << row.what;
}

TEST_F(CossCalibrationTest, PowerLawOfAnAbruptJunctionHasRatioThreeHalves) {
  // C = K V^-1/2: Q = 2 K V^1/2, E = (2/3) K V^3/2, so Co(tr) = 2 C(V),
  // Co(er) = (4/3) C(V), r = 1.5 and g = 0.5 (from memory, elementary integrals).
  // K = 1 nF*V^0.5 at 100 V: Q = 2e-9 * 10, E = (2/3) * 1e-9 * 1000.
  CossDatasheet data = CossDatasheet::FromCharges(100, 2e-9 * 10, (2.0 / 3) * 1e-9 * 1000);
  PowerLawFit fit;
  std::string error;
  ASSERT_TRUE(FitPowerLaw(data, &fit, &error)) << error;
  EXPECT_NEAR(fit.ratio, 1.5, 1e-12);
  EXPECT_NEAR(fit.g, 0.5, 1e-12);
  EXPECT_NEAR(fit.k, 1e-9, 1e-18);
}

TEST_F(CossCalibrationTest, JunctionFitRecoversTheFormFromThreeNumbers) {
  // An invented junction switch C0 = 4 nF, Vj = 0.7 V, m = 0.5; its datasheet
  // numbers at 48 V by numerical integration.
  auto c = [](double u) { return 4e-9 / std::sqrt(1 + u / 0.7); };
  CossDatasheet data;
  data.v_rated_v = 48;
  Equivalents(c, 48, &data.co_tr_f, &data.co_er_f);
  data.c_at_v_f = c(48);
  data.c_v_v = 48;
  JunctionFit fit;
  std::string error;
  ASSERT_TRUE(FitJunction(data, 0.33, &fit, &error)) << error;
  EXPECT_NEAR(fit.m, 0.5, 0.005);  // common practice: abrupt junction m = 0.5
  EXPECT_NEAR(fit.c0_f, 4e-9, 0.01 * 4e-9);
  EXPECT_NEAR(fit.vj_v, 0.7, 0.01 * 0.7);
  for (const auto& row : fit.reproduced)
    EXPECT_LT(std::fabs(row.RelativeError()), 0.01) << row.what;
}

TEST_F(CossCalibrationTest, JunctionFitWithFixedGradingMeetsCoTrAndCoEr) {
  // Graded junction m = 0.33 (common practice), C0 = 2 nF, Vj = 1 V, at 100 V.
  auto c = [](double u) { return 2e-9 / std::pow(1 + u, 0.33); };
  CossDatasheet data;
  data.v_rated_v = 100;
  Equivalents(c, 100, &data.co_tr_f, &data.co_er_f);
  JunctionFit fit;
  std::string error;
  ASSERT_TRUE(FitJunction(data, 0.33, &fit, &error)) << error;
  EXPECT_NEAR(fit.vj_v, 1.0, 0.01);
  EXPECT_NEAR(fit.c0_f, 2e-9, 0.01 * 2e-9);
}

TEST_F(CossCalibrationTest, RatioOutsideTheJunctionFormIsRefused) {
  // With m = 0.5 the junction form reaches 1 < r < 1.5 (its power-law limit).
  CossDatasheet data;
  data.v_rated_v = 400;
  data.co_tr_f = 600e-12;
  data.co_er_f = 100e-12;
  JunctionFit fit;
  std::string error;
  EXPECT_FALSE(FitJunction(data, 0.5, &fit, &error));
  EXPECT_EQ(error,
            "Co(tr)/Co(er) = 6 is outside what the junction form with m = 0.5 reaches (1 to "
            "1.5); give another m or a small-signal C");
  PowerLawFit power;
  data.co_tr_f = 40e-12;
  EXPECT_FALSE(FitPowerLaw(data, &power, &error));
  EXPECT_EQ(error, "Co(tr)/Co(er) = 0.4 <= 1/2: no power law has that ratio");
}

}  // namespace
}  // namespace zvsmap
