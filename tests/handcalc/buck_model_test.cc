// The built-in buck model against the check case of netlists/references.md
// section 8 (derived there and reproduced in ngspice 39 with ideal switches):
// buck 48 V -> 12 V, 500 kHz, L 1 uH, linear 1 nF per switch, Io 5 A.
#include "handcalc/buck_model.h"

#include <gtest/gtest.h>

#include <cmath>

#include "handcalc/output_capacitance.h"

namespace zvsmap {
namespace {

class BuckModelTest : public ::testing::Test {
 protected:
  void SetUp() override {
    params_ = {{"vin", 48},    {"vout", 12}, {"fsw", 500e3},   {"l", 1e-6},     {"iout", 5},
               {"coss", 1e-9}, {"vf", 0.7},  {"td_lh", 40e-9}, {"td_hl", 40e-9}};
    cell_.name = "leg";
    cell_.high_dead = "td_lh";
    cell_.low_dead = "td_hl";
  }
  // Runs the model and returns the value of prediction `name`.
  double Get(const std::string& name) {
    ModelContext context;
    context.params = &params_;
    context.cell = &cell_;
    predictions_.clear();
    std::string error;
    EXPECT_TRUE(BuckModel().Predict(context, &predictions_, &error)) << error;
    for (const Prediction& p : predictions_) {
      if (p.name == name) return p.value;
    }
    ADD_FAILURE() << "no prediction " << name;
    return NAN;
  }
  Variables params_;
  CellSpec cell_;
  std::vector<Prediction> predictions_;
};

// netlists/references.md sec. 8: dI = 18 A; Iv = -4 A; Ipk = 14 A.
// Formulas: Erickson & Maksimovic 2001, ch. 2; Mohan et al. 2003, ch. 7.
TEST_F(BuckModelTest, RippleAndPeakAndValleyCurrents) {
  EXPECT_DOUBLE_EQ(Get("duty"), 0.25);           // D = Vo/Vin, Erickson & Maksimovic ch. 2
  EXPECT_NEAR(Get("ripple_a"), 18.0, 0.5e-9);    // netlists/references.md sec. 8: dI = 18 A
  EXPECT_NEAR(Get("i_valley_a"), -4.0, 0.5e-9);  // netlists/references.md sec. 8: Iv = -4 A
  EXPECT_NEAR(Get("i_peak_a"), 14.0, 0.5e-9);    // netlists/references.md sec. 8: Ipk = 14 A
  // Commutated current per edge (sign: out of the switch node).
  EXPECT_NEAR(Get("high_on_i_commutated_a"), -4.0, 0.5e-9);  // netlists/references.md sec. 8
  EXPECT_NEAR(Get("low_on_i_commutated_a"), 14.0, 0.5e-9);   // netlists/references.md sec. 8
}

// netlists/references.md sec. 8: Z = 22.36 ohm; f_res = 3.559 MHz (Ceq = 2 Coss).
TEST_F(BuckModelTest, ResonantImpedanceAndFrequency) {
  EXPECT_NEAR(Get("z_res_ohm"), 22.36, 0.005);      // netlists/references.md sec. 8
  EXPECT_NEAR(Get("f_res_hz"), 3.559e6, 0.0005e6);  // netlists/references.md sec. 8
  EXPECT_NEAR(Get("c_eq_f"), 2e-9, 1e-21);          // netlists/references.md sec. 2: 2*Coss
}

// netlists/references.md sec. 8: ZVS threshold |Iv| >= 1.518 A; with linear Coss the
// charge- and energy-based thresholds coincide (sec. 2, Co(tr) = Co(er)).
TEST_F(BuckModelTest, ZvsThresholds) {
  EXPECT_NEAR(Get("high_on_i_zvs_charge_a"), 1.518, 0.0005);  // netlists/references.md sec. 8
  EXPECT_NEAR(Get("high_on_i_zvs_energy_a"), 1.518, 0.0005);  // sec. 6: linear Co(tr) = Co(er)
  EXPECT_EQ(Get("low_on_i_zvs_charge_a"), 0.0);               // sec. 2: always ZVS when D <= 0.5
}

// netlists/references.md sec. 8: high-side transition 24.32 ns, current at its end
// 3.70 A, maximum dead time before ring-back 127.1 ns.
TEST_F(BuckModelTest, HighSideResonantTransitionAndDeadTimeWindow) {
  EXPECT_NEAR(Get("high_on_t_resonant_s"), 24.32e-9, 0.005e-9);  // netlists/references.md sec. 8
  EXPECT_NEAR(Get("high_on_i_end_a"), 3.70, 0.005);              // netlists/references.md sec. 8
  EXPECT_NEAR(Get("high_on_t_dead_min_s"), 24.32e-9, 0.005e-9);  // sec. 2: min = t_ZVS
  EXPECT_NEAR(Get("high_on_t_dead_max_s"), 127.1e-9, 0.05e-9);   // netlists/references.md sec. 8
}

// netlists/references.md sec. 8: low-side transition 6.82 ns (linear approx. 6.86 ns).
TEST_F(BuckModelTest, LowSideTransitionResonantAndLinear) {
  EXPECT_NEAR(Get("low_on_t_resonant_s"), 6.82e-9, 0.005e-9);  // netlists/references.md sec. 8
  EXPECT_NEAR(Get("low_on_t_linear_s"), 6.86e-9, 0.005e-9);    // sec. 8; Mohan et al. 2003
}

// Linear transition 2*C*Vin/|I| at the valley: 2 * 1n * 48 / 4 = 24 ns
// (Mohan et al. 2003, soft-switching chapter; arithmetic by hand).
TEST_F(BuckModelTest, HighSideLinearApproximation) {
  EXPECT_NEAR(Get("high_on_t_linear_s"), 24e-9, 1e-15);
}

// Partial ZVS with residual Vr and linear Coss loses Coss*Vr^2; hard
// switching of equal devices V*Qoss(V) (netlists/references.md sec. 3, derived).
// Positive valley current (Io = 10 A > dI/2): the node does not rise, so the
// high switch turns on hard against 48 V: 1n * 48^2 = 2.304 uJ.
TEST_F(BuckModelTest, HardTurnOnCapacitiveLoss) {
  params_["iout"] = 10;
  EXPECT_NEAR(Get("high_on_v_turn_on_v"), 48.0, 1e-12);
  EXPECT_NEAR(Get("high_on_e_cap_j"), 2.304e-6, 1e-12);  // netlists/references.md sec. 3: V*Qoss(V)
  EXPECT_TRUE(std::isnan(Get("high_on_t_resonant_s")));
}

// Dead time shorter than the transition: residual Vr = Vin - v(td), with
// v(t) = Vo(1 - cos wt) + I0 Z sin wt (netlists/references.md sec. 2) and loss
// Coss*Vr^2 (sec. 3). At td = 10 ns, w = 2.236e7 rad/s: wt = 0.22361,
// v = 12*(1 - 0.97510) + 4*22.3607*0.22175 = 0.29876 + 19.8342 = 20.133 V,
// Vr = 27.867 V, E = 1n * 27.867^2 = 0.7766 uJ (worked by hand).
TEST_F(BuckModelTest, PartialTurnOnResidualAndLoss) {
  params_["td_lh"] = 10e-9;
  EXPECT_NEAR(Get("high_on_v_turn_on_v"), 27.867, 0.002);
  EXPECT_NEAR(Get("high_on_e_cap_j"), 0.7766e-6, 0.0002e-6);
}

// Body diode: E ~ Vf*|I|*t_diode (netlists/references.md sec. 3, common practice).
// Low side: i_end * (40 ns - 6.82 ns) * 0.7 V; i_end from
// i = Ipk cos wt + ((Vin - Vo)/Z) sin wt at wt = w*6.82 ns = 0.1526:
// 14*0.98838 + 1.60997*0.15201 = 14.0821 A -> 0.7*14.0821*33.18n = 0.3271 uJ.
TEST_F(BuckModelTest, LowSideBodyDiodeLoss) {
  EXPECT_NEAR(Get("low_on_e_diode_j"), 0.3271e-6, 0.0005e-6);
}

// netlists/references.md sec. 6, junction form C0/(1 + V/Vj)^m with the closed forms
// for Q and E; the switch library's documented example (netlists/switches.lib,
// zsw_junction defaults c0 = 4 nF, vj = 0.7 V, m = 0.5) gives
// Co(tr)(48 V) = 0.856 nF and Co(er)(48 V) = 0.632 nF.
TEST(OutputCapacitanceTest, JunctionChargeAndEnergyEquivalents) {
  auto c = MakeJunctionCapacitance(4e-9, 0.7, 0.5);
  EXPECT_NEAR(c->ChargeEquivalent(48) * 1e9, 0.856, 0.0005);
  EXPECT_NEAR(c->EnergyEquivalent(48) * 1e9, 0.632, 0.0005);
  auto lin = MakeLinearCapacitance(1e-9);  // Q = C V, E = C V^2/2 (definition)
  EXPECT_DOUBLE_EQ(lin->Charge(48), 48e-9);
  EXPECT_DOUBLE_EQ(lin->Energy(48), 0.5 * 1e-9 * 48 * 48);
}

// With junction Coss the energy-based threshold understates the charge-based
// one by sqrt(Co(er)/Co(tr)) (netlists/references.md sec. 2: the charge sets the
// condition): sqrt(0.632/0.856) = 0.859 for the example above.
TEST_F(BuckModelTest, JunctionCossEnergyThresholdIsLower) {
  params_["c0"] = 4e-9;
  params_["vj"] = 0.7;
  params_["mj"] = 0.5;
  ModelContext context;
  context.params = &params_;
  context.cell = &cell_;
  context.bindings = {{"c0", "c0"}, {"vj", "vj"}, {"mj", "mj"}};
  std::vector<Prediction> out;
  std::string error;
  ASSERT_TRUE(BuckModel().Predict(context, &out, &error)) << error;
  double q = NAN, e = NAN;
  for (const Prediction& p : out) {
    if (p.name == "high_on_i_zvs_charge_a") q = p.value;
    if (p.name == "high_on_i_zvs_energy_a") e = p.value;
  }
  EXPECT_NEAR(e / q, 0.859, 0.001);
}

TEST_F(BuckModelTest, MissingInputIsNamed) {
  params_.erase("fsw");
  ModelContext context;
  context.params = &params_;
  context.cell = &cell_;
  std::vector<Prediction> out;
  std::string error;
  EXPECT_FALSE(BuckModel().Predict(context, &out, &error));
  EXPECT_EQ(error,
            "model 'buck' needs input 'fsw' (switching frequency, Hz): the template has no "
            "parameter 'fsw'");
}

}  // namespace
}  // namespace zvsmap
