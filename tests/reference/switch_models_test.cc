// The generic switch library and the user's own models in real ngspice:
// characterisation against the closed forms of netlists/references.md section 6, a
// user subcircuit with another pin order against the generic model, and body-
// diode reverse recovery in the hard turn-on energy.
#include <gtest/gtest.h>

#include <cmath>

#include "run/point_evaluator.h"
#include "run/sweep_setup.h"
#include "run/switch_characterization.h"
#include "testing/shared_ngspice.h"

namespace zvsmap {
namespace {

using testing_support::EdgeOf;
using testing_support::SharedNgspice;
using testing_support::SourcePath;

class SwitchModelsTest : public ::testing::Test {
 protected:
  static ResolvedDevice Generic(const std::string& model, const std::string& params) {
    DeviceSpec spec;
    spec.name = model;
    spec.generic = true;
    spec.subckt = model;
    spec.params = params;
    ResolvedDevice device;
    Diagnostic error;
    EXPECT_TRUE(ResolveDevice(spec, &device, &error)) << error.Format();
    return device;
  }
  // Every point of a sweep file, evaluated in this process's ngspice.
  static std::vector<PointResult> RunSweep(const std::string& relative, PreparedSweep* sweep) {
    std::vector<Diagnostic> errors;
    EXPECT_TRUE(PrepareSweep(SourcePath(relative), 0, sweep, &errors))
        << (errors.empty() ? "" : errors[0].Format());
    PointEvaluator evaluator(sweep->spec, sweep->tmpl);
    std::vector<PointResult> out;
    for (const Point& p : sweep->points) out.push_back(evaluator.Evaluate(p, SharedNgspice()));
    return out;
  }
};

// Junction form C0/(1 + V/Vj)^m with x = V/Vj:
//   Q(V) = C0 Vj/(1 - m) [(1 + x)^(1 - m) - 1]
//   E(V) = C0 Vj^2 [((1 + x)^(2 - m) - 1)/(2 - m) - ((1 + x)^(1 - m) - 1)/(1 - m)]
// netlists/references.md section 6 (derived from the textbook junction capacitance).
double JunctionQ(double c0, double vj, double m, double v) {
  double x = v / vj;
  return c0 * vj / (1 - m) * (std::pow(1 + x, 1 - m) - 1);
}
double JunctionE(double c0, double vj, double m, double v) {
  double x = v / vj;
  return c0 * vj * vj *
         ((std::pow(1 + x, 2 - m) - 1) / (2 - m) - (std::pow(1 + x, 1 - m) - 1) / (1 - m));
}

TEST_F(SwitchModelsTest, JunctionChargeAndEnergyMatchTheClosedForms) {
  struct Case {
    double c0, vj, m, v_max;
  } cases[] = {{4e-9, 0.7, 0.5, 48},     // abrupt (m = 0.5), common practice
               {1e-9, 1.0, 0.33, 400}};  // graded (m = 0.33), common practice
  for (const Case& c : cases) {
    char params[120];
    std::snprintf(params, sizeof params, "c0_f=%g vj_v=%g m_j=%g", c.c0, c.vj, c.m);
    ResolvedDevice device = Generic("zsw_junction", params);
    CharacterizeOptions options;
    options.v_max_v = c.v_max;
    options.table_rows = 4;
    options.reverse_rows = 2;
    Characterization table;
    std::string error;
    ASSERT_TRUE(CharacterizeSwitch(SharedNgspice(), device, options, &table, &error)) << error;
    ASSERT_EQ(table.coss.size(), 4u);
    for (const CossRow& row : table.coss) {
      double q = JunctionQ(c.c0, c.vj, c.m, row.v_v), e = JunctionE(c.c0, c.vj, c.m, row.v_v);
      EXPECT_NEAR(row.q_c, q, 0.01 * q)
          << params << " at " << row.v_v << " V";  // netlists/references.md sec. 6
      EXPECT_NEAR(row.e_j, e, 0.01 * e)
          << params << " at " << row.v_v << " V";  // netlists/references.md sec. 6
      double cv = c.c0 / std::pow(1 + row.v_v / c.vj, c.m);
      EXPECT_NEAR(row.c_f, cv, 0.01 * cv)
          << params << " at " << row.v_v << " V";  // the form itself
      // Datasheet conventions Co(tr) = Q/V, Co(er) = 2E/V^2 (netlists/references.md sec. 6).
      EXPECT_NEAR(row.co_tr_f, q / row.v_v, 0.01 * q / row.v_v);
      EXPECT_NEAR(row.co_er_f, 2 * e / (row.v_v * row.v_v), 0.01 * 2 * e / (row.v_v * row.v_v));
    }
  }
}

// zsw_vdmos (netlists/switches.lib): with the gate at the source, Coss is the
// reverse diode's junction capacitance (closed forms above, netlists/references.md
// sec. 6) plus ngspice's VDMOS gate-drain capacitance
//   Cgd(V) = y - s*atan(a*V),  s = (Cmax - Cmin)/(1 + pi/2),  y = Cmax - s
// (ngspice 39 source, devsup.c DevCapVDMOS, vgd = -V), integrated in closed form:
//   Qgd(V) = y*V - s*(V*atan(a*V) - ln(1 + (a*V)^2)/(2a))
//   Egd(V) = y*V^2/2 - s*(((a*V)^2 + 1)*atan(a*V) - a*V)/(2a^2)   [derived].
double MillerQ(double cmax, double cmin, double a, double v) {
  double s = (cmax - cmin) / (1 + M_PI / 2), y = cmax - s;
  return y * v - s * (v * std::atan(a * v) - std::log(1 + a * a * v * v) / (2 * a));
}
double MillerE(double cmax, double cmin, double a, double v) {
  double s = (cmax - cmin) / (1 + M_PI / 2), y = cmax - s;
  return y * v * v / 2 - s * ((a * a * v * v + 1) * std::atan(a * v) - a * v) / (2 * a * a);
}

TEST_F(SwitchModelsTest, VdmosSwitchChargeAndEnergyMatchJunctionPlusMillerClosedForms) {
  // The library defaults of zsw_vdmos (invented): c0 3 nF, vj 0.8 V, m 0.5;
  // Cgd 1 nF .. 40 pF, a 0.3 /V.
  const double c0 = 3e-9, vj = 0.8, m = 0.5, cmax = 1e-9, cmin = 40e-12, a = 0.3;
  ResolvedDevice device = Generic("zsw_vdmos", "");
  CharacterizeOptions options;
  options.v_max_v = 100;
  options.table_rows = 5;
  options.reverse_rows = 2;
  Characterization table;
  std::string error;
  ASSERT_TRUE(CharacterizeSwitch(SharedNgspice(), device, options, &table, &error)) << error;
  ASSERT_EQ(table.coss.size(), 5u);
  for (const CossRow& row : table.coss) {
    double v = row.v_v;
    double q = JunctionQ(c0, vj, m, v) + MillerQ(cmax, cmin, a, v);
    double e = JunctionE(c0, vj, m, v) + MillerE(cmax, cmin, a, v);
    EXPECT_NEAR(row.q_c, q, 0.01 * q) << "Qoss at " << v << " V";  // closed forms above
    EXPECT_NEAR(row.e_j, e, 0.01 * e) << "Eoss at " << v << " V";  // closed forms above
    if (v < options.v_max_v) {
      // Small-signal Coss; at the ramp's turning point the up/down difference
      // is not defined, so the last row is not compared.
      double c = c0 / std::pow(1 + v / vj, m) + (cmax - (cmax - cmin) / (1 + M_PI / 2)) -
                 (cmax - cmin) / (1 + M_PI / 2) * std::atan(a * v);
      EXPECT_NEAR(row.c_f, c, 0.02 * c) << "Coss at " << v << " V";
    }
  }
}

// sweeps/demo_buck_gatedrive.xml: zsw_vdmos driven through a gate
// resistance. Every point runs at the default settings, and the soft low-side
// transition (the node swung by the inductor current during the dead time
// while the outgoing gate discharges through Rg) takes longer with the larger
// Rg: the turn-off of the outgoing switch is an RC discharge of its gate
// through Rg, so a larger Rg leaves its channel conducting longer (common
// practice).
TEST_F(SwitchModelsTest, GateDriveDemoRunsEveryPointAndRgSlowsTheSoftEdge) {
  PreparedSweep sweep;
  std::vector<PointResult> r = RunSweep("sweeps/demo_buck_gatedrive.xml", &sweep);
  ASSERT_EQ(r.size(), 4u);
  for (const PointResult& p : r) ASSERT_EQ(p.status, PointStatus::kOk) << p.reason;
  // Points: (Rg, Iout) = (1, 0), (1, 8), (4.7, 0), (4.7, 8).
  double fast = EdgeOf(r[1], "low_on").Get("t_transition_s");
  double slow = EdgeOf(r[3], "low_on").Get("t_transition_s");
  EXPECT_GT(fast, 0);
  EXPECT_GT(slow, 1.5 * fast);
}

TEST_F(SwitchModelsTest, SubcircuitWithoutChannelProbeIsWrappedAndMeasured) {
  // tests/netlist/fixtures/reordered_switch.lib plain_sw: 1 nF linear, 1 Meg leakage.
  // Linear capacitor: Q = C V, E = C V^2 / 2 (textbook); the leakage must cancel.
  DeviceSpec spec;
  spec.name = "plain";
  spec.file = SourcePath("tests/netlist/fixtures/reordered_switch.lib");
  spec.subckt = "PLAIN_SW";
  spec.positional = true;
  spec.pins = {{"", "d"}, {"", "s"}, {"", "g"}};
  ResolvedDevice device;
  Diagnostic error;
  ASSERT_TRUE(ResolveDevice(spec, &device, &error)) << error.Format();
  EXPECT_FALSE(device.subckt.has_vch);
  CharacterizeOptions options;
  options.v_max_v = 100;
  options.table_rows = 2;
  options.reverse_rows = 1;
  options.i_reverse_max_a = 1e-6;
  Characterization table;
  std::string why;
  ASSERT_TRUE(CharacterizeSwitch(SharedNgspice(), device, options, &table, &why)) << why;
  for (const CossRow& row : table.coss) {
    EXPECT_NEAR(row.q_c, 1e-9 * row.v_v, 0.01 * 1e-9 * row.v_v);
    EXPECT_NEAR(row.e_j, 0.5e-9 * row.v_v * row.v_v, 0.01 * 0.5e-9 * row.v_v * row.v_v);
  }
}

TEST_F(SwitchModelsTest, BodyDiodeCurveFollowsTheDiodeEquation) {
  // Forward drop of a junction diode: V = vf + n Vt ln(I / 1 A) + I rs with the
  // library's is = 1 A * exp(-vf/(n Vt)) (Shockley diode equation, Sedra & Smith ch. 4).
  ResolvedDevice device = Generic("zsw_junction", "vf_v=0.7 rs_ohm=5m");
  CharacterizeOptions options;
  options.table_rows = 2;
  options.i_reverse_max_a = 10;
  options.reverse_rows = 5;
  Characterization table;
  std::string error;
  ASSERT_TRUE(CharacterizeSwitch(SharedNgspice(), device, options, &table, &error)) << error;
  for (const ReverseRow& row : table.reverse) {
    double expected = 0.7 + 0.025852 * std::log(row.i_a) + row.i_a * 5e-3;
    EXPECT_NEAR(row.v_v, expected, 0.01 * expected) << row.i_a << " A";
  }
}

TEST_F(SwitchModelsTest, UserSubcircuitWithAnotherPinOrderMatchesTheGenericModel) {
  // The same switch written as (S D G KS TJ) and tied by a pin map must give the
  // same commutations as the generic (d g s) model: common practice, no source.
  PreparedSweep sweep;
  std::vector<PointResult> results = RunSweep("tests/netlist/fixtures/pin_map_buck.xml", &sweep);
  ASSERT_EQ(results.size(), 4u);  // (generic, mine) x (0 A, 12 A)
  for (size_t load = 0; load < 2; ++load) {
    const PointResult& generic = results[load];
    const PointResult& mine = results[2 + load];
    ASSERT_EQ(generic.status, PointStatus::kOk) << generic.reason;
    ASSERT_EQ(mine.status, PointStatus::kOk) << mine.reason;
    for (const char* edge : {"high_on", "low_on"}) {
      const EdgeMeasurement& a = EdgeOf(generic, edge);
      const EdgeMeasurement& b = EdgeOf(mine, edge);
      EXPECT_EQ(a.zvs, b.zvs) << edge << " at point " << load;
      for (const char* metric : {"v_turn_on_v", "i_commutated_a", "e_on_j", "e_off_j"}) {
        double x = a.Get(metric), y = b.Get(metric);
        EXPECT_NEAR(x, y, 1e-3 * std::max(1.0, std::fabs(x)) + 1e-9)
            << metric << " " << edge << " at point " << load;
      }
    }
  }
  // The map has both classes (soft at no load, hard at 12 A on the high side).
  EXPECT_EQ(EdgeOf(results[0], "high_on").zvs, ZvsClass::kFull);
  EXPECT_EQ(EdgeOf(results[1], "high_on").zvs, ZvsClass::kHard);
}

TEST_F(SwitchModelsTest, SiliconRecoveryAddsToTheHardTurnOnEnergyWideBandgapDoesNot) {
  PreparedSweep sweep;
  std::vector<PointResult> r = RunSweep("tests/netlist/fixtures/recovery_buck.xml", &sweep);
  ASSERT_EQ(r.size(), 3u);  // si (tt_s = 100 ns), si_no_rr (tt_s = 0), wbg
  for (const auto& p : r) ASSERT_EQ(p.status, PointStatus::kOk) << p.reason;
  const EdgeMeasurement& si = EdgeOf(r[0], "high_on");
  const EdgeMeasurement& si0 = EdgeOf(r[1], "high_on");
  const EdgeMeasurement& wbg = EdgeOf(r[2], "high_on");
  for (const auto* e : {&si, &si0, &wbg}) ASSERT_EQ(e->zvs, ZvsClass::kHard);
  const double tt = 100e-9, vin = 48;
  // Charge-control diode model: stored charge tt * I_F, recovered at the full
  // rail voltage, so the hard turn-on gains up to Vin * tt * I_F (from memory;
  // how much of it returns depends on di/dt, so ask for a fifth).
  double scale = vin * tt * si.Get("i_commutated_a");
  EXPECT_GT(si.Get("e_on_j") - si0.Get("e_on_j"), 0.2 * scale);
  // Wide-bandgap-like: no stored charge. Its turn-on energy is the output-
  // capacitance energy (own E(V) dumped in the channel plus Q(V) V - E(V) to
  // charge the other switch; closed forms of netlists/switches.lib,
  // netlists/references.md sec. 6) plus current-voltage overlap, with nothing of the order of a
  // recovery charge on top.
  auto q = [](double v) { return 250e-12 * v + JunctionQ(3e-9, 5, 2.5, v); };
  auto e = [](double v) { return 250e-12 * v * v / 2 + JunctionE(3e-9, 5, 2.5, v); };
  double v = wbg.Get("rail_v");
  double e_coss = e(v) + (q(v) * v - e(v));
  EXPECT_GT(wbg.Get("e_on_j"), 0.9 * e_coss);
  EXPECT_LT(wbg.Get("e_on_j") - e_coss, 0.2 * vin * tt * wbg.Get("i_commutated_a"));
}

}  // namespace
}  // namespace zvsmap
