// Space–time waves, the field locus and the labels, on airgap fields built from known waves.
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "postproc/airgap_waves.hpp"
#include "postproc/harmonic_labels.hpp"

using namespace gapflux;

namespace {

constexpr double pi = std::numbers::pi;

struct KnownWave {
  int m;       // mechanical order
  double h;    // signed time order: + forward
  double b;    // T
  double phi;  // rad
};

AirgapRecord build(const std::vector<KnownWave>& waves, int samples, int steps, double f, double t0,
                   double theta0) {
  AirgapRecord r;
  r.samples = samples;
  r.steps = steps;
  r.theta0_rad = theta0;
  for (int n = 0; n < steps; ++n) {
    const double t = t0 + n / (f * steps);  // one period
    for (int j = 0; j < samples; ++j) {
      const double theta = theta0 + 2 * pi * j / samples;
      double b = 0;
      for (const KnownWave& w : waves)
        b += w.b * std::cos(w.m * theta - w.h * 2 * pi * f * t - w.phi);
      r.values.push_back(b);
    }
  }
  return r;
}

}  // namespace

// The 2-D DFT must return each wave it was built from — amplitude, phase and direction — to
// round-off (1e-10 T), with the first sample half a spacing in and the window starting at t0 ≠ 0.
TEST_CASE("space-time waves are recovered with their direction", "[postproc][waves]") {
  const int p = 2;
  const std::vector<KnownWave> waves = {
      {2, 1, 0.9, 0.3},     // fundamental forward
      {2, -1, 0.05, 1.1},   // backward fundamental (negative sequence)
      {2, -5, 0.03, -0.4},  // 5th time harmonic: backward
      {2, 7, 0.02, 2.0},    // 7th: forward
      {10, -1, 0.04, 0.7},  // 5th space harmonic of the fundamental current: backward
      {34, 1, 0.06, -1.2},  // slot harmonic ν = 17
  };
  const AirgapRecord r = build(waves, 144, 36, 50.0, 0.0071, pi / 144);
  const auto found = space_time_waves(r, 1, 0.0071, 50.0, p, 1e-6);
  REQUIRE(found.size() == waves.size());
  CHECK(found.front().space_order_mech == 2);  // largest first
  for (const KnownWave& w : waves) {
    const Wave* x = find_wave(found, w.m, w.h);
    REQUIRE(x != nullptr);
    CHECK(x->amplitude == Approx(w.b).margin(1e-10));
    CHECK(std::abs(std::remainder(x->phase_rad - w.phi, 2 * pi)) < 1e-9);
    CHECK(x->direction == (w.h > 0 ? 1 : -1));
    CHECK(x->space_order_el == Approx(w.m / 2.0));
  }
}

// design.md §4: B(t) = B_f·e^{jωt} + B_b·e^{−jωt} traces an ellipse of semi-axes B_f + B_b and
// |B_f − B_b|; the traced space fundamental must reach both (sampled finely: 1e-4).
TEST_CASE("field locus: semi-axes from the waves match the traced space fundamental",
          "[postproc][waves]") {
  const std::vector<KnownWave> waves = {{2, 1, 0.8, 0.2}, {2, -1, 0.1, 1.0}};
  const AirgapRecord r = build(waves, 96, 360, 50.0, 0.0, pi / 96);
  const FieldLocus l = field_locus(space_time_waves(r, 1, 0.0, 50.0, 2, 1e-9), 2);
  CHECK(l.major_tesla == Approx(0.9).epsilon(1e-10));
  CHECK(l.minor_tesla == Approx(0.7).epsilon(1e-10));
  CHECK(l.axis_ratio == Approx(0.7 / 0.9).epsilon(1e-10));
  double lo = 1e9, hi = 0, crest = 0;
  for (const auto& z : space_fundamental(r, 2)) {
    lo = std::min(lo, std::abs(z));
    if (std::abs(z) > hi) hi = std::abs(z), crest = -std::arg(z);
  }
  CHECK(hi == Approx(l.major_tesla).epsilon(1e-4));
  CHECK(lo == Approx(l.minor_tesla).epsilon(1e-4));
  // The crest of the field at its largest: the major axis, modulo half a turn.
  const double axis = std::remainder(crest * 180 / pi - l.major_axis_deg_el, 180.0);
  CHECK(std::abs(axis) < 0.6);  // the trace's angular step is 1°
}

TEST_CASE("sector samples extend to the full circle with the antiperiodic sign",
          "[postproc][waves]") {
  const auto full = full_circle({1.0, 2.0}, 3, true);
  CHECK(full == std::vector<double>{1, 2, -1, -2, 1, 2});
  CHECK(full_circle({1.0, 2.0}, 2, false) == std::vector<double>{1, 2, 1, 2});
}

// Slot and belt orders: ν = k·Q/p ± 1 and 6k ± 1 (common practice, no source).
TEST_CASE("space orders and waves are named from the machine's orders", "[postproc][waves]") {
  MachineOrders m;
  m.pole_pairs = 2, m.stator_slots = 36, m.rotor_bars = 28, m.integral_slot = true;
  m.rotor_speed_pu = 0.97;
  CHECK(space_order_label(m, 2) == "fundamental");
  CHECK_THAT(space_order_label(m, 34),
             Catch::Contains("stator slot harmonic k=1 (Q/p−1)"));  // ν = 17
  CHECK_THAT(space_order_label(m, 38),
             Catch::Contains("stator slot harmonic k=1 (Q/p+1)"));  // ν = 19
  CHECK_THAT(space_order_label(m, 70),
             Catch::Contains("stator slot harmonic k=2 (2Q/p−1)"));     // ν = 35
  CHECK_THAT(space_order_label(m, 10), Catch::Contains("phase belt"));  // ν = 5
  CHECK_THAT(space_order_label(m, 6), Catch::Contains("triplen"));      // ν = 3
  CHECK_THAT(space_order_label(m, 26),
             Catch::Contains("rotor slot harmonic k=1"));  // ν = 13 = 28/2 − 1
  // The rotor slot wave of order p + R = 30 turns with the rotor: time order 1 + R·(1 − s)/p.
  Wave w;
  w.space_order_mech = 30, w.space_order_el = 15, w.time_order = 1 + 28 * 0.97 / 2, w.direction = 1;
  CHECK(wave_label(m, w, 0.25) == "rotor slot harmonic k=1 (R/p+1), turning with the rotor");
  // Order p − R = −26: ν = 13 = R/p − 1, seen at time order −(1 − R·(1 − s)/p) = 12.58.
  w.space_order_mech = 26, w.space_order_el = 13, w.time_order = 28 * 0.97 / 2 - 1;
  CHECK(wave_label(m, w, 0.25) == "rotor slot harmonic k=1 (R/p−1), turning with the rotor");
  w.space_order_mech = 2, w.space_order_el = 1, w.time_order = 5, w.direction = -1;
  CHECK(wave_label(m, w, 0.25) == "supply time harmonic 5, backward");
}

TEST_CASE("torque harmonics are attributed to the wave pairs that beat at their frequency",
          "[postproc][waves]") {
  MachineOrders m;
  m.pole_pairs = 2, m.stator_slots = 36;
  std::vector<Wave> waves(3);
  waves[0] = {2, 1.0, 1.0, 1, 0.8, 0.0};
  waves[1] = {2, 1.0, 1.0, -1, 0.05, 0.0};
  waves[2] = {2, 1.0, 5.0, -1, 0.03, 0.0};
  const auto t =
      attribute_torque_harmonics({{2.0, 1.5}, {6.0, 0.9}, {4.0, 0.1}}, waves, m, {5.0}, 0.25);
  REQUIRE(t.size() == 3);
  CHECK(t[0].source == "ν=1 h=1 forward × ν=1 h=1 backward");
  CHECK_THAT(t[0].label, Catch::Contains("2f pulsation"));
  CHECK_THAT(t[1].label, Catch::Contains("6f family"));
  // 4f: the backward fundamental with the backward 5th (h −1 − (−5) = 4).
  CHECK(t[2].label == "supply time harmonics 1 × 5");
  // Without a 5th in the currents, the same waves are not put down to the supply.
  const auto u = attribute_torque_harmonics({{6.0, 0.9}}, waves, m, {}, 0.25);
  CHECK(u[0].label == "wave interaction");
  // A space-fundamental wave at time order −17 that the currents do not carry (slotting makes
  // it) beats with the fundamental at 18f = Q/p·f: stator slot ripple, not a supply harmonic.
  waves.push_back({2, 1.0, 17.0, -1, 0.01, 0.0});
  const auto v = attribute_torque_harmonics({{18.0, 0.5}}, waves, m, {}, 0.25);
  CHECK(v[0].label == "stator slot ripple");
}
