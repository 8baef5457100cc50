// Junction-type (nonlinear) output capacitance in real ngspice: the high-side
// ZVS boundary follows the charge-based threshold, not the energy-based one
// (netlists/references.md section 2, derived; agrees with Costinett,
// Maksimovic & Zane, IEEE Trans. Power Electron. 30(2), 2015), and the
// prediction columns flag the energy-based verdict where the two differ.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <sstream>

#include "analysis/edge_finder.h"
#include "handcalc/hand_calculation.h"
#include "netlist/render.h"
#include "run/point_evaluator.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::SharedNgspice;
using testing_support::SourcePath;

// The buck template with both switches replaced by the switch library's
// zsw_junction (C0 = 4 nF, Vj = 0.7 V, m = 0.5; its documented example:
// Co(tr)(48 V) = 0.856 nF, Co(er)(48 V) = 0.632 nF) and the model told to use
// the junction form.
std::string JunctionTemplate() {
  std::ifstream in(SourcePath("netlists/buck_halfbridge.cir"));
  std::stringstream buffer;
  buffer << in.rdbuf();
  std::string s = buffer.str();
  auto replace = [&](const std::string& from, const std::string& to) {
    size_t at = s.find(from);
    if (at == std::string::npos) throw Error("template changed: no '" + from + "'");
    s.replace(at, from.size(), to);
  };
  replace("*@ model buck\n", "*@ model buck c0=c0 vj=vj mj=mj\n");
  replace(".param Coss=1n\n", ".param Coss=1n C0=4n Vj=0.7 Mj=0.5\n");
  for (const std::string& head : {std::string("xhs in gh sw"), std::string("xls sw gl 0")}) {
    size_t at = s.find(head);
    if (at == std::string::npos) throw Error("template changed: no '" + head + "'");
    size_t end = s.find('\n', at);
    std::string vds0 = head[1] == 'h' ? "{Vin}" : "0";
    s.replace(at, end - at,
              head + " zsw_junction ron_ohm={Ron} roff_ohm={Roff} c0_f={C0} vj_v={Vj} m_j={Mj}" +
                  " vf_v={Vf} vth_v={Vth} vds0_v=" + vds0);
  }
  replace("* ---- power stage ----",
          ".include " + SourcePath("netlists/switches.lib") + "\n* ---- power stage ----");
  return s;
}

class HandcalcJunctionTest : public ::testing::Test {
 protected:
  void SetUp() override {
    Diagnostic error;
    ASSERT_TRUE(ParseTemplateText(JunctionTemplate(), "buck_junction.cir", &tmpl_, &error))
        << error.Format();
    spec_.zvs.kind = ZvsCriterion::Kind::kAbsolute;
    spec_.zvs.value = 0.5;
  }
  Template tmpl_;
  SweepSpec spec_;
};

// One run with a long high-side dead time: the valley current, whether the
// node reached the rail during the dead time (its peak; the high switch's body
// diode clamps there) and the model's thresholds at the run's own simulated
// output voltage (open loop, it sits below the Vout parameter).
struct BoundaryRun {
  double i0 = NAN, peak = NAN, charge = NAN, energy = NAN;
  bool reached = false;
};

TEST_F(HandcalcJunctionTest, ChargeBasedThresholdPredictsTheBoundary) {
  std::string log;
  auto run = [&](double iout) {
    BoundaryRun out;
    Point point{0, {{"Vin", 48}, {"Vout", 12}, {"L", 1e-6}, {"Iout", iout}, {"td_lh", 150e-9}}};
    PointEvaluator evaluator(spec_, tmpl_);
    Waveforms waves;
    PointResult r = evaluator.Evaluate(point, SharedNgspice(), &waves);
    EXPECT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
    if (r.status != PointStatus::kOk) return out;
    const auto& t = waves.time();
    const auto& vsw = waves.Get("v(sw)");
    const auto& vout = waves.Get("v(out)");
    double vo = 0;
    for (double v : vout) vo += v;
    vo /= static_cast<double>(vout.size());
    for (const EdgeTiming& e : FindEdges(tmpl_.cells[0], waves, 0.02 * 2e-6)) {
      if (e.edge != "high_on") continue;
      out.peak = -1e9;
      for (size_t k = 0; k < t.size(); ++k) {
        if (t[k] >= e.t_off_s && t[k] <= e.t_on_s) out.peak = std::max(out.peak, vsw[k]);
      }
    }
    for (const auto& e : r.edges)
      if (e.edge == "high_on") out.i0 = -e.Get("i_commutated_a");
    out.reached = out.peak >= 48 - 0.05;
    Variables resolved;
    Diagnostic error;
    EXPECT_TRUE(ResolveParams(tmpl_, point.values, &resolved, &error)) << error.Format();
    resolved["vout"] = vo;
    HandCalculation calc;
    EXPECT_TRUE(ComputeHandCalculation(spec_, tmpl_, resolved, &calc, &error)) << error.Format();
    out.charge = calc.cells[0].Find("high_on_i_zvs_charge_a")->value;
    out.energy = calc.cells[0].Find("high_on_i_zvs_energy_a")->value;
    log += "Iout " + std::to_string(iout) + ": I0 " + std::to_string(out.i0) + " A, peak " +
           std::to_string(out.peak) + " V, I_zvs charge " + std::to_string(out.charge) +
           " A, energy " + std::to_string(out.energy) + " A\n";
    return out;
  };
  // More load, less reverse current: scan up until the node falls short,
  // then bisect the load between the last run that reached and that one.
  double lo = 5.0, hi = NAN;
  BoundaryRun reach, shorts;
  for (double iout = 5.0; iout <= 7.61; iout += 0.2) {
    BoundaryRun r = run(iout);
    if (r.reached) {
      lo = iout;
      reach = r;
    } else {
      hi = iout;
      shorts = r;
      break;
    }
  }
  ASSERT_TRUE(reach.reached) << log;
  ASSERT_FALSE(std::isnan(hi)) << log;
  for (int k = 0; k < 4; ++k) {
    double mid = 0.5 * (lo + hi);
    BoundaryRun r = run(mid);
    if (r.reached) {
      lo = mid;
      reach = r;
    } else {
      hi = mid;
      shorts = r;
    }
  }
  double boundary_charge = 0.5 * (reach.i0 / reach.charge + shorts.i0 / shorts.charge);
  double boundary_energy = 0.5 * (reach.i0 / reach.energy + shorts.i0 / shorts.energy);
  // netlists/references.md sec. 2: the charge Qoss sets the condition (within 5 %) ...
  EXPECT_NEAR(boundary_charge, 1.0, 0.05) << log;
  // ... and 2*Eoss does not: the simulated boundary lies measurably above it.
  EXPECT_GT(boundary_energy, 1.10) << log;
}

// Between the two thresholds the charge-based verdict (no ZVS) agrees with
// the simulated class and the energy-based one (ZVS) is flagged. The model's
// own valley current Io - dI/2 = 7.7 - 9 = -1.3 A (netlists/references.md sec. 1)
// lies between the energy-based (~1.21 A) and charge-based (~1.40 A)
// thresholds; the simulated one is smaller still (open-loop droop).
TEST_F(HandcalcJunctionTest, EnergyBasedVerdictIsFlaggedBetweenTheThresholds) {
  Point point{0, {{"Vin", 48}, {"Vout", 12}, {"L", 1e-6}, {"Iout", 7.7}, {"td_lh", 80e-9}}};
  PointEvaluator evaluator(spec_, tmpl_);
  PointResult r = evaluator.Evaluate(point, SharedNgspice());
  ASSERT_EQ(r.status, PointStatus::kOk) << r.reason << "\n" << r.log;
  const EdgeMeasurement* high = nullptr;
  for (const auto& e : r.edges)
    if (e.edge == "high_on") high = &e;
  ASSERT_NE(high, nullptr);
  EXPECT_NEAR(high->Get("i_commutated_a__pred"), -1.3, 1e-9);
  EXPECT_NE(high->zvs, ZvsClass::kFull);
  EXPECT_EQ(high->Get("zvs_full__pred"), 0.0);
  EXPECT_EQ(high->Get("zvs_full__pred__beyond_tol"), 0.0);
  EXPECT_EQ(high->Get("zvs_full__pred_energy"), 1.0);
  EXPECT_EQ(high->Get("zvs_full__pred_energy__beyond_tol"), 1.0);
}

}  // namespace
}  // namespace zvsmap
