// Iron loss: the model fitted to the grade figure, its scaling, and the per-triangle sum from
// sampled fields.
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "materials/library.hpp"
#include "postproc/losses.hpp"
#include "postproc/saturation.hpp"
#include "solver/winding_resistance.hpp"
#include "test_support.hpp"

using namespace gapflux;

namespace {

constexpr double pi = std::numbers::pi;

// Two triangles of stator iron making a 10 mm × 10 mm square.
Mesh square_of_iron() {
  Mesh m;
  m.order = 1;
  m.nodes = {Vec2(0, 0), Vec2(0.01, 0), Vec2(0.01, 0.01), Vec2(0, 0.01)};
  m.triangles = {0, 1, 2, 0, 2, 3};
  m.triangle_region = {0, 0};
  MeshRegion r;
  r.name = "stator_iron";
  r.tag.kind = RegionKind::stator_iron;
  m.regions = {r};
  return m;
}

}  // namespace

// The grade name encodes the loss at 1.5 T, 50 Hz (EN 10106 / IEC 60404-8-4 naming: M270-35A is
// 2.70 W/kg at 0.35 mm): the fit reproduces it exactly by construction, so the check is on the
// split. The classical part is π²σd²(fB)²/(6ρ) (Bertotti 1998, ch. 12) with σ = 1.92e6 S/m and
// ρ = 7600 kg/m³ (from memory), worked here by hand: 0.2863 W/kg.
TEST_CASE("iron loss model: the grade figure at 1.5 T, 50 Hz and the exponents' scaling",
          "[postproc][losses]") {
  const Material* m = find_material("M270-35A");
  REQUIRE(m != nullptr);
  REQUIRE(m->iron_loss.available());
  const IronLossModel& k = m->iron_loss;
  CHECK(specific_iron_loss_w_per_kg(k, 50.0, 1.5) == Approx(2.70).epsilon(1e-12));
  const double classical = pi * pi * 1.92e6 * 0.35e-3 * 0.35e-3 / (6.0 * 7600.0) * 75.0 * 75.0;
  CHECK(classical == Approx(0.2863).epsilon(1e-3));
  CHECK(k.k_c * 75.0 * 75.0 == Approx(classical).epsilon(1e-12));
  const double excess = 0.27, hysteresis = 2.70 - classical - excess;
  // Doubling f: hysteresis ×2, classical ×4, excess ×2^1.5. Halving B: ×1/4, ×1/4, ×2^−1.5.
  CHECK(specific_iron_loss_w_per_kg(k, 100.0, 1.5) ==
        Approx(2 * hysteresis + 4 * classical + std::pow(2.0, 1.5) * excess).epsilon(1e-12));
  CHECK(specific_iron_loss_w_per_kg(k, 50.0, 0.75) ==
        Approx(hysteresis / 4 + classical / 4 + excess / std::pow(2.0, 1.5)).epsilon(1e-12));
  // The other grades reach their figures too.
  CHECK(specific_iron_loss_w_per_kg(find_material("M400-50A")->iron_loss, 50, 1.5) ==
        Approx(4.00).epsilon(1e-12));
  CHECK(specific_iron_loss_w_per_kg(find_material("M800-65A")->iron_loss, 50, 1.5) ==
        Approx(8.00).epsilon(1e-12));
}

TEST_CASE(
    "iron loss from sampled fields: a uniform alternating 1.5 T at 50 Hz gives the grade "
    "figure, and harmonics and a rotating field add as stated",
    "[postproc][losses]") {
  const Mesh mesh = square_of_iron();
  const Material* m = find_material("M270-35A");
  const std::vector<const Material*> material = {m, m};
  const int steps = 40;
  const double stack = 0.1, mass = 0.01 * 0.01 * stack * 7600.0;
  const auto sample = [&](auto bx, auto by) {
    std::vector<double> rows;
    for (int n = 0; n < steps; ++n) {
      const double wt = 2 * pi * n / steps;
      for (int t = 0; t < 2; ++t) rows.insert(rows.end(), {bx(wt), by(wt)});
    }
    return rows;
  };
  // Alternating along x: the grade figure × mass (round-off of the DFT: 1e-12).
  const IronLoss a =
      iron_loss(mesh, material,
                sample([](double wt) { return 1.5 * std::sin(wt); }, [](double) { return 0.0; }),
                steps, 50.0, stack, 1);
  CHECK(a.stator_w == Approx(2.70 * mass).epsilon(1e-12));
  CHECK(a.rotor_w == 0.0);
  CHECK(a.density_w_per_m3[0] == Approx(2.70 * 7600.0).epsilon(1e-12));
  // With a 5th of 0.1 T: the model's value at 250 Hz, 0.1 T adds.
  const IronLoss h =
      iron_loss(mesh, material,
                sample([](double wt) { return 1.5 * std::sin(wt) + 0.1 * std::cos(5 * wt); },
                       [](double) { return 0.0; }),
                steps, 50.0, stack, 1);
  CHECK(
      h.stator_w ==
      Approx((2.70 + specific_iron_loss_w_per_kg(m->iron_loss, 250.0, 0.1)) * mass).epsilon(1e-12));
  // A circularly rotating 1.5 T: two alternating components, twice the figure (the stated
  // approximation; measured rotational loss differs).
  const IronLoss r = iron_loss(mesh, material,
                               sample([](double wt) { return 1.5 * std::cos(wt); },
                                      [](double wt) { return 1.5 * std::sin(wt); }),
                               steps, 50.0, stack, 1);
  CHECK(r.stator_w == Approx(2 * 2.70 * mass).epsilon(1e-12));
}

// Copper: R = ρ(T)·N_s·l_turn/(a·A_c) worked by hand for the invented reference stator: 24 open
// radial slots of 7.5° from r = 60 to 80 mm, single layer, 10 turns per coil, 4 poles → 8 coil
// sides of phase a, N_s = 8·10/2 = 40; coil side = the whole slot, (7.5/360)·π·(0.08² − 0.06²)
// = 1.8326e-4 m²; fill 0.4 → A_c = 7.330e-6 m²; l_turn = 2·(0.100 + 0.150) = 0.5 m; copper at
// 75 °C: 5.80e7/(1 + 0.00393·55) S/m (handbook values, from memory). Tolerance 1e-9: the areas
// are exact for radial slots.
TEST_CASE("stator phase resistance and copper loss against a hand calculation",
          "[postproc][losses]") {
  std::string text = test::read_text(test::example("reference_radial_4p24s.toml"));
  text.replace(text.find("turns_per_coil = 10"), 19,
               "turns_per_coil = 10\nfill_factor = 0.4\nend_winding_length_mm = 150.0\n"
               "conductor_temperature_c = 75.0");
  const Case c = read_case_text(text, "inline.toml");
  const Lamination lam = build_lamination(c);
  const WindingResistance r = phase_resistance(c, lam, *find_material("copper"));
  const double side = 7.5 / 360.0 * pi * (0.08 * 0.08 - 0.06 * 0.06);
  const double area = 0.4 * side / 10.0;
  const double sigma = 5.80e7 / (1.0 + 0.00393 * 55.0);
  CHECK(r.conductor_area_m2 == Approx(area).epsilon(1e-9));
  CHECK(r.turn_length_m == Approx(0.5).epsilon(1e-12));
  CHECK_FALSE(r.end_winding_estimated);
  CHECK(r.resistance_ohm == Approx(40.0 * 0.5 / (sigma * area)).epsilon(1e-9));
  // Without a given end-winding length the estimate is used and said so.
  const Case d = read_case_file(test::example("reference_radial_4p24s.toml"));
  const WindingResistance e = phase_resistance(d, build_lamination(d), *find_material("copper"));
  CHECK(e.end_winding_estimated);
  CHECK(e.end_winding_length_m > 0.0);
}

TEST_CASE("saturation: area-weighted percentiles and the deep-saturation threshold",
          "[postproc][saturation]") {
  // Percentiles of a weighted sample (the definition: the least value with at least the
  // fraction q of the weight at or below it; any statistics text).
  const std::vector<std::pair<double, double>> values = {{2.5, 0.01}, {1.0, 0.5}, {1.8, 0.49}};
  CHECK(area_percentile(values, 0.5) == 1.0);   // half the area lies at 1.0 T
  CHECK(area_percentile(values, 0.95) == 1.8);  // one small corner triangle does not set it
  CHECK(area_percentile(values, 1.0) == 2.5);
  CHECK(area_percentile({}, 0.5) == 0.0);
  // The default threshold is where the curve's own differential relative permeability
  // dB/(μ0·dH) reaches 10, computed here by a central difference of H(B).
  for (const Material& m : builtin_materials()) {
    if (!m.curve) continue;
    const double b = m.curve->deep_saturation_tesla();
    const double h = 1e-4;
    const auto mu_r = [&](double at) {
      return 2.0 * h / (mu0 * (m.curve->h_of_b(at + h) - m.curve->h_of_b(at - h)));
    };
    INFO(m.name << ": " << b << " T");
    CHECK(mu_r(b - 2e-3) > 10.0);
    CHECK(mu_r(b + 2e-3) < 10.0);
    CHECK(b > m.curve->knee_tesla());
  }
}
