// A switch's output capacitance as the hand calculation sees it: charge and
// energy as functions of the drain-source voltage. Linear and junction-type
// forms; a switch-library model can add its own.
#pragma once

#include <memory>
#include <string>

namespace zvsmap {

/// Output capacitance C(V) of one switch, V >= 0 (drain-source voltage).
class OutputCapacitance {
 public:
  virtual ~OutputCapacitance() = default;
  /// Q(V) = integral_0^V C(u) du, in coulombs.
  virtual double Charge(double v) const = 0;
  /// E(V) = integral_0^V u C(u) du, in joules.
  virtual double Energy(double v) const = 0;
  /// One line for the explain output, e.g. "linear, C = 1n F".
  virtual std::string Describe() const = 0;

  /// Charge-equivalent capacitance Co(tr) = Q(V)/V.
  double ChargeEquivalent(double v) const { return Charge(v) / v; }
  /// Energy-equivalent capacitance Co(er) = 2 E(V)/V^2.
  double EnergyEquivalent(double v) const { return 2 * Energy(v) / (v * v); }
};

/// C(V) = c_f: Q = c V, E = c V^2 / 2.
std::unique_ptr<OutputCapacitance> MakeLinearCapacitance(double c_f);

/// C(V) = c0_f / (1 + V/vj_v)^m, 0 < m < 1 (netlists/references.md section 6 closed forms).
std::unique_ptr<OutputCapacitance> MakeJunctionCapacitance(double c0_f, double vj_v, double m);

}  // namespace zvsmap
