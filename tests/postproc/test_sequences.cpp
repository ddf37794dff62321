// Symmetrical components and unbalance metrics against worked examples, and harmonic phasors
// of sampled three-phase series against the series' own construction.
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "postproc/sequences.hpp"

using namespace gapflux;

namespace {

constexpr double pi = std::numbers::pi;
Phasor at_deg(double magnitude, double deg) {
  return std::polar(magnitude, deg * pi / 180.0);
}

}  // namespace

// Fortescue (1918); worked the same way in any power-systems text. Tolerance 1e-12: the
// operations are a handful of complex products.
TEST_CASE("Fortescue: magnitude unbalance, angle asymmetry, a lost phase",
          "[postproc][sequences]") {
  SECTION("phase b 10 % low") {
    // α·Ib and α²·Ic line up with Ia, so I1 = (1 + 0.9 + 1)/3; in I2 and I0 the balanced part
    // cancels (1 + α + α² = 0) and what is left is the −0.1 of phase b, turned.
    const SequenceSet s = fortescue({at_deg(1, 0), at_deg(0.9, -120), at_deg(1, 120)});
    CHECK(std::abs(s.positive - Phasor(2.9 / 3.0)) < 1e-12);
    CHECK(std::abs(s.negative - at_deg(0.1 / 3.0, -60)) < 1e-12);
    CHECK(std::abs(s.zero - at_deg(0.1 / 3.0, 60)) < 1e-12);
    CHECK(unbalance_metrics({at_deg(1, 0), at_deg(0.9, -120), at_deg(1, 120)}).vuf_pct ==
          Approx(100.0 / 29.0).epsilon(1e-12));
  }
  SECTION("phase b 10° early") {
    // Ib = ∠−110°: I1 = (1 + ∠10° + 1)/3 and I2 = (∠130° − ∠120°)/3, |I2| = 2·sin 5°/3.
    const SequenceSet s = fortescue({at_deg(1, 0), at_deg(1, -110), at_deg(1, 120)});
    CHECK(std::abs(s.positive) ==
          Approx(std::hypot(2 + std::cos(pi / 18), std::sin(pi / 18)) / 3).epsilon(1e-12));
    CHECK(std::abs(s.negative) == Approx(2 * std::sin(pi / 36) / 3).epsilon(1e-12));
  }
  SECTION("one phase lost, the other two carrying Ia = −Ib") {
    // I1 = (1 − α)/3, I2 = (1 − α²)/3: equal magnitudes 1/√3, no zero sequence.
    const SequenceSet s = fortescue({at_deg(1, 0), at_deg(1, 180), Phasor(0)});
    CHECK(std::abs(s.positive) == Approx(1 / std::sqrt(3.0)).epsilon(1e-12));
    CHECK(std::abs(s.negative) == Approx(1 / std::sqrt(3.0)).epsilon(1e-12));
    CHECK(std::abs(s.zero) < 1e-15);
  }
  SECTION("a balanced set is positive sequence only; its mirror negative only") {
    const SequenceSet s = fortescue({at_deg(2, 10), at_deg(2, -110), at_deg(2, 130)});
    CHECK(std::abs(s.positive - at_deg(2, 10)) < 1e-12);
    CHECK(std::abs(s.negative) < 1e-12);
    const SequenceSet m = fortescue({at_deg(2, 10), at_deg(2, 130), at_deg(2, -110)});
    CHECK(std::abs(m.negative - at_deg(2, 10)) < 1e-12);
  }
}

TEST_CASE("VUF, LVUR and PVUR on worked examples", "[postproc][sequences]") {
  // Line-to-line magnitudes 460, 467, 450 V (a NEMA MG-1-style example, from memory): mean 459,
  // largest deviation 9 → LVUR = 1.961 %. Phasors: the three corners of that triangle.
  const double ab = 460, bc = 467, ca = 450;
  const double cx = (ab * ab + ca * ca - bc * bc) / (2 * ab);
  const std::array<Phasor, 3> v = {Phasor(0, 0), Phasor(ab, 0),
                                   Phasor(cx, -std::sqrt(ca * ca - cx * cx))};
  const UnbalanceMetrics u = unbalance_metrics(v);
  CHECK(u.lvur_pct == Approx(100.0 * 9.0 / 459.0).epsilon(1e-12));
  // VUF from the line magnitudes alone (IEC 61000-4-30's formula, from memory):
  // VUF = √((1 − √(3 − 6β))/(1 + √(3 − 6β))), β = Σ V⁴ / (Σ V²)². Independent of Fortescue.
  const double s2 = ab * ab + bc * bc + ca * ca;
  const double beta = (std::pow(ab, 4) + std::pow(bc, 4) + std::pow(ca, 4)) / (s2 * s2);
  const double root = std::sqrt(3 - 6 * beta);
  CHECK(u.vuf_pct == Approx(100.0 * std::sqrt((1 - root) / (1 + root))).epsilon(1e-9));
  // PVUR (IEEE form): phase magnitudes 1.00, 0.95, 1.02 → mean 0.99, deviation 0.04.
  const UnbalanceMetrics p =
      unbalance_metrics({at_deg(1, 0), at_deg(0.95, -120), at_deg(1.02, 120)});
  CHECK(p.pvur_pct == Approx(100.0 * 0.04 / 0.99).epsilon(1e-12));
  // A balanced set: all three are zero.
  const UnbalanceMetrics b = unbalance_metrics({at_deg(5, 0), at_deg(5, -120), at_deg(5, 120)});
  CHECK(b.vuf_pct < 1e-12);
  CHECK(b.lvur_pct < 1e-12);
  CHECK(b.pvur_pct < 1e-12);
}

TEST_CASE("harmonic phasors of sampled series: orders, angles referred to t = 0, sequences",
          "[postproc][sequences]") {
  // The series are built here from known phasors; the DFT over whole periods must return them
  // to round-off (1e-10), the window starting at t0 ≠ 0 included. The 5th of a waveform shifted
  // by a third of a period in each phase is negative sequence, the 7th positive, the 3rd zero
  // (the harmonic sequence rule, common practice, no source).
  const double f = 50.0, t0 = 0.0123;
  const int periods = 2, per_period = 48, n = periods * per_period;
  struct Component {
    double order, rms, angle_deg;
  };
  const Component parts[] = {{1, 10, 20}, {3, 0.5, 0}, {5, 0.8, 40}, {7, 0.6, -70}, {2.5, 0.3, 10}};
  std::array<std::vector<double>, 3> series;
  for (int k = 0; k < 3; ++k)
    for (int i = 0; i < n; ++i) {
      const double t = t0 + i / (f * per_period);
      double x = 0;
      for (const Component& c : parts)  // phase k is phase a delayed by k/3 of a period
        x += std::sqrt(2.0) * c.rms *
             std::cos(c.order * 2 * pi * f * (t - k / (3.0 * f)) + c.angle_deg * pi / 180);
      series[k].push_back(x);
    }
  const auto h = three_phase_harmonics(series, periods, t0, f, 1e-6);
  REQUIRE(h.size() == 5);
  for (const Component& c : parts) {
    const HarmonicPhasors* p = find_order(h, c.order);
    REQUIRE(p != nullptr);
    CHECK(std::abs(p->abc[0] - at_deg(c.rms, c.angle_deg)) < 1e-10);
    CHECK(std::abs(p->abc[1] - at_deg(c.rms, c.angle_deg - c.order * 120)) < 1e-10);
  }
  CHECK(std::abs(find_order(h, 5)->sequences.negative) == Approx(0.8).epsilon(1e-10));
  CHECK(std::abs(find_order(h, 5)->sequences.positive) < 1e-10);
  CHECK(std::abs(find_order(h, 7)->sequences.positive) == Approx(0.6).epsilon(1e-10));
  CHECK(std::abs(find_order(h, 3)->sequences.zero) == Approx(0.5).epsilon(1e-10));
  CHECK(std::abs(find_order(h, 1)->sequences.positive) == Approx(10).epsilon(1e-12));
}
