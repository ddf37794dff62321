// The time-harmonic field's effective reluctivity and the peak of a rotating flux density.
#include <catch2/catch.hpp>

#include <cmath>
#include <complex>
#include <numbers>

#include "materials/library.hpp"
#include "solver/harmonic_field.hpp"

using namespace gapflux;

TEST_CASE("effective reluctivity: equal mean energy over a period, ν itself when linear",
          "[solver][harmonic]") {
  // The definition (energy-equivalent effective reluctivity, Luomi, Niemenmaa and Arkkio, ICEM
  // 1986; from memory): ν_eff·B̂²/4 = mean over a period of w(B̂·|sin ωt|), w(B) = ∫₀ᴮ H dB.
  // Reference: the same mean by a 20 000-point midpoint rule (error ~1e-9 for this smooth
  // integrand); the material's 12-point Gauss rule must agree to 1e-3 (measured up to 3e-4 at
  // 1.8–2.1 T: the B–H table's interpolation has joints where dH/dB jumps, which cost the Gauss
  // rule its order; a steel's B–H data themselves are good to about 1 %, from memory).
  const Material* steel = find_material("M400-50A");
  REQUIRE(steel);
  REQUIRE(steel->nonlinear());
  for (double b_peak : {0.3, 1.0, 1.5, 1.8, 2.1}) {
    const int n = 20000;
    double mean = 0.0;
    for (int i = 0; i < n; ++i)
      mean += steel->energy_density(b_peak * std::sin(0.5 * std::numbers::pi * (i + 0.5) / n));
    mean /= n;
    INFO("B̂ = " << b_peak << " T");
    CHECK(steel->effective_reluctivity(b_peak) ==
          Approx(4.0 * mean / (b_peak * b_peak)).epsilon(1e-3));
  }
  // Deeper saturation: a larger effective reluctivity (less permeable), as the curve's secant.
  CHECK(steel->effective_reluctivity(2.0) > steel->effective_reluctivity(1.6));
  Material linear;
  linear.relative_permeability = 1000.0;
  CHECK(linear.effective_reluctivity(1.7) == Approx(1.0 / (mu0 * 1000.0)).epsilon(1e-14));
}

TEST_CASE("the peak of a rotating or alternating flux density", "[solver][harmonic]") {
  // B(t) = Re{B̂·e^{jωt}}: a circle of radius B for B̂ = B·(1, −j) (common practice, no source);
  // an alternating field's peak is |B̂|; a general ellipse's by sampling one period.
  using C = std::complex<double>;
  CHECK(ellipse_peak(Eigen::Vector2cd(C(1.2, 0), C(0, -1.2))) == Approx(1.2).epsilon(1e-14));
  CHECK(ellipse_peak(Eigen::Vector2cd(C(0.6, 0.8), C(0, 0))) == Approx(1.0).epsilon(1e-14));
  const Eigen::Vector2cd b(C(0.3, -1.1), C(0.9, 0.2));
  double sampled = 0.0;
  for (int i = 0; i < 100000; ++i) {
    const C turn = std::polar(1.0, 2.0 * std::numbers::pi * i / 100000.0);
    sampled = std::max(sampled, std::hypot((b[0] * turn).real(), (b[1] * turn).real()));
  }
  CHECK(ellipse_peak(b) == Approx(sampled).epsilon(1e-8));
}
