#include "equivalent_circuit.hpp"

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

}  // namespace gapflux
