#include "handcalc/coss_calibration.h"

#include <cmath>
#include <cstdio>
#include <functional>

#include "core/spice_number.h"

namespace zvsmap {

namespace {

class PowerLawCapacitance : public OutputCapacitance {
 public:
  PowerLawCapacitance(double k, double g) : k_(k), g_(g) {}
  double Charge(double v) const override {
    return v <= 0 ? 0 : k_ * std::pow(v, 1 - g_) / (1 - g_);
  }
  double Energy(double v) const override {
    return v <= 0 ? 0 : k_ * std::pow(v, 2 - g_) / (2 - g_);
  }
  std::string Describe() const override {
    return "power law, C = " + FormatEngineering(k_) + "F*V^-" + FormatNumber(g_);
  }

 private:
  double k_, g_;
};

// A ratio or exponent for messages, 4 significant digits.
std::string Short(double x) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.4g", x);
  return buf;
}

// (1 + x)^a - 1 without cancellation at small x.
double PowMinusOne(double x, double a) { return std::expm1(a * std::log1p(x)); }

// Co(tr)/Co(er) of the junction form at x = V/Vj (independent of C0 and Vj).
double JunctionRatio(double x, double m) {
  double q = PowMinusOne(x, 1 - m) / (1 - m);
  double e = PowMinusOne(x, 2 - m) / (2 - m) - q;
  return q * x / (2 * e);
}

// Bisection on a monotonic f over [lo, hi] in log space; f(lo), f(hi) differ in sign.
double BisectLog(const std::function<double(double)>& f, double lo, double hi) {
  double flo = f(lo);
  for (int i = 0; i < 200; ++i) {
    double mid = std::sqrt(lo * hi);
    double fm = f(mid);
    if ((fm < 0) == (flo < 0)) {
      lo = mid;
      flo = fm;
    } else {
      hi = mid;
    }
    if (hi / lo < 1 + 1e-14) break;
  }
  return std::sqrt(lo * hi);
}

constexpr double kXMin = 1e-6, kXMax = 1e9;

// x = V/Vj with JunctionRatio(x, m) = r, if the form reaches r.
bool SolveJunctionX(double r, double m, double* x) {
  auto f = [&](double xx) { return JunctionRatio(xx, m) - r; };
  if (f(kXMin) >= 0 || f(kXMax) <= 0) return false;
  *x = BisectLog(f, kXMin, kXMax);
  return true;
}

std::string Volts(double v) { return FormatEngineering(v) + " V"; }

void Reproduce(const CossDatasheet& data, const OutputCapacitance& c,
               const std::function<double(double)>& small_signal, std::vector<Reproduction>* out) {
  double v = data.v_rated_v;
  out->push_back({"Co(tr)(" + Volts(v) + ")", data.co_tr_f, c.ChargeEquivalent(v)});
  out->push_back({"Co(er)(" + Volts(v) + ")", data.co_er_f, c.EnergyEquivalent(v)});
  if (data.c_at_v_f > 0) {
    out->push_back({"C(" + Volts(data.c_v_v) + ")", data.c_at_v_f, small_signal(data.c_v_v)});
  }
}

bool CheckData(const CossDatasheet& data, std::string* error) {
  if (!(data.v_rated_v > 0) || !(data.co_tr_f > 0) || !(data.co_er_f > 0)) {
    *error = "the voltage, Co(tr) and Co(er) (or Qoss and Eoss) must be positive";
    return false;
  }
  if (data.c_at_v_f < 0 || (data.c_at_v_f > 0 && !(data.c_v_v > 0))) {
    *error = "the small-signal capacitance and its voltage must be positive";
    return false;
  }
  return true;
}

}  // namespace

std::unique_ptr<OutputCapacitance> MakePowerLawCapacitance(double k, double g) {
  return std::make_unique<PowerLawCapacitance>(k, g);
}

CossDatasheet CossDatasheet::FromCharges(double v_v, double qoss_c, double eoss_j) {
  CossDatasheet d;
  d.v_rated_v = v_v;
  d.co_tr_f = qoss_c / v_v;
  d.co_er_f = 2 * eoss_j / (v_v * v_v);
  return d;
}

bool FitPowerLaw(const CossDatasheet& data, PowerLawFit* fit, std::string* error) {
  if (!CheckData(data, error)) return false;
  double r = data.co_tr_f / data.co_er_f;
  if (!(r > 0.5)) {
    *error = "Co(tr)/Co(er) = " + Short(r) + " <= 1/2: no power law has that ratio";
    return false;
  }
  fit->ratio = r;
  fit->g = (2 * r - 2) / (2 * r - 1);  // netlists/references.md section 6
  fit->k = data.co_tr_f * (1 - fit->g) * std::pow(data.v_rated_v, fit->g);
  fit->reproduced.clear();
  auto c = MakePowerLawCapacitance(fit->k, fit->g);
  double k = fit->k, g = fit->g;
  Reproduce(
      data, *c, [k, g](double v) { return k * std::pow(v, -g); }, &fit->reproduced);
  return true;
}

bool FitJunction(const CossDatasheet& data, double m_fixed, JunctionFit* fit, std::string* error) {
  if (!CheckData(data, error)) return false;
  double r = data.co_tr_f / data.co_er_f;
  double v = data.v_rated_v;
  // For a given m: x from r, then Vj = V/x and C0 from Co(tr).
  auto params_for = [&](double m, double* c0, double* vj) {
    double x = 0;
    if (!SolveJunctionX(r, m, &x)) return false;
    *vj = v / x;
    *c0 = data.co_tr_f * v * (1 - m) / (*vj * PowMinusOne(x, 1 - m));
    return true;
  };
  double m = m_fixed;
  if (data.c_at_v_f > 0) {
    // Scan m in (0, 1) for a sign change of the small-signal mismatch, then bisect.
    auto mismatch = [&](double mm, double* out) {
      double c0 = 0, vj = 0;
      if (!params_for(mm, &c0, &vj)) return false;
      *out = c0 / std::pow(1 + data.c_v_v / vj, mm) / data.c_at_v_f - 1;
      return true;
    };
    double best_m = -1, best_abs = 1e300, prev_m = -1, prev_f = 0;
    bool bracketed = false;
    double lo = 0, hi = 0;
    for (int i = 1; i < 1000 && !bracketed; ++i) {
      double mm = i / 1000.0, f = 0;
      if (!mismatch(mm, &f)) continue;
      if (std::fabs(f) < best_abs) best_abs = std::fabs(f), best_m = mm;
      if (prev_m > 0 && (f < 0) != (prev_f < 0)) {
        bracketed = true;
        lo = prev_m;
        hi = mm;
      }
      prev_m = mm;
      prev_f = f;
    }
    if (best_m < 0) {
      *error = "Co(tr)/Co(er) = " + Short(r) +
               ": the junction form with 0 < m < 1 needs a ratio above 1";
      return false;
    }
    m = best_m;
    if (bracketed) {
      double flo = 0;
      mismatch(lo, &flo);
      for (int i = 0; i < 100 && hi - lo > 1e-13; ++i) {
        double mid = 0.5 * (lo + hi), fm = 0;
        if (!mismatch(mid, &fm)) break;
        if ((fm < 0) == (flo < 0)) {
          lo = mid;
          flo = fm;
        } else {
          hi = mid;
        }
      }
      m = 0.5 * (lo + hi);
    }
  }
  if (!(m > 0 && m < 1)) {
    *error = "m = " + Short(m) + " is outside 0 < m < 1";
    return false;
  }
  double c0 = 0, vj = 0;
  if (!params_for(m, &c0, &vj)) {
    *error = "Co(tr)/Co(er) = " + Short(r) +
             " is outside what the junction form with m = " + Short(m) + " reaches (1 to " +
             Short((2 - m) / (2 * (1 - m))) + "); give another m or a small-signal C";
    return false;
  }
  fit->c0_f = c0;
  fit->vj_v = vj;
  fit->m = m;
  fit->reproduced.clear();
  auto c = MakeJunctionCapacitance(c0, vj, m);
  Reproduce(
      data, *c, [=](double u) { return c0 / std::pow(1 + u / vj, m); }, &fit->reproduced);
  return true;
}

}  // namespace zvsmap
