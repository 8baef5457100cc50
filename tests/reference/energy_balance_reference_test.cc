// Energy balance over the settled period: energy in from the supply = energy
// into the load + energy dissipated (switch channels, body diodes) + change of
// stored energy (inductor, output capacitor, switch capacitances), which is ~0
// when the period is truly settled. Conservation of energy, in circuit form
// Tellegen's theorem (sum over all branches of v*i = 0): Penfield, Spence &
// Duinker, "Tellegen's Theorem and Electrical Networks", MIT Press 1970 (from
// memory). Netlist: tests/reference/data/buck_energy_case.cir (the reference
// buck with a sense source on every power branch; invented values).
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <functional>
#include <string>
#include <vector>

#include "netlist/render.h"
#include "netlist/template.h"
#include "run/point_evaluator.h"
#include "sim/steady_state.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::SharedNgspice;
using testing_support::SourcePath;

constexpr double kPeriod = 2e-6;

// Integral over [t0, t1] of f(k) sampled at the simulator's time points
// (trapezoids; the end points interpolated linearly).
double Integrate(const std::vector<double>& t, const std::function<double(double)>& at,
                 const std::function<double(size_t)>& f, double t0, double t1) {
  double sum = 0, tp = t0, fp = at(t0);
  for (size_t k = 0; k < t.size(); ++k) {
    if (t[k] <= t0 || t[k] >= t1) continue;
    double fk = f(k);
    sum += 0.5 * (fk + fp) * (t[k] - tp);
    tp = t[k];
    fp = fk;
  }
  return sum + 0.5 * (at(t1) + fp) * (t1 - tp);
}

struct Balance {
  double in = 0, out = 0, channel = 0, diode = 0, stored = 0, residual = 0;
};

// Settles the point with zvsmap, re-runs the settled state over two periods
// saving every branch current, and balances the second period.
Balance BalanceAt(const std::vector<ParamValue>& values, std::string* log) {
  Template tmpl;
  Diagnostic error;
  if (!LoadTemplate(SourcePath("tests/reference/data/buck_energy_case.cir"), &tmpl, &error)) {
    throw Error(error.Format());
  }
  SweepSpec spec;
  spec.simulation.max_step_s = 0.5e-9;
  PointEvaluator evaluator(spec, tmpl);
  Waveforms settled;
  PointResult r = evaluator.Evaluate(Point{0, values}, SharedNgspice(), &settled);
  if (r.status != PointStatus::kOk) throw Error(r.reason + "\n" + r.log);

  std::vector<ParamValue> at_state = values;
  for (const auto& [name, v] : r.settle.initial_state) at_state.push_back({name, v});
  Variables resolved;
  if (!ResolveParams(tmpl, at_state, &resolved, &error)) throw Error(error.Format());
  TranSettings tran = evaluator.TranFor(resolved, kPeriod);
  tran.tstart_s = 0;
  tran.tstop_s = (2 + kPeriodOverrun) * kPeriod;
  std::vector<std::string> vectors = VectorsToSave(tmpl);
  for (const char* extra : {"i(vsupply)", "i(v.xhs.vcap)", "i(v.xls.vcap)", "i(v.xhs.vdio)",
                            "i(v.xls.vdio)"}) {
    vectors.push_back(extra);
  }
  SimulationOutput o =
      SharedNgspice().Run(RenderNetlist(tmpl, resolved, tran, vectors), vectors, tran.tstop_s);
  if (!o.ok) throw Error(o.error);
  const Waveforms& w = o.waves;
  const auto& t = w.time();
  // The re-run is the measured run: same state, same settings.
  EXPECT_NEAR(w.At("v(sw)", 1.2 * kPeriod), settled.At("v(sw)", 1.2 * kPeriod), 1e-3);

  const double t0 = kPeriod, t1 = 2 * kPeriod;
  const double rload = resolved.at("rload"), l = resolved.at("l"), cout = resolved.at("cout");
  auto integral = [&](const std::function<double(size_t)>& f_at_index,
                      const std::function<double(double)>& f_at_time) {
    return Integrate(t, f_at_time, f_at_index, t0, t1);
  };
  auto v = [&](const std::string& n, size_t k) { return w.Get(n)[k]; };
  auto vt = [&](const std::string& n, double tt) { return w.At(n, tt); };
  // v_ds of each switch: high = in - sw, low = sw.
  auto vds_hs = [&](size_t k) { return v("v(in)", k) - v("v(sw)", k); };
  auto vds_hs_t = [&](double tt) { return vt("v(in)", tt) - vt("v(sw)", tt); };

  Balance b;
  // Supply: its branch current flows + -> -, so it delivers -i(vsupply).
  b.in = integral([&](size_t k) { return -v("v(in)", k) * v("i(vsupply)", k); },
                  [&](double tt) { return -vt("v(in)", tt) * vt("i(vsupply)", tt); });
  b.out = integral(
      [&](size_t k) { return v("v(out)", k) * v("v(out)", k) / rload; },
      [&](double tt) { return vt("v(out)", tt) * vt("v(out)", tt) / rload; });
  b.channel =
      integral([&](size_t k) { return vds_hs(k) * v("i(v.xhs.vch)", k); },
               [&](double tt) { return vds_hs_t(tt) * vt("i(v.xhs.vch)", tt); }) +
      integral([&](size_t k) { return v("v(sw)", k) * v("i(v.xls.vch)", k); },
               [&](double tt) { return vt("v(sw)", tt) * vt("i(v.xls.vch)", tt); });
  // Body diode: forward voltage source -> drain = -v_ds.
  b.diode =
      integral([&](size_t k) { return -vds_hs(k) * v("i(v.xhs.vdio)", k); },
               [&](double tt) { return -vds_hs_t(tt) * vt("i(v.xhs.vdio)", tt); }) +
      integral([&](size_t k) { return -v("v(sw)", k) * v("i(v.xls.vdio)", k); },
               [&](double tt) { return -vt("v(sw)", tt) * vt("i(v.xls.vdio)", tt); });
  double e_cap =
      integral([&](size_t k) { return vds_hs(k) * v("i(v.xhs.vcap)", k); },
               [&](double tt) { return vds_hs_t(tt) * vt("i(v.xhs.vcap)", tt); }) +
      integral([&](size_t k) { return v("v(sw)", k) * v("i(v.xls.vcap)", k); },
               [&](double tt) { return vt("v(sw)", tt) * vt("i(v.xls.vcap)", tt); });
  double il0 = w.At("i(l1)", t0), il1 = w.At("i(l1)", t1);
  double vc0 = w.At("v(out)", t0), vc1 = w.At("v(out)", t1);
  b.stored = e_cap + 0.5 * l * (il1 * il1 - il0 * il0) + 0.5 * cout * (vc1 * vc1 - vc0 * vc0);
  b.residual = b.in - b.out - b.channel - b.diode - b.stored;
  char line[320];
  std::snprintf(line, sizeof line,
                "settled by %s in %.3g periods; per period: in %.4f uJ, out %.4f uJ, channels %.4f uJ, "
                "diodes %.4f uJ, stored change %.5f uJ (capacitances %.5f uJ); residual %.5f uJ "
                "= %.4f %% of in, %.3f %% of the losses\n",
                SettleMethodName(r.settle.method), r.settle.periods, b.in * 1e6, b.out * 1e6,
                b.channel * 1e6, b.diode * 1e6, b.stored * 1e6, e_cap * 1e6, b.residual * 1e6,
                100 * b.residual / b.in, 100 * b.residual / (b.channel + b.diode));
  *log += line;
  return b;
}

// Two settled points: soft-switched (4 A, negative valley current) and
// hard-switched high-side turn-on (8 A) with lossy 30 mOhm channels and a
// junction-type capacitance. Residual within 2 % of the input energy (issue 3
// acceptance figure) and, stricter, within 2 % of the dissipated energy. The
// stored energy returns to its start value within 1 % of the input: the
// settling tolerance allows the output capacitor 1 mV (22 uF * 12 V * 1 mV =
// 0.26 uJ, ~0.3 % of the input at 4 A).
TEST(EnergyBalanceReferenceTest, InputEqualsOutputPlusLossesOverTheSettledPeriod) {
  for (double iout : {4.0, 8.0}) {
    std::string log;
    Balance b = BalanceAt({{"Iout", iout}, {"Ron", 0.03}, {"c0", 4e-9}, {"mj", 0.5}}, &log);
    std::printf("[ energy   ] Iout %.0f A: %s", iout, log.c_str());
    ASSERT_GT(b.in, 0) << log;
    EXPECT_LE(std::fabs(b.residual), 0.02 * b.in) << log;
    EXPECT_LE(std::fabs(b.residual), 0.02 * (b.channel + b.diode)) << log;
    EXPECT_LE(std::fabs(b.stored), 0.01 * b.in) << log;
    EXPECT_GT(b.channel + b.diode, 0.01 * b.in) << log;  // losses large enough to matter
  }
}

}  // namespace
}  // namespace zvsmap
