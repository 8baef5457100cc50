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

// ---- Tolerance on a switch model parameter: the output capacitance ----
//
// The generic linear switch zsw_linear (netlists/switches.lib) as a <device>
// on both switches, its coss_f varied normally (sigma 10 % of nominal); one
// draw per sample is taken by both switches, so Ceq = 2·coss_f. A sample
// passes when its edge is full ZVS at the set dead time (pass="class"), which
// zvsmap measures from the waveform: the energy margin would not do, as it
// takes the capacitance from the template's `coss=` annotation, not from a
// <device> (README "Switch models").
//
// The closed form: the resonant transition of netlists/references.md sec. 2
// (Vorperian, "Quasi-square-wave converters", IEEE Trans. Power Electron.
// 3(2), 1988), from the current into the node I0 at the start of the
// transition and the output voltage Vo:
//   v(t) = Vo·(1 - cos wt) + I0·Z·sin wt,  i(t) = I0·cos wt + (Vo/Z)·sin wt,
//   Z = sqrt(L/Ceq), w = 1/sqrt(L·Ceq);
// when v reaches the rail at t1 the incoming switch's body diode clamps it
// and i falls at (Vin - Vo)/L to zero at t2 = t1 + L·i(t1)/(Vin - Vo) (sec.
// 2, dead-time window); after t2 the node rings back, v = Vo + (Vin - Vo)·cos
// w(t - t2). The edge is full when Vin - v(td) <= the residual limit.
// [derived from sec. 2]
//
// I0 is taken from a simulation (i_commutated_a) rather than from the ideal
// ripple formula: with a dead time this long the regulated duty cycle and
// with it the valley current move with the capacitance (0.3 to 1 nF moves I0
// from 1.07 to 0.79 A here), which the ideal formula does not see. With the
// simulated I0 the closed form gives the simulated turn-on voltage to within
// 0.5 V over 0.3 to 2 nF (checked by hand on a Coss sweep of this circuit,
// 2 December 2026). So the threshold capacitance is found as a fixed point:
// simulate at a capacitance, take its I0, solve the closed form for the
// threshold, simulate there, and so on.

struct Transition {
  double vin, vo, l, i0, td, limit;
};

double NodeAtTurnOn(const Transition& x, double coss) {
  double ceq = 2 * coss, z = std::sqrt(x.l / ceq), w = 1 / std::sqrt(x.l * ceq);
  auto v = [&](double t) { return x.vo * (1 - std::cos(w * t)) + x.i0 * z * std::sin(w * t); };
  auto i = [&](double t) { return x.i0 * std::cos(w * t) + (x.vo / z) * std::sin(w * t); };
  double peak = x.vo + std::hypot(x.vo, x.i0 * z);
  if (peak < x.vin) return v(x.td);
  double lo = 0, hi = (3.14159265358979323846 - std::atan2(x.i0 * z, x.vo)) / w;  // the peak
  for (int k = 0; k < 200; ++k) {
    double mid = (lo + hi) / 2;
    (v(mid) < x.vin ? lo : hi) = mid;
  }
  double t1 = hi;
  if (x.td <= t1) return v(x.td);
  double t2 = t1 + x.l * i(t1) / (x.vin - x.vo);
  if (x.td <= t2) return x.vin;
  return x.vo + (x.vin - x.vo) * std::cos(w * (x.td - t2));
}

bool ClosedFormFull(const Transition& x, double coss) {
  return x.vin - NodeAtTurnOn(x, coss) <= x.limit;
}

// Scanning up from `from` in 1 % steps, the first capacitance at which the
// closed form changes from `before` to !before (bisected); NaN if none below 50·from.
double ClosedFormChange(const Transition& x, double from, bool before) {
  double lo = from;
  while (!(ClosedFormFull(x, lo) == before && ClosedFormFull(x, lo * 1.01) != before)) {
    lo *= 1.01;
    if (lo > 50 * from) return std::nan("");
  }
  double hi = lo * 1.01;
  for (int k = 0; k < 100; ++k) {
    double mid = (lo + hi) / 2;
    (ClosedFormFull(x, mid) == before ? lo : hi) = mid;
  }
  return lo;
}

// 48 V -> 12 V at 500 kHz as above, L = 1.75 uH, Io = 4 A and a dead time of
// 90 ns before the high-side turn-on: full ZVS then holds between two
// capacitances, about 0.34 nF (below, the node rings back before the turn-on)
// and 0.76 nF (above, the transition is too slow or falls short).
constexpr double kDeviceL = 1.75e-6, kDeviceIo = 4, kDeviceTd = 90e-9;

Ran RunDevice(double coss, const std::string& block) {
  char c[32];
  std::snprintf(c, sizeof c, "%.6g", coss);
  std::string device = std::string("  <device name=\"lin\" model=\"zsw_linear\" params=\"coss_f=") +
                       c + "\"/>\n  <axis device=\"leg.high leg.low\" values=\"lin\"/>\n" +
                       "  <set param=\"td_lh\" value=\"90n\"/>\n";
  return RunNominal(kDeviceIo, kDeviceL, device + block);
}

// The transition of the nominal point of `ran` (its first result).
Transition MeasuredTransition(const Ran& ran) {
  const PointResult& r = ran.results.at(0);
  if (r.status != PointStatus::kOk) throw Error("nominal point failed: " + r.reason);
  const EdgeMeasurement* e = nullptr;
  for (const EdgeMeasurement& m : r.edges) {
    if (m.cell == "leg" && m.edge == "high_on") e = &m;
  }
  if (!e) throw Error("no leg.high_on at the nominal point");
  // i_commutated_a is the current out of the node at t_off (README, edges.csv
  // columns): into the node it is -i.
  double vo = r.operating.regulated_avg;  // the average of v(out), the regulated vector
  return {e->Get("rail_v"), std::isfinite(vo) ? vo : kVo, kDeviceL, -e->Get("i_commutated_a"),
          kDeviceTd,        e->Get("v_residual_limit_v")};
}

// The upper threshold capacitance as a fixed point (three simulations).
double UpperThreshold() {
  double c = 0.75e-9;
  for (int k = 0; k < 3; ++k) {
    Transition x = MeasuredTransition(RunDevice(c, ""));
    double lower = ClosedFormChange(x, 0.15e-9, false);
    c = ClosedFormChange(x, lower, true);
    if (!std::isfinite(c)) throw Error("no upper threshold");
  }
  return c;
}

// `ratio` = threshold / nominal capacitance: 1.05 puts the nominal half a
// sigma below the upper threshold (yield about Phi(0.5)), 0.95 half a sigma
// above. The analytic yield is P(lower < coss < upper) for coss ~ N(nominal,
// 10 %), the lower threshold from the closed form with the nominal point's I0
// (it lies 4 sigma or more below, so it adds under 1e-4). At 99 % the Wilson
// interval (E. B. Wilson, JASA 22, 1927) of 20 samples is about ±0.2 wide near 1/2.
void CheckDeviceYield(double ratio, const std::string& seed) {
  double upper = UpperThreshold();
  double c_nom = upper / ratio, sigma = 0.1 * c_nom;
  Ran ran = RunDevice(
      c_nom, "  <tolerances seed=\"" + seed +
                 "\" samples=\"20\" corners=\"none\" pass=\"class\" "
                 "confidence=\"99%\">\n"
                 "    <vary device=\"lin\" param=\"coss_f\" within=\"40%\" spread=\"normal\" "
                 "sigma=\"10%\"/>\n"
                 "  </tolerances>\n");
  ASSERT_EQ(ran.sweep.points.size(), 21u);
  for (const PointResult& r : ran.results) {
    ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  }
  // The samples' capacitances are drawn around the nominal as specified.
  ASSERT_EQ(ran.sweep.points[1].device_params.size(), 1u);
  EXPECT_NEAR(ran.sweep.points[1].device_params[0].value, c_nom, 0.4 * c_nom);
  Transition at_nominal = MeasuredTransition(ran);
  double lower = ClosedFormChange(at_nominal, 0.15e-9, false);
  ASSERT_LT(lower, c_nom - 4 * sigma);
  double analytic = NormalCdf((upper - c_nom) / sigma) - NormalCdf((lower - c_nom) / sigma);
  ASSERT_GT(analytic, 0.05);
  ASSERT_LT(analytic, 0.95);
  ToleranceSummary s = SummarizeTolerances(ran.sweep.spec.tolerances, ran.sweep.points, ran.results,
                                           ChooseMargin(ran.results));
  const EdgeTolerance& t = HighOn(s);
  // Sample by sample, away from the threshold (2 %), the class is the closed form's.
  for (size_t k = 1; k < ran.results.size(); ++k) {
    double c = ran.sweep.points[k].device_params.at(0).value;
    if (std::fabs(c - upper) < 0.02 * upper) continue;
    for (const EdgeMeasurement& m : ran.results[k].edges) {
      if (m.cell != "leg" || m.edge != "high_on") continue;
      EXPECT_EQ(m.zvs == ZvsClass::kFull, c > lower && c < upper)
          << "sample " << k << ": coss_f " << c << ", v_turn_on " << m.Get("v_turn_on_v");
    }
  }
  EXPECT_EQ(t.samples, 20);
  EXPECT_LE(t.interval.low, analytic) << "yield " << t.yield << " of " << t.samples;
  EXPECT_GE(t.interval.high, analytic) << "yield " << t.yield << " of " << t.samples;
  std::printf(
      "coss_f: I0 %.3f A, Vo %.3f V, full from %.4g to %.4g nF, nominal %.4g nF: analytic yield "
      "%.3f, simulated %d/%d = %.3f, 99%% interval [%.3f, %.3f]\n",
      at_nominal.i0, at_nominal.vo, lower * 1e9, upper * 1e9, c_nom * 1e9, analytic, t.passes,
      t.samples, t.yield, t.interval.low, t.interval.high);
}

TEST(ToleranceYieldReference, SwitchCapacitanceBelowTheThreshold) {
  CheckDeviceYield(1.05, "2028");
}
TEST(ToleranceYieldReference, SwitchCapacitanceAboveTheThreshold) {
  CheckDeviceYield(0.95, "2029");
}

}  // namespace
}  // namespace zvsmap
