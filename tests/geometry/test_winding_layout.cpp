// Winding layouts against the textbook winding factors:
//   k_d = sin(qνα/2) / (q·sin(να/2)),  k_p = sin(ν·(y/τ)·π/2)
// (Pyrhönen, Jokinen, Hrabovcová, Design of Rotating Electrical Machines, ch. 2), α the slot
// angle in electrical radians, τ the pole pitch in slots; for a fractional q = z/n in lowest
// terms the distribution factor is that of z slots per belt spread over the belt,
// k_d = sin(νπ/6) / (z·sin(νπ/(6z))) (same reference).
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "cases/case_reader.hpp"
#include "geometry/winding_layout.hpp"
#include "test_support.hpp"

using namespace gapflux;

namespace {

constexpr double pi = std::numbers::pi;

WindingLayout layout(int slots, int poles, int layers, int pitch) {
  std::string text = test::read_text(test::example("pump_4p36s.toml"));
  const auto set = [&](const std::string& key, const std::string& value) {
    const auto at = text.find(key + " = ");
    const auto end = text.find('\n', at);
    text.replace(at, end - at, key + " = " + value);
  };
  set("slots", std::to_string(slots));
  set("poles", std::to_string(poles));
  set("layers", std::to_string(layers));
  set("coil_pitch_slots", std::to_string(pitch));
  return build_winding_layout(read_case_text(text, "inline.toml"));
}

double kd_integral(double q, double nu, double alpha) {
  return std::sin(q * nu * alpha / 2) / (q * std::sin(nu * alpha / 2));
}

void check_factors(const WindingLayout& w, double q, double alpha, double pitch_over_tau) {
  for (double nu : {1.0, 5.0, 7.0, 11.0, 13.0}) {
    INFO("order " << nu);
    const WindingFactor f = winding_factor(w, nu);
    CHECK(f.kd == Approx(std::abs(kd_integral(q, nu, alpha))).margin(1e-12));
    CHECK(f.kp == Approx(std::abs(std::sin(nu * pitch_over_tau * pi / 2))).margin(1e-12));
    CHECK(f.kw == Approx(f.kd * f.kp).margin(1e-12));
  }
}

}  // namespace

TEST_CASE("24 slots, 2 poles, single layer, full pitch", "[geometry][winding]") {
  const WindingLayout w = layout(24, 2, 1, 12);
  check_factors(w, 4, 2 * pi / 24, 1.0);  // a single layer acts as full pitch
  CHECK(w.factors[0].kw == Approx(0.957662).epsilon(1e-6));
}

TEST_CASE("36 slots, 4 poles, double layer, 7/9 pitch", "[geometry][winding]") {
  const WindingLayout w = layout(36, 4, 2, 7);
  check_factors(w, 3, 2 * 2 * pi / 36, 7.0 / 9.0);
  CHECK(w.factors[0].kw == Approx(0.959795 * 0.939693).epsilon(1e-5));
  // Series turns: 2Q/3 coil sides per phase, two per coil, 9 turns, one path.
  CHECK(w.series_turns_per_phase == Approx(24.0 / 2 * 9));
}

TEST_CASE("48 slots, 4 poles, double layer, 10/12 pitch", "[geometry][winding]") {
  const WindingLayout w = layout(48, 4, 2, 10);
  check_factors(w, 4, 2 * 2 * pi / 48, 10.0 / 12.0);
}

TEST_CASE("fractional slot: 27 slots, 6 poles (q = 3/2), double layer, pitch 4",
          "[geometry][winding]") {
  const WindingLayout w = layout(27, 6, 2, 4);
  for (double nu : {1.0, 5.0, 7.0}) {
    INFO("order " << nu);
    const WindingFactor f = winding_factor(w, nu);
    const double z = 3;
    CHECK(
        f.kd ==
        Approx(std::abs(std::sin(nu * pi / 6) / (z * std::sin(nu * pi / (6 * z))))).margin(1e-12));
    CHECK(f.kp == Approx(std::abs(std::sin(nu * (4.0 / 4.5) * pi / 2))).margin(1e-12));
  }
}

TEST_CASE("slot harmonics have the fundamental's winding factor", "[geometry][winding]") {
  // ν = kQ/p ± 1 for integral q: the slot phasors repeat, so |k_w| equals k_w1 (common
  // practice, no source).
  const WindingLayout w = layout(36, 4, 2, 7);
  const double kw1 = winding_factor(w, 1).kw;
  for (double nu : {17.0, 19.0, 35.0, 37.0})
    CHECK(winding_factor(w, nu).kw == Approx(kw1).epsilon(1e-12));
  int slot_harmonics = 0;
  for (const WindingFactor& f : w.factors) slot_harmonics += f.slot_harmonic;
  CHECK(slot_harmonics == 4);
}

TEST_CASE("phases: equal sides, axes 120° apart, b ahead of a", "[geometry][winding]") {
  const WindingLayout w = layout(36, 4, 2, 7);
  int count[3] = {0, 0, 0};
  for (const CoilSide& s : w.sides) count[s.phase]++;
  CHECK(count[0] == 24);
  CHECK(count[1] == 24);
  CHECK(count[2] == 24);
  CHECK(std::remainder(w.phase_axis_el_rad[1] - w.phase_axis_el_rad[0], 2 * pi) ==
        Approx(2 * pi / 3));
  CHECK(std::remainder(w.phase_axis_el_rad[2] - w.phase_axis_el_rad[0], 2 * pi) ==
        Approx(-2 * pi / 3));
  // Repeats with a sign flip every pole (9 slots) and without one every pole pair.
  CHECK(w.repeats(9, true));
  CHECK(w.repeats(18, false));
  CHECK_FALSE(w.repeats(9, false));
}

TEST_CASE("slot and pole counts without a balanced winding are bad input", "[geometry][winding]") {
  // 20 slots, 4 poles: Q/(3·gcd(Q, p)) = 20/6 is no integer.
  CHECK_THROWS_AS(layout(20, 4, 2, 4), InputError);
}
