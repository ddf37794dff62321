#include "equivalent_circuit.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace gapflux {
namespace {

using Complex = std::complex<double>;
const Complex j(0.0, 1.0);

// The rotor branch Z2 that, beside jXm and after R1 + jX1σ, gives the impedance z.
Complex rotor_impedance(double r1, double x1, double xm, Complex z) {
  return 1.0 / (1.0 / (z - r1 - j * x1) - 1.0 / (j * xm));
}

}  // namespace

StatorBranches stator_branches(double r1_ohm, Complex z_no_load_ohm, Complex z_standstill_ohm) {
  const double x0 = z_no_load_ohm.imag();  // X1σ + Xm
  // X1σ such that the standstill rotor branch's reactance equals it: a root of
  // f(x) = Im Z2(x) − x on (0, X0), found by bisection (f > 0 near 0, < 0 near X0 for any
  // physical pair of impedances).
  const auto f = [&](double x) {
    return rotor_impedance(r1_ohm, x, x0 - x, z_standstill_ohm).imag() - x;
  };
  double lo = 1e-9 * x0, hi = (1.0 - 1e-9) * x0;
  if (!(x0 > 0.0) || !(f(lo) > 0.0) || !(f(hi) < 0.0))
    throw std::runtime_error("the no-load and standstill impedances admit no equivalent circuit");
  for (int k = 0; k < 200 && hi - lo > 1e-12 * x0; ++k) {
    const double mid = 0.5 * (lo + hi);
    (f(mid) > 0.0 ? lo : hi) = mid;
  }
  StatorBranches s;
  s.r1_ohm = r1_ohm;
  s.x1_leakage_ohm = 0.5 * (lo + hi);
  s.xm_ohm = x0 - s.x1_leakage_ohm;
  return s;
}

RotorBranch rotor_branch(const StatorBranches& s, Complex z_ohm, double slip) {
  const Complex z2 = rotor_impedance(s.r1_ohm, s.x1_leakage_ohm, s.xm_ohm, z_ohm);
  return {slip * z2.real(), z2.imag()};
}

Complex circuit_impedance(const StatorBranches& s, const RotorBranch& r, double slip) {
  const Complex z2 = r.r2_ohm / slip + j * r.x2_leakage_ohm;
  const Complex zm = j * s.xm_ohm;
  return s.r1_ohm + j * s.x1_leakage_ohm + zm * z2 / (zm + z2);
}

Complex rotor_current(const StatorBranches& s, const RotorBranch& r, double slip, Complex v) {
  const Complex z2 = r.r2_ohm / slip + j * r.x2_leakage_ohm;
  const Complex zm = j * s.xm_ohm;
  return v / circuit_impedance(s, r, slip) * zm / (zm + z2);
}

SaturatingRotor saturating_rotor(const StatorBranches& s, const RotorBranch& rated,
                                 double rated_slip, Complex v_rated, const RotorBranch& standstill,
                                 double standstill_slip, Complex v_standstill) {
  SaturatingRotor r;
  r.rated = rated;
  r.standstill = standstill;
  r.rated_slip = rated_slip;
  r.standstill_slip = standstill_slip;
  r.i2_rated = std::abs(rotor_current(s, rated, rated_slip, v_rated));
  r.i2_standstill = std::abs(rotor_current(s, standstill, standstill_slip, v_standstill));
  // Without a spread of currents (or of reactances) there is nothing to interpolate.
  const double current_ratio = r.i2_standstill / r.i2_rated;
  if (current_ratio > 1.01 && rated.x2_leakage_ohm > 0.0 && standstill.x2_leakage_ohm > 0.0)
    r.exponent =
        std::log(rated.x2_leakage_ohm / standstill.x2_leakage_ohm) / std::log(current_ratio);
  return r;
}

Complex saturating_circuit_current(const StatorBranches& s, const SaturatingRotor& r, double slip,
                                   Complex v) {
  // R2' from the slip alone.
  const double root_lo = std::sqrt(r.rated_slip), root_hi = std::sqrt(r.standstill_slip);
  const double w =
      std::clamp((std::sqrt(std::abs(slip)) - root_lo) / (root_hi - root_lo), 0.0, 1.0);
  RotorBranch branch;
  branch.r2_ohm = r.rated.r2_ohm + w * (r.standstill.r2_ohm - r.rated.r2_ohm);
  // X2σ' from the rotor current it lets through: g(x) = x − X(I2(x)) changes sign between the
  // two points' reactances (X(I) stays between them), so bisection finds its root.
  const auto law = [&](double i2) {
    const double i = std::clamp(i2, std::min(r.i2_rated, r.i2_standstill),
                                std::max(r.i2_rated, r.i2_standstill));
    return r.rated.x2_leakage_ohm * std::pow(i / r.i2_rated, -r.exponent);
  };
  const auto g = [&](double x) {
    branch.x2_leakage_ohm = x;
    return x - law(std::abs(rotor_current(s, branch, slip, v)));
  };
  double lo = std::min(r.rated.x2_leakage_ohm, r.standstill.x2_leakage_ohm);
  double hi = std::max(r.rated.x2_leakage_ohm, r.standstill.x2_leakage_ohm);
  double x = 0.0;
  if (g(lo) >= 0.0) {
    x = lo;
  } else if (g(hi) <= 0.0) {
    x = hi;
  } else {
    for (int k = 0; k < 200 && hi - lo > 1e-12 * (hi + lo); ++k) {
      const double mid = 0.5 * (lo + hi);
      (g(mid) < 0.0 ? lo : hi) = mid;
    }
    x = 0.5 * (lo + hi);
  }
  branch.x2_leakage_ohm = x;
  return v / circuit_impedance(s, branch, slip);
}

}  // namespace gapflux
