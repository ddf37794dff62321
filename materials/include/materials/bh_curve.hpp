#pragma once
// A magnetisation curve: a B–H table turned into a monotone piecewise-cubic H(B) (Fritsch–Carlson
// 1980, so no overshoot between points), extended beyond the last point as B = μ0·H + J_sat
// (slope μ0), with the cubic's end slope matched to it where the box condition allows (C¹). The
// solver asks for the reluctivity ν = H/B as a function of B² and its derivative dν/d(B²)
// (design.md §2); energy densities come from the same curve.
#include <string>
#include <vector>

namespace gapflux {

inline constexpr double mu0 = 4.0e-7 * 3.14159265358979323846;  // H/m (the pre-2019 exact value)

class BHCurve {
 public:
  // `h_a_per_m` and `b_tesla` from (0, 0), strictly increasing, at least 5 points. Throws
  // std::invalid_argument saying which point is wrong; callers add the file and key.
  BHCurve(std::vector<double> h_a_per_m, std::vector<double> b_tesla);

  double h_of_b(double b_tesla) const;
  double dh_db(double b_tesla) const;  // differential reluctivity
  // ν(B²) = H/B and dν/d(B²); at B → 0, ν → dH/dB(0) and the derivative is taken as 0.
  void reluctivity(double b_squared, double& nu, double& dnu_db2) const;
  // Stored energy density w = ∫0^B H dB' (J/m³); co-energy density is B·H − w.
  double energy_density(double b_tesla) const;

  double saturation_polarisation_tesla() const { return j_sat_; }
  double last_b_tesla() const { return b_.back(); }
  // The knee: where the differential permeability has fallen below 10 % of its largest value
  // (a common engineering reading, no source).
  double knee_tesla() const;
  // Where the differential relative permeability dB/(μ0·dH) first falls to `mu_r` (above the
  // steepest part of the curve); the last table point if it never does.
  double b_at_differential_mu_r(double mu_r) const;
  // Deep saturation, the default saturation threshold: differential μr down to 10, where each
  // further tesla costs a tenth of what air would. 1.78–1.83 T for the built-in grades, about
  // the flux density usual as the ceiling for induction-motor teeth (common practice, no
  // source). The knee (1.2 T for the same grades) lies inside every healthy tooth's range.
  double deep_saturation_tesla() const { return b_at_differential_mu_r(10.0); }
  const std::vector<double>& h_table() const { return h_; }
  const std::vector<double>& b_table() const { return b_; }

 private:
  std::size_t segment(double b) const;
  double steepest_b() const;           // the table point of the largest differential permeability
  std::vector<double> b_, h_, slope_;  // slope_ = dH/dB at each point
  std::vector<double> energy_at_;      // ∫0^{b_i} H dB
  double j_sat_ = 0.0;
};

}  // namespace gapflux
