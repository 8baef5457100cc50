// Tolerances in real ngspice: the ZVS yield over Monte Carlo samples of the
// inductance against the closed-form yield, and the worst corner against the
// closed form's (netlists/references.md sec. 2 and 12).
#include <gtest/gtest.h>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <fstream>

#include "core/statistics.h"
#include "report/tolerance_report.h"
#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::SharedNgspice;
using testing_support::SourcePath;

// The demo buck of netlists/buck_halfbridge.cir: 48 V -> 12 V, 500 kHz,
// linear 1 nF per switch (Ceq = 2 nF at the switch node).
constexpr double kVin = 48, kVo = 12, kFs = 500e3, kCoss = 1e-9;

// The inductance below which the high-side turn-on reaches zero voltage, in
// closed form (netlists/references.md sec. 1 and 2; Erickson & Maksimovic 2001 ch. 2
// for the ripple; Vorperian 1988 for the resonant transition). With
// D = Vo/Vin, the current into the node at the turn-on is
//   I0(L) = dI/2 - Io = a/L - Io,  a = (Vin - Vo)·D/(2·fs),
// and ZVS needs I0 >= sqrt(Ceq·Vin·(Vin - 2·Vo)/L) = b/sqrt(L). With x = 1/sqrt(L)
// the boundary is a·x² - b·x - Io = 0, so x = (b + sqrt(b² + 4·a·Io))/(2·a) and
// L_crit = 1/x²; ZVS iff L < L_crit (I0 - b/sqrt(L) falls with L). [derived]
double CriticalInductance(double io, double coss) {
  double d = kVo / kVin;
  double a = (kVin - kVo) * d / (2 * kFs);
  double b = std::sqrt(2 * coss * kVin * (kVin - 2 * kVo));
  double x = (b + std::sqrt(b * b + 4 * a * io)) / (2 * a);
  return 1 / (x * x);
}

// The closed-form energy margin of netlists/references.md sec. 2 in the units of
// zvs_energy_margin: (1/2·L·I0² - Qoss·(Vin - 2·Vo)) / (Qoss·Vin), Qoss = Coss·Vin.
double ClosedFormMargin(double l, double io, double coss) {
  double i0 = (kVin - kVo) * (kVo / kVin) / (2 * l * kFs) - io;
  double q = coss * kVin;
  double e_avail = 0.5 * l * i0 * std::fabs(i0);
  return (e_avail - q * (kVin - 2 * kVo)) / (q * kVin);
}

// Writes a sweep file of one nominal point with a <tolerances> block,
// prepares it (the run's own expansion) and simulates every point.
struct Ran {
  PreparedSweep sweep;
  std::vector<PointResult> results;
};
Ran RunNominal(double io, double l, const std::string& block) {
  std::string dir = ::testing::TempDir() + "/tolerance_yield_" + std::to_string(::getpid());
  std::filesystem::create_directories(dir);
  std::string path = dir + "/sweep.xml";
  std::ofstream(path) << "<sweep>\n  <template file=\""
                      << SourcePath("netlists/buck_halfbridge.cir")
                      << "\"/>\n  <set param=\"Vin\" value=\"48\"/>\n"
                      << "  <set param=\"Vout\" value=\"12\"/>\n"
                      << "  <set param=\"fsw\" value=\"500k\"/>\n"
                      << "  <set param=\"L\" value=\"" << l << "\"/>\n"
                      << "  <axis param=\"Iout\" values=\"" << io << "\"/>\n"
                      << "  <simulation probe=\"off\"/>\n"
                      << block << "</sweep>\n";
  Ran ran;
  std::vector<Diagnostic> errors;
  if (!PrepareSweep(path, 0, &ran.sweep, &errors)) throw Error(errors.front().Format());
  PointEvaluator evaluator(ran.sweep);
  for (const Point& p : ran.sweep.points) {
    ran.results.push_back(evaluator.Evaluate(p, SharedNgspice()));
    ran.results.back().index = p.index;
  }
  return ran;
}

const EdgeTolerance& HighOn(const ToleranceSummary& s) {
  if (s.points.size() != 1) throw Error("expected one nominal point");
  const EdgeTolerance* t = s.points[0].Find("leg", "high_on");
  if (!t) throw Error("no leg.high_on");
  return *t;
}

// Only L varies, normally, sigma 10 % of nominal; a sample passes when its
// measured energy margin is >= 0 (pass="energy", the condition of sec. 2).
// The analytic yield is Phi((L_crit - L_nom)/sigma) (netlists/references.md sec. 12).
// 20 samples per point keep each test at a few seconds; at 99 % confidence
// the Wilson interval (E. B. Wilson, JASA 22, 1927) is then about ±0.2 wide
// around yields near 1/2, wide enough to absorb the few per cent by which the
// simulated valley current differs from the ideal-switch formula (Ron, dead
// time), and narrow enough that a yield off by 0.3 or more would fail.
void CheckYield(double io, double l_over_crit) {
  double l_crit = CriticalInductance(io, kCoss);
  double l_nom = l_crit * l_over_crit;
  double sigma = 0.1 * l_nom;
  double analytic = NormalCdf((l_crit - l_nom) / sigma);
  ASSERT_GT(analytic, 0.05);
  ASSERT_LT(analytic, 0.95);
  Ran ran =
      RunNominal(io, l_nom,
                 "  <tolerances seed=\"2027\" samples=\"20\" corners=\"none\" pass=\"energy\" "
                 "confidence=\"99%\">\n"
                 "    <vary param=\"L\" within=\"40%\" spread=\"normal\" sigma=\"10%\"/>\n"
                 "  </tolerances>\n");
  ASSERT_EQ(ran.sweep.points.size(), 21u);
  for (const PointResult& r : ran.results) {
    ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  }
  ToleranceSummary s = SummarizeTolerances(ran.sweep.spec.tolerances, ran.sweep.points, ran.results,
                                           ChooseMargin(ran.results));
  const EdgeTolerance& t = HighOn(s);
  EXPECT_EQ(t.samples, 20);
  EXPECT_LE(t.interval.low, analytic) << "yield " << t.yield << " of " << t.samples;
  EXPECT_GE(t.interval.high, analytic) << "yield " << t.yield << " of " << t.samples;
  std::printf(
      "Io %g A, L_nom %.4g uH, L_crit %.4g uH: analytic yield %.3f, simulated %d/%d = "
      "%.3f, 99%% interval [%.3f, %.3f]\n",
      io, l_nom * 1e6, l_crit * 1e6, analytic, t.passes, t.samples, t.yield, t.interval.low,
      t.interval.high);
}

TEST(ToleranceYieldReference, LightLoadBelowTheCriticalInductance) { CheckYield(2, 0.95); }
TEST(ToleranceYieldReference, MidLoadAtTheCriticalInductance) { CheckYield(4, 1.0); }
TEST(ToleranceYieldReference, HeavyLoadAboveTheCriticalInductance) { CheckYield(6, 1.05); }

// The worst corner of L ±20 % and Coss ±20 %: the closed-form margin (sec. 2)
// evaluated at the four corners names the worst one; the simulated corners
// must agree. Four simulations.
TEST(ToleranceYieldReference, WorstCornerIsTheClosedFormsWorst) {
  const double io = 4, l_nom = 1.2e-6;
  Ran ran = RunNominal(io, l_nom,
                       "  <tolerances corners=\"all\" pass=\"energy\">\n"
                       "    <vary param=\"L\" within=\"20%\" spread=\"corners\"/>\n"
                       "    <vary param=\"Coss\" within=\"20%\" spread=\"corners\"/>\n"
                       "  </tolerances>\n");
  ASSERT_EQ(ran.sweep.points.size(), 5u);
  std::string predicted;
  double least = 1e300;
  for (int l_high = 0; l_high < 2; ++l_high) {
    for (int c_high = 0; c_high < 2; ++c_high) {
      double m = ClosedFormMargin(l_nom * (l_high ? 1.2 : 0.8), io, kCoss * (c_high ? 1.2 : 0.8));
      if (m < least) {
        least = m;
        predicted = std::string(l_high ? "L+" : "L-") + (c_high ? " Coss+" : " Coss-");
      }
    }
  }
  ToleranceSummary s = SummarizeTolerances(ran.sweep.spec.tolerances, ran.sweep.points, ran.results,
                                           ChooseMargin(ran.results));
  const EdgeTolerance& t = HighOn(s);
  EXPECT_EQ(t.corners, 4);
  EXPECT_EQ(t.worst_energy_corner, predicted);
  std::printf("worst corner: closed form %s (margin %.3f), simulated %s (margin %.3f)\n",
              predicted.c_str(), least, t.worst_energy_corner.c_str(), t.worst_energy_margin);
}

}  // namespace
}  // namespace zvsmap
