// The case reader: units at the edges, defaults, where keys were written.
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

#include "cases/case_reader.hpp"
#include "test_support.hpp"

using namespace gapflux;

TEST_CASE("demo case reads with SI units and documented defaults", "[cases]") {
  const Case c = read_case_file(test::example("pump_4p36s.toml"));
  CHECK(c.machine.poles == 4);
  CHECK(c.machine.pole_pairs() == 2);
  CHECK(c.machine.stack_length_m == Approx(0.150).epsilon(1e-15));
  CHECK(c.stator.bore_diameter_m == Approx(0.136).epsilon(1e-15));
  CHECK(c.stator.slot.shape == SlotShape::semi_closed);
  CHECK(c.stator.slot.wedge_angle_rad == Approx(25.0 * std::numbers::pi / 180.0));
  CHECK(c.rotor.bar.shape == BarShape::teardrop);
  CHECK(c.winding.coil_pitch_slots == 7);
  // Balanced phases by default: b lags a by 120°, c by 240° (design.md §4).
  CHECK(c.supply.phases[1].angle_rad == Approx(-2.0 * std::numbers::pi / 3.0));
  CHECK(c.supply.phases[2].angle_rad == Approx(-4.0 * std::numbers::pi / 3.0));
  CHECK(c.supply.phases[2].rms_a == Approx(6.5));
  CHECK(c.mesh.band_nodes == 2016);
  CHECK(c.mesh.growth_rate == Approx(0.2));
}

TEST_CASE("defaults: full-pitch coils, one path, M400-50A iron", "[cases]") {
  const Case c = read_case_file(test::example("reference_radial_4p24s.toml"));
  CHECK(c.winding.coil_pitch_slots == 6);  // Q/(2p) = 24/4
  CHECK(c.winding.parallel_paths == 1);
  CHECK(c.winding.layers == 1);
  CHECK(c.materials.stator_iron == "M400-50A");
  CHECK(c.rotor.kind == RotorKind::smooth);
  CHECK(c.mesh.order == 2);
  CHECK(c.mesh.band_nodes == 0);  // resolved later from the airgap size
}

TEST_CASE("source positions point at the key's line", "[cases]") {
  const Case c = read_case_file(test::example("pump_4p36s.toml"));
  const std::string text = test::read_text(test::example("pump_4p36s.toml"));
  // Line of "tooth_width_mm" in the file, counted here independently.
  int line = 1;
  const auto at = text.find("tooth_width_mm");
  for (std::size_t i = 0; i < at; ++i) line += text[i] == '\n';
  CHECK(c.sources.find("stator.slot.tooth_width_mm").line == line);
  // A key that was not written falls back to its table.
  CHECK(c.sources.find("stator.slot.wedge_height_mm").line == c.sources.find("stator.slot").line);
}

TEST_CASE("per-phase supply overrides keep the other phases balanced", "[cases]") {
  const std::string text = test::read_text(test::example("pump_4p36s.toml")) +
                           "\n[supply.phases]\nb = { rms_a = 23.1 }\nc = { angle_deg = -235.0 }\n";
  const Case c = read_case_text(text, "inline.toml");
  CHECK(c.supply.phases[0].rms_a == Approx(6.5));
  CHECK(c.supply.phases[1].rms_a == Approx(23.1));
  CHECK(c.supply.phases[1].angle_rad == Approx(-2.0 * std::numbers::pi / 3.0));
  CHECK(c.supply.phases[2].angle_rad == Approx(-235.0 * std::numbers::pi / 180.0));
}

TEST_CASE("integers are accepted where a number is asked for", "[cases]") {
  std::string text = test::read_text(test::example("pump_4p36s.toml"));
  text.replace(text.find("stack_length_mm = 150.0"), 23, "stack_length_mm = 150");
  CHECK(read_case_text(text, "inline.toml").machine.stack_length_m == Approx(0.15));
}
