// Lamination pieces against closed-form areas computed here, independently of the builders.
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "test_support.hpp"

using namespace gapflux;

namespace {

constexpr double pi = std::numbers::pi;

double area_of_kind(const Lamination& lam, RegionKind kind) {
  double a = 0.0;
  for (const Piece& p : lam.pieces) {
    if (p.tag.kind != kind) continue;
    a += signed_area(p.outer);
    for (const Outline& h : p.holes) a += signed_area(h);
  }
  return a;
}

Case edited(const std::string& example, const std::string& find, const std::string& replace) {
  std::string text = test::read_text(test::example(example));
  text.replace(text.find(find), find.size(), replace);
  return read_case_text(text, example);
}

}  // namespace

TEST_CASE("outline areas: Green's theorem on lines and arcs", "[geometry]") {
  // Closed forms: unit square 1; circle πr²; annular sector θ/2·(b² − a²) (any geometry text).
  CHECK(signed_area(polygon({{0, 0}, {1, 0}, {1, 1}, {0, 1}})) == Approx(1.0).epsilon(1e-15));
  CHECK(signed_area(circle({0.3, -0.2}, 0.7)) == Approx(pi * 0.49).epsilon(1e-14));
  CHECK(signed_area(annular_sector(0.2, 0.5, 0.1, 2.0)) ==
        Approx(0.5 * 1.9 * (0.25 - 0.04)).epsilon(1e-14));
  CHECK(signed_area(annular_sector(0.0, 0.5, 0.0, pi)) == Approx(0.125 * pi).epsilon(1e-14));
  // Rotation keeps the area.
  CHECK(signed_area(rotated(circle({0.3, 0.1}, 0.2), 1.234)) == Approx(pi * 0.04).epsilon(1e-14));
}

TEST_CASE("symmetry from slots, bars and poles", "[geometry]") {
  // The field repeats every pole pair and flips sign every pole (common practice, no source);
  // the sector must also repeat the slots and bars.
  auto s = choose_symmetry(36, 28, 4, false);
  CHECK(s.sectors == 4);
  CHECK(s.antiperiodic);
  CHECK(s.slots_in_sector == 9);
  CHECK(s.bars_in_sector == 7);
  s = choose_symmetry(24, 20, 2, false);
  CHECK(s.sectors == 2);
  CHECK(s.antiperiodic);
  s = choose_symmetry(24, 22, 4, false);  // gcd 2: one pole pair per sector
  CHECK(s.sectors == 2);
  CHECK_FALSE(s.antiperiodic);
  s = choose_symmetry(48, 0, 8, false);  // smooth rotor: slots and poles only
  CHECK(s.sectors == 8);
  CHECK(s.antiperiodic);
  s = choose_symmetry(36, 28, 4, true);
  CHECK(s.sectors == 1);
  CHECK(s.sector_angle_rad == Approx(2 * pi));
}

TEST_CASE("radial-slot stator and smooth rotor: every area in closed form", "[geometry]") {
  const Case c = read_case_file(test::example("reference_radial_4p24s.toml"));
  const Lamination lam = build_lamination(c);
  const double ts = pi / 2;  // quarter model
  REQUIRE(lam.symmetry.sectors == 4);
  const double R_bore = 0.060, R_rot = 0.059, R_sh = 0.020;
  const double g = R_bore - R_rot;
  const double beta = 7.5 * pi / 180, depth = 0.020;
  // Annular sectors: θ/2·(b² − a²).
  const double slot = 0.5 * beta * (std::pow(R_bore + depth, 2) - R_bore * R_bore);
  CHECK(area_of_kind(lam, RegionKind::coil_side) == Approx(6 * slot).epsilon(1e-12));
  CHECK(area_of_kind(lam, RegionKind::airgap_stator) ==
        Approx(0.5 * ts * (R_bore * R_bore - std::pow(R_rot + 2 * g / 3, 2))).epsilon(1e-12));
  CHECK(area_of_kind(lam, RegionKind::airgap_rotor) ==
        Approx(0.5 * ts * (std::pow(R_rot + g / 3, 2) - R_rot * R_rot)).epsilon(1e-12));
  CHECK(area_of_kind(lam, RegionKind::shaft) == Approx(0.5 * ts * R_sh * R_sh).epsilon(1e-12));
  CHECK(lam.slot.slot_area_m2 == Approx(slot).epsilon(1e-12));
}

TEST_CASE("open flat-bottomed slot: rectangle less the bore's circular segment", "[geometry]") {
  // Change the reference stator to open parallel slots, 6 mm wide, 20 mm deep, flat bottom.
  const Case c =
      edited("reference_radial_4p24s.toml", "shape = \"open_radial\"\nslot_angle_deg = 7.5",
             "shape = \"open\"\nslot_width_mm = 6.0\nbottom = \"flat\"");
  const Lamination lam = build_lamination(c);
  const double R = 0.060, w = 0.006, x_max = R + 0.020;
  const double x_b = std::sqrt(R * R - w * w / 4);
  // Circular segment cut off by a chord of half-angle φ: ½R²(2φ − sin 2φ) (any geometry text).
  const double phi = std::asin(w / (2 * R));
  const double segment = 0.5 * R * R * (2 * phi - std::sin(2 * phi));
  const double slot = w * (x_max - x_b) - segment;
  CHECK(lam.slot.slot_area_m2 == Approx(slot).epsilon(1e-12));
  CHECK(area_of_kind(lam, RegionKind::coil_side) == Approx(6 * slot).epsilon(1e-12));
  CHECK(lam.slot.tooth_width_min_m ==
        Approx(2 * (x_b * std::sin(pi / 24) - 0.5 * w * std::cos(pi / 24))));
}

TEST_CASE("bars: round, teardrop and rectangular areas in closed form", "[geometry]") {
  {
    const Lamination lam = build_lamination(read_case_file(test::example("pump_4p36s.toml")));
    // Teardrop of end radii r1 (outer) and r2 with centres d apart, joined by their common
    // outer tangents. From the outer centre, the tangent point lies at angle a from the bar's
    // axis with cos a = −(r1 − r2)/d (the tangent from a point, r2 → 0, gives the textbook
    // cos(π − a) = r1/d): more than a half circle of the larger end shows. Area: two sectors
    // r1²·a + r2²·(π − a) plus two right trapezoids (r1 + r2)·d·sin a (plane geometry).
    const double r1 = 0.0035, r2 = 0.0020, d = 0.021 - r1 - r2;
    const double a = std::acos(-(r1 - r2) / d);
    const double teardrop = r1 * r1 * a + r2 * r2 * (pi - a) + (r1 + r2) * d * std::sin(a);
    CHECK(lam.bar.bar_area_m2 == Approx(teardrop).epsilon(1e-12));
    CHECK(area_of_kind(lam, RegionKind::bar) == Approx(7 * teardrop).epsilon(1e-12));
  }
  {
    const Lamination lam = build_lamination(read_case_file(test::example("compressor_2p24s.toml")));
    CHECK(lam.bar.bar_area_m2 == Approx(0.0032 * 0.012).epsilon(1e-12));
    // Slit: 1.0 mm wide from the bar top (0.6 mm under the surface) to the surface arc:
    // rectangle to the chord less... the arc bulges outward, so plus the circular segment.
    const double R = 0.04265, w = 0.001, x_top = R - 0.0006;
    const double x_s = std::sqrt(R * R - w * w / 4);
    const double phi = std::asin(w / (2 * R));
    const double slit = w * (x_s - x_top) + 0.5 * R * R * (2 * phi - std::sin(2 * phi));
    CHECK(area_of_kind(lam, RegionKind::bar_opening) == Approx(10 * slit).epsilon(1e-12));
  }
  {
    const Case c = edited(
        "pump_4p36s.toml",
        "shape = \"teardrop\"\ntop_radius_mm = 3.5\nbottom_radius_mm = 2.0\nheight_mm = 21.0",
        "shape = \"round\"\ndiameter_mm = 5.0");
    const Lamination lam = build_lamination(c);
    CHECK(lam.bar.bar_area_m2 == Approx(pi * 0.0025 * 0.0025).epsilon(1e-12));
  }
}

TEST_CASE("double-layer coil sides share the winding area equally", "[geometry]") {
  for (const char* name : {"pump_4p36s.toml", "compressor_2p24s.toml"}) {
    const Lamination lam = build_lamination(read_case_file(test::example(name)));
    CHECK(lam.slot.coil_side_area_m2[0] == Approx(lam.slot.coil_side_area_m2[1]).epsilon(1e-9));
    CHECK(lam.slot.coil_side_area_m2[0] + lam.slot.coil_side_area_m2[1] ==
          Approx(lam.slot.winding_area_m2).epsilon(1e-12));
  }
}

TEST_CASE("semi-closed slot with parallel teeth: trapezoids, tip and segment", "[geometry]") {
  // Flat-bottomed variant of the demo slot, its area assembled here from elementary shapes.
  const Case c = edited("pump_4p36s.toml", "bottom = \"round\"", "bottom = \"flat\"");
  const Lamination lam = build_lamination(c);
  const double R = 0.068, a = pi / 36, t = 0.0056, w_o = 0.003, h_t = 0.0008;
  const double tan_w = std::tan(25.0 * pi / 180), x_max = R + 0.022;
  const auto y = [&](double x) { return (x * std::sin(a) - t / 2) / std::cos(a); };
  const double x_b = std::sqrt(R * R - w_o * w_o / 4), x_t = x_b + h_t;
  // Tip underside meets the wall where x_w − x_t = (y(x_w) − w_o/2)·tan_w; bisect for it.
  double lo = x_t, hi = x_max;
  for (int i = 0; i < 200; ++i) {
    const double mid = 0.5 * (lo + hi);
    ((mid - x_t) < (y(mid) - w_o / 2) * tan_w ? lo : hi) = mid;
  }
  const double x_w = 0.5 * (lo + hi);
  const double phi = std::asin(w_o / (2 * R));
  const double opening = w_o * (x_t - x_b) - 0.5 * R * R * (2 * phi - std::sin(2 * phi)) +
                         (x_w - x_t) * (w_o / 2 + y(x_w));
  const double body = (x_max - x_w) * (y(x_w) + y(x_max));
  CHECK(lam.slot.winding_area_m2 == Approx(body).epsilon(1e-10));
  CHECK(lam.slot.slot_area_m2 == Approx(body + opening).epsilon(1e-10));
  CHECK(lam.slot.yoke_height_m == Approx(0.108 - std::hypot(x_max, y(x_max))).epsilon(1e-12));
}

TEST_CASE("tooth index from the angle", "[geometry]") {
  // Slot k is centred at (k + ½)·2π/Q, so tooth k is centred at k·2π/Q.
  CHECK(stator_tooth_at(0.0, 36) == 0);
  CHECK(stator_tooth_at(2 * pi / 36 * 0.49, 36) == 0);
  CHECK(stator_tooth_at(2 * pi / 36 * 0.51, 36) == 1);
  CHECK(stator_tooth_at(-0.01, 36) == 0);
  CHECK(stator_tooth_at(2 * pi - 0.2, 36) == 35);
}
