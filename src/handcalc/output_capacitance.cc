#include "handcalc/output_capacitance.h"

#include <algorithm>
#include <cmath>

#include "core/spice_number.h"

namespace zvsmap {

namespace {

class LinearCapacitance : public OutputCapacitance {
 public:
  explicit LinearCapacitance(double c) : c_(c) {}
  double Charge(double v) const override { return c_ * v; }
  double Energy(double v) const override { return 0.5 * c_ * v * v; }
  std::string Describe() const override { return "linear, C = " + FormatEngineering(c_) + "F"; }

 private:
  double c_;
};

// Closed forms with x = V/Vj (netlists/references.md section 6, derived):
//   Q(V) = C0 Vj/(1 - m) [(1 + x)^(1 - m) - 1]
//   E(V) = C0 Vj^2 [((1 + x)^(2 - m) - 1)/(2 - m) - ((1 + x)^(1 - m) - 1)/(1 - m)]
class JunctionCapacitance : public OutputCapacitance {
 public:
  JunctionCapacitance(double c0, double vj, double m) : c0_(c0), vj_(vj), m_(m) {}
  double Charge(double v) const override {
    double x = std::max(v, 0.0) / vj_;
    return c0_ * vj_ / (1 - m_) * (std::pow(1 + x, 1 - m_) - 1);
  }
  double Energy(double v) const override {
    double x = std::max(v, 0.0) / vj_;
    return c0_ * vj_ * vj_ *
           ((std::pow(1 + x, 2 - m_) - 1) / (2 - m_) - (std::pow(1 + x, 1 - m_) - 1) / (1 - m_));
  }
  std::string Describe() const override {
    return "junction, C = " + FormatEngineering(c0_) + "F/(1 + V/" + FormatEngineering(vj_) +
           "V)^" + FormatNumber(m_);
  }

 private:
  double c0_, vj_, m_;
};

}  // namespace

std::unique_ptr<OutputCapacitance> MakeLinearCapacitance(double c_f) {
  return std::make_unique<LinearCapacitance>(c_f);
}

std::unique_ptr<OutputCapacitance> MakeJunctionCapacitance(double c0_f, double vj_v, double m) {
  return std::make_unique<JunctionCapacitance>(c0_f, vj_v, m);
}

}  // namespace zvsmap
