// The case reader: units at the edges, defaults, where keys were written.
#include <catch2/catch.hpp>

#include <fmt/format.h>

#include <cmath>
#include <complex>
#include <map>
#include <numbers>

#include "cases/case_reader.hpp"
#include "solver/supply_currents.hpp"
#include "solver/time_grid.hpp"
#include "test_support.hpp"

using namespace gapflux;

TEST_CASE("demo case reads with SI units and documented defaults", "[cases]") {
  const Case c = read_case_file(test::example("pump_4p36s.toml"));
  CHECK(c.machine.poles == 4);
  CHECK(c.machine.pole_pairs() == 2);
  CHECK(c.machine.stack_length_m == Approx(0.200).epsilon(1e-15));
  CHECK(c.stator.bore_diameter_m == Approx(0.136).epsilon(1e-15));
  CHECK(c.stator.slot.shape == SlotShape::semi_closed);
  CHECK(c.stator.slot.wedge_angle_rad == Approx(25.0 * std::numbers::pi / 180.0));
  CHECK(c.rotor.bar.shape == BarShape::teardrop);
  CHECK(c.winding.coil_pitch_slots == 7);
  // Balanced phases by default: b lags a by 120°, c by 240° (design.md §4).
  CHECK(c.supply.phases[1].angle_rad == Approx(-2.0 * std::numbers::pi / 3.0));
  CHECK(c.supply.phases[2].angle_rad == Approx(-4.0 * std::numbers::pi / 3.0));
  CHECK(c.supply.phases[2].rms == Approx(9.0));
  CHECK(c.mesh.band_nodes == 1512);
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
  std::string text = test::read_text(test::example("pump_4p36s.toml")) +
                     "\n[supply.phases]\nb = { rms_a = 23.1 }\nc = { angle_deg = -235.0 }\n";
  // (The demo's [supply] table comes last; the set carries zero sequence, which the default
  // isolated star would remove: this test reads the description itself, with the neutral.)
  text.replace(text.find("feed = \"current\""), 16,
               "feed = \"current\"\nconnection = \"star_neutral\"");
  const Case c = read_case_text(text, "inline.toml");
  CHECK(c.supply.phases[0].rms == Approx(9.0));
  CHECK(c.supply.phases[1].rms == Approx(23.1));
  CHECK(c.supply.phases[1].angle_rad == Approx(-2.0 * std::numbers::pi / 3.0));
  CHECK(c.supply.phases[2].angle_rad == Approx(-235.0 * std::numbers::pi / 180.0));
}

TEST_CASE("integers are accepted where a number is asked for", "[cases]") {
  std::string text = test::read_text(test::example("pump_4p36s.toml"));
  text.replace(text.find("stack_length_mm = 200.0"), 23, "stack_length_mm = 200");
  CHECK(read_case_text(text, "inline.toml").machine.stack_length_m == Approx(0.2));
}

namespace {

// The static pump case with its [supply] table replaced.
std::string with_supply(const std::string& supply, const char* base = "pump_4p36s.toml") {
  std::string text = test::read_text(test::example(base));
  const auto a = text.find("[supply]");
  const auto b = text.find("\n[", a + 1);
  return text.substr(0, a) + supply + text.substr(b);
}

constexpr double deg = std::numbers::pi / 180.0;

std::complex<double> phasor(const PhaseSpec& p) {
  return std::polar(p.rms, p.angle_rad);
}

}  // namespace

// Fortescue's inverse (Fortescue 1918): a = X1 + X2 + X0, b = α²X1 + αX2 + X0,
// c = αX1 + α²X2 + X0, with α = e^{j120°}; written out by hand below.
TEST_CASE("a supply given by sequences resolves to the phases Fortescue's inverse gives",
          "[cases][supply]") {
  const Case c = read_case_text(with_supply("[supply]\nconnection = \"star_neutral\"\n"
                                            "[supply.sequence]\n"
                                            "positive = { rms_a = 10.0, angle_deg = 0.0 }\n"
                                            "negative = { rms_a = 1.0, angle_deg = 30.0 }\n"
                                            "zero = { rms_a = 0.5, angle_deg = -45.0 }\n"),
                                "inline.toml");
  CHECK(c.supply.form == SupplyForm::sequence);
  const auto x1 = std::polar(10.0, 0.0), x2 = std::polar(1.0, 30 * deg),
             x0 = std::polar(0.5, -45 * deg);
  const auto a = std::polar(1.0, 120 * deg), a2 = std::polar(1.0, 240 * deg);
  CHECK(std::abs(phasor(c.supply.phases[0]) - (x1 + x2 + x0)) < 1e-12);
  CHECK(std::abs(phasor(c.supply.phases[1]) - (a2 * x1 + a * x2 + x0)) < 1e-12);
  CHECK(std::abs(phasor(c.supply.phases[2]) - (a * x1 + a2 * x2 + x0)) < 1e-12);
}

TEST_CASE("harmonics follow each phase's timing, so their sequence comes from the angles",
          "[cases][supply]") {
  const Case c = read_case_text(
      with_supply("[supply]\nrms_a = 10.0\nconnection = \"star_neutral\"\n"
                  "[supply.phases]\nb = { rms_a = 8.0 }\n"
                  "[[supply.harmonics]]\norder = 5\npercent = 4.0\nangle_deg = 10.0\n"
                  "[[supply.harmonics]]\norder = 2.5\nrms_a = 0.2\nphase = \"c\"\n"),
      "inline.toml");
  REQUIRE(c.supply.harmonics.size() == 2);
  const SupplyComponent& h5 = c.supply.harmonics[0];
  CHECK(h5.order == 5.0);
  CHECK(h5.rms[0] == Approx(0.4));
  CHECK(h5.rms[1] == Approx(0.32));  // 4 % of phase b's own 8 A
  // angle + 5·φ_k: phase b at 10° + 5·(−120°) = −590° ≡ +130°: it leads a by 120°, so the set is
  // negative sequence without a rule saying so.
  CHECK(std::remainder(h5.angle_rad[1] - (10.0 - 600.0) * deg, 2 * std::numbers::pi) ==
        Approx(0.0).margin(1e-12));
  const SupplyComponent& inter = c.supply.harmonics[1];
  CHECK(inter.rms[0] == 0.0);
  CHECK(inter.rms[2] == Approx(0.2));
  // The currents the solver sees: i_a(0) = √2·(10 + 0.4·cos 10°).
  const auto i = supply_phase_currents_a(c.supply, 0.0);
  CHECK(i[0] == Approx(std::sqrt(2.0) * (10.0 + 0.4 * std::cos(10 * deg))).epsilon(1e-12));
}

TEST_CASE("a current feed into an isolated star loses its zero sequence, with a warning",
          "[cases][supply]") {
  // Kirchhoff's current law at an isolated star point: i_a + i_b + i_c = 0 at every instant,
  // so each order's phasors sum to zero; what the description held beyond that is its zero
  // sequence (Fortescue 1918), removed from each phase alike.
  const auto supply = [](const std::string& connection) {
    return "[supply]\nrms_a = 10.0\n" + connection +
           "[supply.phases]\nb = { rms_a = 8.0 }\n"
           "[[supply.harmonics]]\norder = 5\npercent = 4.0\n"
           "[[supply.harmonics]]\norder = 7\nrms_a = 0.3\nphase = \"a\"\n";
  };
  const Case star = read_case_text(with_supply(supply("")), "star.toml");
  const Case neutral =
      read_case_text(with_supply(supply("connection = \"star_neutral\"\n")), "neutral.toml");
  std::complex<double> sum{0, 0}, zero{0, 0};
  for (int k = 0; k < 3; ++k) {
    sum += phasor(star.supply.phases[k]);
    zero += phasor(neutral.supply.phases[k]) / 3.0;
  }
  CHECK(std::abs(sum) < 1e-12);
  // The zero sequence was 1/3·|10 + 8·α² + 10·α| = 2/3 A, 6.7 % of the positive sequence.
  CHECK(std::abs(zero) == Approx(2.0 / 3.0).epsilon(1e-12));
  for (int k = 0; k < 3; ++k)
    CHECK(std::abs(phasor(star.supply.phases[k]) - (phasor(neutral.supply.phases[k]) - zero)) <
          1e-12);
  // Each harmonic order sums to zero over the phases too; the 7th, given on phase a alone,
  // now flows in b and c as well (−0.1 A each, a 0.2 A).
  std::map<double, std::complex<double>> by_order;
  for (const SupplyComponent& h : star.supply.harmonics)
    for (int k = 0; k < 3; ++k) by_order[h.order] += std::polar(h.rms[k], h.angle_rad[k]);
  REQUIRE(by_order.size() == 2);
  for (const auto& [order, total] : by_order) CHECK(std::abs(total) < 1e-12);
  // The instantaneous currents the solver sees sum to zero as well.
  for (double t : {0.0, 0.0013, 0.0071}) {
    const auto i = supply_phase_currents_a(star.supply, t);
    CHECK(std::abs(i[0] + i[1] + i[2]) < 1e-12);
  }
  REQUIRE(star.warnings.size() == 1);
  CHECK_THAT(star.warnings[0], Catch::Contains("supply.phases: the described currents carry "
                                               "0.667 A of zero sequence at order 1"));
  CHECK(neutral.warnings.empty());
}

TEST_CASE("a voltage feed: connection, basis, line-to-line defaults and resistance keys",
          "[cases][supply]") {
  const Case c = read_case_text(
      with_supply("[supply]\nfeed = \"voltage\"\nconnection = \"delta\"\nrms_v = 400.0\n"
                  "[supply.phases]\nbc = { rms_v = 380.0 }\n"
                  "[[supply.harmonics]]\norder = 5\npercent = 3.0\nphase = \"ab\"\n",
                  "pump_4p36s_running.toml"),
      "inline.toml");
  CHECK(c.supply.voltage_fed());
  CHECK(c.supply.connection == Connection::delta);
  // Line-to-line is the default basis of a star or delta; a positive-sequence line set leads
  // its phase set by 30° (common practice, no source), so ab sits at +30°.
  CHECK(c.supply.voltage_basis == VoltageBasis::line_to_line);
  CHECK(c.supply.phases[0].angle_rad == Approx(30 * deg));
  CHECK(c.supply.phases[1].rms == Approx(380.0));
  // Magnitudes only: the angles close the triangle 400, 380, 400 V (Kirchhoff's voltage law);
  // law of cosines for the angle between ab and bc: cos = (400² − 400² − 380²)/(2·400·380).
  const double between = std::acos((400.0 * 400 - 400.0 * 400 - 380.0 * 380) / (2 * 400.0 * 380));
  CHECK(c.supply.phases[1].angle_rad == Approx(30 * deg - between));
  std::complex<double> sum = 0;
  for (const PhaseSpec& p : c.supply.phases) sum += phasor(p);
  CHECK(std::abs(sum) < 1e-9);
  CHECK(c.supply.phases[2].rms == Approx(400.0));
  REQUIRE(c.supply.harmonics.size() == 1);
  CHECK(c.supply.harmonics[0].rms[0] == Approx(12.0));
  CHECK(c.supply.harmonics[0].rms[1] == 0.0);
  const Case n = read_case_text(
      with_supply("[supply]\nfeed = \"voltage\"\nconnection = \"star_neutral\"\nrms_v = 230.0\n",
                  "pump_4p36s_running.toml"),
      "inline.toml");
  CHECK(n.supply.voltage_basis == VoltageBasis::phase);
  CHECK(n.supply.phases[2].angle_rad == Approx(-240 * deg));
  CHECK(n.winding.end_winding_inductance_h < 0.0);  // estimated unless given
}

TEST_CASE("a measured waveform table: read, fundamental detected, interpolated, checked",
          "[cases][supply]") {
  const auto dir = test::temp_dir("waveform");
  // 47.3 Hz with a 10 % fifth, 200 rows per period over 4.5 periods, with a header and comments.
  const double f = 47.3;
  std::string csv = "# invented test record\ntime_s,i_a,i_b,i_c\n";
  std::vector<double> ia;
  for (int n = 0; n <= 900; ++n) {
    const double t = n / (200.0 * f);
    double x[3];
    for (int k = 0; k < 3; ++k) {
      const double phase = 2 * std::numbers::pi * (f * t - k / 3.0);
      x[k] = 10 * std::cos(phase) + 1 * std::cos(5 * phase);
    }
    ia.push_back(x[0]);
    csv += fmt::format("{:.17g},{:.17g},{:.17g},{:.17g}\n", t, x[0], x[1], x[2]);
  }
  test::write_text(dir / "record.csv", csv);
  const std::string study =
      "\n[study]\nkind = \"time_stepping\"\nsteps_per_period = 24\nperiods = 4\nmotion = "
      "\"locked\"\n";
  std::string text = with_supply("[supply]\n[supply.waveform]\nfile = \"record.csv\"\n");
  text.replace(text.find("\n[study]"), std::string("\n[study]").size(), "\n[old_study]");
  // Keep the case's own study table out: a time-stepping study follows.
  text = text.substr(0, text.find("\n[old_study]")) + study;
  test::write_text(dir / "case.toml", text);
  const Case c = read_case_file((dir / "case.toml").string());
  CHECK(c.supply.form == SupplyForm::waveform);
  CHECK(c.supply.frequency_detected);
  // Detection on a clean record of 4.5 periods with a 10 % fifth: measured 5e-8 relative; the
  // check allows 1e-6 (a window-fit estimate, not exact).
  CHECK(c.supply.frequency_hz == Approx(f).epsilon(1e-6));
  // At the table's own rows the interpolation returns the rows.
  CHECK(supply_phase_currents_a(c.supply, 17 / (200.0 * f))[0] == Approx(ia[17]).epsilon(1e-12));
  // Four periods need 4/f s; the table holds 4.5 periods: fine. Ask for six: the grid check
  // names the key that gave the table.
  REQUIRE_NOTHROW(make_time_grid(c, 0.01));
  std::string longer = text;
  longer.replace(longer.find("periods = 4"), 11, "periods = 6");
  test::write_text(dir / "longer.toml", longer);
  const Case d = read_case_file((dir / "longer.toml").string());
  try {
    make_time_grid(d, 0.01);
    FAIL("a table shorter than the study was accepted");
  } catch (const InputError& e) {
    CHECK(e.key_path() == "supply.waveform.file");
    CHECK_THAT(e.message(), Catch::Contains("the table covers"));
    CHECK(e.pos().line > 0);
  }
  // A broken row is reported at the CSV's own line.
  test::write_text(dir / "record.csv", "time_s,i_a,i_b,i_c\n0,1,2,3\n0.001,1,x,3\n");
  try {
    read_case_file((dir / "case.toml").string());
    FAIL("a broken CSV row was accepted");
  } catch (const InputError& e) {
    CHECK(e.file() == (dir / "record.csv").string());
    CHECK(e.pos().line == 3);
    CHECK_THAT(e.message(), Catch::Contains("expected 4 numbers"));
  }
}
