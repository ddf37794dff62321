// The bad-input catalogue: each mutation of a valid demo case must end `gapflux check` with exit
// code 2 and one message that names the file, the line and column, the key path, and what would
// be valid.
#include <fmt/format.h>
#include <catch2/catch.hpp>

#include "test_support.hpp"

using namespace gapflux;

namespace {

struct BadCase {
  const char* name;
  const char* base;  // example file the mutation starts from
  const char* find;  // text replaced ("" = append `replace` at the end)
  const char* replace;
  const char* key;      // key path the message must name
  const char* expect;   // fragment the message must contain (what was wrong / what is valid)
  const char* at_line;  // text on the line the message must point at ("" = do not check)
};

const BadCase catalogue[] = {
    {"unknown key, with a suggestion", "pump_4p36s.toml", "tooth_width_mm = 5.6",
     "tooth_widht_mm = 5.6", "stator.slot.tooth_widht_mm", "did you mean 'tooth_width_mm'",
     "tooth_widht_mm"},
    {"unknown table", "pump_4p36s.toml", "[supply]", "[suply]", "suply", "did you mean 'supply'",
     "[suply]"},
    {"missing required key", "pump_4p36s.toml", "slots = 36\n", "", "stator.slots",
     "required key is missing", "[stator]"},
    {"missing required table", "compressor_2p24s.toml",
     "[supply]\nfrequency_hz = 50.0\nrms_a = 4.0", "", "supply", "required key is missing", ""},
    {"string for an integer", "pump_4p36s.toml", "poles = 4", "poles = \"four\"", "machine.poles",
     "expected an integer", "poles ="},
    {"float for an integer", "pump_4p36s.toml", "poles = 4", "poles = 4.0", "machine.poles",
     "expected an integer", "poles ="},
    {"odd pole count", "pump_4p36s.toml", "poles = 4", "poles = 5", "machine.poles", "must be even",
     "poles ="},
    {"negative length", "pump_4p36s.toml", "stack_length_mm = 200.0", "stack_length_mm = -200.0",
     "machine.stack_length_mm", "must be a length in mm in (0", "stack_length_mm"},
    {"zero tooth width", "pump_4p36s.toml", "tooth_width_mm = 5.6", "tooth_width_mm = 0.0",
     "stator.slot.tooth_width_mm", "must be a length in mm in (0", "tooth_width_mm"},
    {"bore not inside the outer diameter", "pump_4p36s.toml", "bore_diameter_mm = 136.0",
     "bore_diameter_mm = 220.0", "stator.bore_diameter_mm", "must be smaller than the outer",
     "bore_diameter_mm"},
    {"rotor not smaller than the bore", "pump_4p36s.toml", "outer_diameter_mm = 135.1",
     "outer_diameter_mm = 136.0", "rotor.outer_diameter_mm", "must be smaller than the stator bore",
     "outer_diameter_mm = 136.0"},
    {"slot opening wider than the slot pitch", "pump_4p36s.toml", "opening_width_mm = 3.0",
     "opening_width_mm = 12.5", "stator.slot.opening_width_mm", "narrower than the slot pitch",
     "opening_width_mm"},
    {"slot opening wider than the slot body", "pump_4p36s.toml", "opening_width_mm = 3.0",
     "opening_width_mm = 7.5", "stator.slot.opening_width_mm", "narrower than the slot body",
     "opening_width_mm"},
    {"slot deeper than the yoke allows", "pump_4p36s.toml", "slot_depth_mm = 22.0",
     "slot_depth_mm = 40.5", "stator.slot.slot_depth_mm", "reaches through the yoke",
     "slot_depth_mm"},
    {"slot too shallow for its tips", "pump_4p36s.toml", "slot_depth_mm = 22.0",
     "slot_depth_mm = 1.2", "stator.slot.slot_depth_mm", "too shallow", "slot_depth_mm"},
    {"parallel slot leaves no tooth", "compressor_2p24s.toml", "slot_width_mm = 5.2",
     "slot_width_mm = 12.6", "stator.slot.slot_width_mm", "teeth would have no width",
     "slot_width_mm"},
    {"wedge angle out of range", "pump_4p36s.toml", "wedge_angle_deg = 25.0",
     "wedge_angle_deg = 80.0", "stator.slot.wedge_angle_deg", "must be in [0, 75] degrees",
     "wedge_angle_deg"},
    {"misspelt shape value", "pump_4p36s.toml", "shape = \"semi_closed\"",
     "shape = \"semi-closed\"", "stator.slot.shape", "did you mean \"semi_closed\"", "semi-closed"},
    {"a value holding a newline is echoed escaped, on one line", "pump_4p36s.toml",
     "shape = \"semi_closed\"", "shape = \"semi\\nclosed\\u001b[31m\"", "stator.slot.shape",
     "(got \"semi\\nclosed\\u001B[31m\")", "semi\\nclosed"},
    {"the earlier name of a slot body, refused with its new one", "pump_4p36s.toml",
     "body = \"constant_tooth_width\"", "body = \"parallel_tooth\"", "stator.slot.body",
     "is now named \"constant_tooth_width\"", "parallel_tooth"},
    {"a bar conductor that does not conduct", "pump_4p36s.toml",
     "bars = \"die_cast_aluminium\"\nshaft = \"shaft_steel\"\n",
     "bars = \"weak\"\nshaft = \"shaft_steel\"\n[materials.define.weak]\nkind = "
     "\"conductor\"\nconductivity_s_per_m = 0.0\n",
     "materials.define.weak.conductivity_s_per_m", "(> 0)", ""},
    {"end rings smaller than the bars they join", "pump_4p36s.toml", "bridge_thickness_mm = 0.5",
     "bridge_thickness_mm = 0.5\n\n[rotor.ring]\nradial_height_mm = 21.0\naxial_width_mm = 2.0",
     "rotor.ring.axial_width_mm", "smaller than the bars it joins", ""},
    {"end rings that do not reach over the bar ends", "pump_4p36s.toml",
     "bridge_thickness_mm = 0.5",
     "bridge_thickness_mm = 0.5\n\n[rotor.ring]\nmean_diameter_mm = 90.0",
     "rotor.ring.mean_diameter_mm", "does not reach over the bar ends", "mean_diameter_mm"},
    {"slip beyond braking", "pump_4p36s_running.toml", "slip = 0.03", "slip = 2.5", "study.slip",
     "must be in [-1, 2]", "slip = 2.5"},
    {"cage temperature beyond the data", "pump_4p36s.toml", "bars = 28",
     "bars = 28\n"
     "cage_temperature_c = 500.0",
     "rotor.cage_temperature_c", "must be in [-60, 400]", "cage_temperature_c"},
    {"a bar conductor whose conductivity vanishes at the cage temperature", "pump_4p36s.toml",
     "bars = \"die_cast_aluminium\"\nshaft = \"shaft_steel\"\n",
     "bars = \"odd\"\nshaft = \"shaft_steel\"\n[materials.define.odd]\nkind = \"conductor\"\n"
     "conductivity_s_per_m = 3.0e7\ntemperature_coefficient_per_k = -0.02\n",
     "materials.bars", "no positive conductivity at the cage temperature", ""},
    {"imposed bar currents without their table", "pump_4p36s.toml", "bars = 28",
     "bars = 28\nbar_currents = \"imposed\"", "rotor.bar_currents", "needs a [rotor_currents]",
     "bar_currents"},
    {"key that the chosen body does not use", "pump_4p36s.toml", "tooth_width_mm = 5.6",
     "tooth_width_mm = 5.6\nslot_width_mm = 6.0", "stator.slot.slot_width_mm", "does not apply",
     "slot_width_mm"},
    {"shaft cutting the bars", "pump_4p36s.toml", "shaft_diameter_mm = 48.0",
     "shaft_diameter_mm = 104.0", "rotor.shaft_diameter_mm", "cuts the bars", "shaft_diameter_mm"},
    {"shaft not smaller than the rotor", "pump_4p36s.toml", "shaft_diameter_mm = 48.0",
     "shaft_diameter_mm = 140.0", "rotor.shaft_diameter_mm", "must be smaller than the rotor",
     "shaft_diameter_mm"},
    {"zero bridge", "pump_4p36s.toml", "bridge_thickness_mm = 0.5", "bridge_thickness_mm = 0",
     "rotor.bar.bridge_thickness_mm", "must be a length in mm in (0", "bridge_thickness_mm"},
    {"bars overlapping each other", "pump_4p36s.toml", "bars = 28", "bars = 80", "rotor.bar.shape",
     "neighbouring bars overlap", ""},
    {"teardrop tops overlapping the next bar", "pump_4p36s.toml", "top_radius_mm = 3.5",
     "top_radius_mm = 7.8", "rotor.bar.shape", "neighbouring bars overlap", ""},
    {"a tooth a few nanometres wide", "pump_4p36s.toml", "tooth_width_mm = 5.6",
     "tooth_width_mm = 0.0000056", "stator.slot.tooth_width_mm", "below 0.05 mm", "tooth_width_mm"},
    {"a bridge of a millionth of a millimetre", "pump_4p36s.toml", "bridge_thickness_mm = 0.5",
     "bridge_thickness_mm = 0.000001", "rotor.bar.bridge_thickness_mm", "below 0.05 mm",
     "bridge_thickness_mm"},
    {"a stator yoke of 0.01 mm", "pump_4p36s.toml", "slot_depth_mm = 22.0", "slot_depth_mm = 39.99",
     "stator.slot.slot_depth_mm", "below 0.05 mm", "slot_depth_mm"},
    {"a rotor yoke of 0.01 mm", "pump_4p36s.toml", "shaft_diameter_mm = 48.0",
     "shaft_diameter_mm = 92.08", "rotor.shaft_diameter_mm", "below 0.05 mm", "shaft_diameter_mm"},
    {"2 µm airgap elements growing slowly: a mesh no run can solve", "pump_4p36s.toml", "[mesh]",
     "[mesh]\nairgap_size_mm = 0.002\ngrowth_rate = 0.02", "mesh.airgap_size_mm",
     "million unknowns), beyond what a run can solve", "airgap_size_mm = 0.002"},
    {"teardrop shorter than its ends", "pump_4p36s.toml", "height_mm = 21.0", "height_mm = 4.0",
     "rotor.bar.height_mm", "taller than twice", "height_mm = 4.0"},
    {"slit wider than the bar", "compressor_2p24s.toml", "opening_width_mm = 1.0",
     "opening_width_mm = 3.5", "rotor.bar.opening_width_mm", "narrower than the bar top",
     "opening_width_mm = 3.5"},
    {"radial slot wider than the slot pitch", "reference_radial_4p24s.toml", "slot_angle_deg = 7.5",
     "slot_angle_deg = 16.0", "stator.slot.slot_angle_deg", "narrower than the slot pitch",
     "slot_angle_deg"},
    {"TOML syntax error", "pump_4p36s.toml", "poles = 4", "poles = ", "", "not valid TOML",
     "poles ="},
    {"unknown material", "pump_4p36s.toml", "stator_iron = \"M400-50A\"",
     "stator_iron = \"M400-50X\"", "materials.stator_iron", "unknown material", "stator_iron"},
    {"material of the wrong class", "pump_4p36s.toml", "coils = \"copper\"", "coils = \"M400-50A\"",
     "materials.coils", "cannot be used for coils", "coils ="},
    {"band nodes the sector cannot carry", "pump_4p36s.toml", "band_nodes = 1512",
     "band_nodes = 1514", "mesh.band_nodes", "must be a multiple of 4", "band_nodes"},
    {"element order 3", "pump_4p36s.toml", "order = 2", "order = 3", "mesh.order",
     "must be an integer in [1, 2]", "order = 3"},
    {"three winding layers", "pump_4p36s.toml", "layers = 2", "layers = 3", "winding.layers",
     "must be an integer in [1, 2]", "layers = 3"},
    {"negative current", "pump_4p36s.toml", "rms_a = 9.0", "rms_a = -6.5", "supply.rms_a",
     "must be in [0,", "rms_a"},
    {"zero frequency", "pump_4p36s.toml", "frequency_hz = 50.0", "frequency_hz = 0.0",
     "supply.frequency_hz", "greater than 0 Hz", "frequency_hz"},
    {"B-H table not increasing", "pump_4p36s.toml", "",
     "\n[materials.define.bad]\nkind = \"steel\"\nbh_h_a_per_m = [0, 100, 50, 400, 1000]\n"
     "bh_b_tesla = [0, 0.5, 1.0, 1.3, 1.5]\n",
     "materials.define.bad.bh_b_tesla", "must both increase strictly", "bh_b_tesla"},
    {"B-H table not starting at the origin", "pump_4p36s.toml", "",
     "\n[materials.define.bad]\nkind = \"steel\"\nbh_h_a_per_m = [10, 100, 200, 400, 1000]\n"
     "bh_b_tesla = [0.1, 0.5, 1.0, 1.3, 1.5]\n",
     "materials.define.bad.bh_b_tesla", "must start at H = 0, B = 0", "bh_b_tesla"},
    {"B-H table too short", "pump_4p36s.toml", "",
     "\n[materials.define.bad]\nkind = \"steel\"\nbh_h_a_per_m = [0, 100, 1000]\n"
     "bh_b_tesla = [0, 1.0, 1.5]\n",
     "materials.define.bad.bh_b_tesla", "at least 5 points", "bh_b_tesla"},
    {"unknown material kind", "pump_4p36s.toml", "",
     "\n[materials.define.bad]\nkind = \"steal\"\nrelative_permeability = 100.0\n",
     "materials.define.bad.kind", "did you mean \"steel\"", "steal"},
    {"start-up longer than the run", "pump_4p36s_running.toml", "discard_periods = 2 ",
     "discard_periods = 3 ", "study.discard_periods", "must be below periods", "discard_periods"},
    {"time-stepping key in a static study", "pump_4p36s.toml", "rotor_angle_deg = 0.0",
     "rotor_angle_deg = 0.0\nslip = 0.03", "study.slip", "does not apply", "slip = 0.03"},
    {"speed missing for a speed-driven rotor", "pump_4p36s_running.toml",
     "motion = \"slip\"\nslip = 0.03", "motion = \"speed\"", "study.speed_rpm",
     "required key is missing", "[study]"},
    {"band alignment impossible at this slip", "pump_4p36s_running.toml", "slip = 0.03",
     "slip = 0.03\nband_aligned_steps = true", "study.band_aligned_steps", "not a whole number",
     "band_aligned_steps"},
    {"bar currents on a smooth rotor", "reference_radial_4p24s.toml", "[supply]",
     "[rotor_currents]\nbar_rms_a = 100.0\nangle_deg = 150.0\n\n[supply]",
     "rotor_currents.bar_rms_a", "smooth rotor has no bars", "bar_rms_a"},
    {"unknown phase key", "pump_4p36s.toml", "", "\n[supply.phases]\nb = { rms_amps = 20.0 }\n",
     "supply.phases.b.rms_amps", "did you mean 'rms_a'", "rms_amps"},
    {"sequences and a balanced RMS together", "pump_4p36s.toml", "",
     "\n[supply.sequence]\npositive = { rms_a = 6.5 }\n", "supply.rms_a", "does not apply here",
     "rms_a = 9.0"},
    {"sequences without the positive sequence", "pump_4p36s.toml", "rms_a = 9.0",
     "[supply.sequence]\nnegative = { rms_a = 1.0 }", "supply.sequence.positive",
     "required key is missing", "[supply.sequence]"},
    {"harmonic of order 1", "pump_4p36s.toml", "",
     "\n[[supply.harmonics]]\norder = 1\npercent = 5.0\n", "supply.harmonics[0].order",
     "order 1 is the fundamental", "order = 1"},
    {"harmonic with percent and rms_a", "pump_4p36s.toml", "",
     "\n[[supply.harmonics]]\norder = 5\npercent = 5.0\nrms_a = 0.3\n", "supply.harmonics[0].rms_a",
     "not both", "rms_a = 0.3"},
    {"negative harmonic share", "pump_4p36s.toml", "",
     "\n[[supply.harmonics]]\norder = 5\npercent = -5.0\n", "supply.harmonics[0].percent",
     "must be in [0, 1000]", "percent = -5.0"},
    {"the same harmonic twice on one phase", "pump_4p36s.toml", "",
     "\n[[supply.harmonics]]\norder = 5\npercent = 4.0\n[[supply.harmonics]]\norder = 5\n"
     "percent = 2.0\nphase = \"b\"\n",
     "supply.harmonics[1].order", "already given for phase b in supply.harmonics[0]", ""},
    {"harmonic the steps cannot resolve", "pump_4p36s_running.toml", "",
     "\n[[supply.harmonics]]\norder = 61\npercent = 2.0\n", "supply.harmonics[0].order",
     "needs more than 108 steps per period", "order = 61"},
    {"interharmonic that leaks in the window", "pump_4p36s_running.toml", "",
     "\n[[supply.harmonics]]\norder = 2.5\npercent = 2.0\n", "supply.harmonics[0].order",
     "does not complete whole periods", "order = 2.5"},
    {"waveform table that does not exist", "pump_4p36s.toml", "rms_a = 9.0",
     "[supply.waveform]\nfile = \"no_such_record.csv\"", "supply.waveform.file",
     "cannot open the waveform table", "file ="},
    {"waveform table with harmonics besides", "pump_4p36s.toml", "rms_a = 9.0",
     "[supply.waveform]\nfile = \"x.csv\"\n[[supply.harmonics]]\norder = 5\npercent = 1.0",
     "supply.harmonics", "does not apply here", ""},
    {"voltage feed given a current", "pump_4p36s.toml", "feed = \"current\"", "feed = \"voltage\"",
     "supply.rms_a", "a voltage feed takes rms_v", "rms_a = 9.0"},
    {"a voltage basis on a current feed", "pump_4p36s.toml", "rms_a = 9.0",
     "rms_a = 9.0\nvoltages = \"phase\"", "supply.voltages", "applies to feed", "voltages ="},
    {"unknown connection, with a suggestion", "pump_4p36s.toml",
     "feed = \"current\"\nfrequency_hz = 50.0\nrms_a = 9.0",
     "feed = \"voltage\"\nconnection = \"detla\"\nrms_v = 400.0", "supply.connection",
     "did you mean \"delta\"", "connection ="},
    {"star with neutral from line-to-line voltages", "pump_4p36s.toml",
     "feed = \"current\"\nfrequency_hz = 50.0\nrms_a = 9.0",
     "feed = \"voltage\"\nconnection = \"star_neutral\"\nvoltages = \"line_to_line\"\n"
     "rms_v = 400.0",
     "supply.voltages", "needs the phase (line-to-neutral) voltages", "voltages ="},
    {"zero sequence in line-to-line voltages", "pump_4p36s.toml",
     "feed = \"current\"\nfrequency_hz = 50.0\nrms_a = 9.0",
     "feed = \"voltage\"\n[supply.sequence]\npositive = { rms_v = 400.0 }\n"
     "zero = { rms_v = 5.0 }",
     "supply.sequence.zero", "hold no zero sequence", "zero ="},
    {"voltage feed in a static study", "pump_4p36s.toml",
     "feed = \"current\"\nfrequency_hz = 50.0\nrms_a = 9.0", "feed = \"voltage\"\nrms_v = 400.0",
     "supply.feed", "needs [study] kind = \"time_stepping\"", "feed ="},
    {"line-to-line voltages that do not close", "pump_4p36s_running.toml", "rms_v = 400.0",
     "rms_v = 400.0\n[supply.phases]\nbc = { rms_v = 400.0, angle_deg = -80.0 }", "supply.phases",
     "do not close", ""},
    {"line-to-line magnitudes that make no triangle", "pump_4p36s_running.toml", "rms_v = 400.0",
     "rms_v = 400.0\n[supply.phases]\nbc = { rms_v = 900.0 }", "supply.rms_v",
     "do not form a triangle", "rms_v ="},
    {"phase resistance of zero", "pump_4p36s.toml", "turns_per_coil = 9",
     "turns_per_coil = 9\nphase_resistance_ohm = 0.0", "winding.phase_resistance_ohm",
     "must be greater than 0", "phase_resistance_ohm"},
    {"unknown time scheme", "pump_4p36s_running.toml", "[study]",
     "[study]\ntime_scheme = \"crank_nicolson\"", "study.time_scheme",
     "must be one of: backward_euler, bdf2", "time_scheme ="},
    {"unknown start of time stepping", "pump_4p36s_running.toml", "[study]",
     "[study]\nstart = \"warm\"", "study.start", "must be one of: cold, time_harmonic", "start ="},
    {"time-harmonic start with nothing that has memory", "reference_radial_4p24s.toml",
     "rms_a = 10.0", "rms_a = 10.0\n[study]\nkind = \"time_stepping\"\nstart = \"time_harmonic\"",
     "study.start", "has neither", "start ="},
    {"settled stop in a static study", "pump_4p36s.toml", "rotor_angle_deg = 0.0",
     "rotor_angle_deg = 0.0\nstop_when_settled = true", "study.stop_when_settled", "does not apply",
     "stop_when_settled"},
    {"a slip curve of one point", "pump_4p36s_running.toml", "kind = \"time_stepping\"",
     "kind = \"slip_curves\"\npoints = 1", "study.points", "must be an integer in [3, 1000]",
     "points ="},
    {"a slip curve without a range", "pump_4p36s_running.toml", "kind = \"time_stepping\"",
     "kind = \"slip_curves\"\nslip_from = 0.5\nslip_to = 0.5", "study.slip_to",
     "must differ from slip_from", "slip_to ="},
    {"a slip curve beyond braking", "pump_4p36s_running.toml", "kind = \"time_stepping\"",
     "kind = \"slip_curves\"\nslip_from = 2.5", "study.slip_from", "", "slip_from ="},
    {"slip range in a time-stepping study", "pump_4p36s_running.toml", "[study]",
     "[study]\npoints = 12", "study.points", "does not apply", "points ="},
    {"negative CG budget", "pump_4p36s.toml", "", "\n[solver]\ncg_budget = -1\n",
     "solver.cg_budget", "must be an integer in [0, 1000]", "cg_budget ="},
};

int line_of(const std::string& text, const std::string& fragment) {
  const auto at = text.find(fragment);
  if (at == std::string::npos) return -1;
  int line = 1;
  for (std::size_t i = 0; i < at; ++i) line += text[i] == '\n';
  return line;
}

}  // namespace

TEST_CASE("every bad input ends with exit code 2 and a message naming file, line and key",
          "[cases][cli]") {
  const auto dir = test::temp_dir("bad_input");
  int index = 0;
  for (const BadCase& bad : catalogue) {
    DYNAMIC_SECTION(bad.name) {
      std::string text = test::read_text(test::example(bad.base));
      if (std::string(bad.find).empty()) {
        text += bad.replace;
      } else {
        const auto at = text.find(bad.find);
        REQUIRE(at != std::string::npos);
        text.replace(at, std::string(bad.find).size(), bad.replace);
      }
      const auto path = dir / fmt::format("bad_{:02d}.toml", index);
      test::write_text(path, text);
      const auto result =
          test::run_command(fmt::format("{} check {}", GAPFLUX_BINARY, path.string()));
      INFO(result.output);
      CHECK(result.exit_code == 2);
      // One message on one line: file:line:col: error: key: what.
      REQUIRE(result.output.size() > 1);
      REQUIRE(result.output.find('\n') == result.output.size() - 1);
      const auto c1 = result.output.find(':');
      const auto c2 = result.output.find(':', c1 + 1);
      const auto c3 = result.output.find(':', c2 + 1);
      REQUIRE(c3 != std::string::npos);
      CHECK(result.output.substr(0, c1) == path.string());
      const std::string line = result.output.substr(c1 + 1, c2 - c1 - 1);
      const std::string column = result.output.substr(c2 + 1, c3 - c2 - 1);
      REQUIRE(!line.empty());
      REQUIRE(line.find_first_not_of("0123456789") == std::string::npos);
      REQUIRE(!column.empty());
      REQUIRE(column.find_first_not_of("0123456789") == std::string::npos);
      CHECK(result.output.compare(c3, 9, ": error: ") == 0);
      if (std::string(bad.at_line).size() > 0) CHECK(std::stoi(line) == line_of(text, bad.at_line));
      if (std::string(bad.key).size() > 0)
        CHECK_THAT(result.output, Catch::Contains(std::string(": ") + bad.key + ": "));
      CHECK_THAT(result.output, Catch::Contains(bad.expect));
    }
    ++index;
  }
}

TEST_CASE("a missing case file is bad input too", "[cases][cli]") {
  const auto result =
      test::run_command(fmt::format("{} check /nonexistent/case.toml", GAPFLUX_BINARY));
  CHECK(result.exit_code == 2);
  CHECK_THAT(result.output, Catch::Contains("no such case file"));
}

TEST_CASE("command-line mistakes get a message that says what is valid", "[cases][cli]") {
  const std::string demo = test::example("pump_4p36s.toml");
  SECTION("an unknown command") {
    const auto r = test::run_command(fmt::format("{} chek {}", GAPFLUX_BINARY, demo));
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output,
               Catch::Contains("unknown command \"chek\"; the commands are check, mesh, run"));
  }
  SECTION("a thread count that is not a number") {
    const auto r =
        test::run_command(fmt::format("{} --threads abc check {}", GAPFLUX_BINARY, demo));
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Catch::Contains(
                             "\"abc\" is not a thread count: give a whole number from 1 to 1024"));
    CHECK(r.output.size() < 300);  // no 309-digit bound
  }
  SECTION("--threads after the command") {
    const auto r = test::run_command(fmt::format("{} check {} --threads 1", GAPFLUX_BINARY, demo));
    CHECK(r.exit_code == 0);
  }
  SECTION("a folder given as the case file") {
    const auto r =
        test::run_command(fmt::format("{} check {}", GAPFLUX_BINARY, GAPFLUX_EXAMPLES_DIR));
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Catch::Contains("is a folder, not a case file"));
  }
  SECTION("a folder given as the supply's waveform table") {
    const auto dir = test::temp_dir("waveform_folder");
    std::filesystem::create_directories(dir / "table.csv");
    const auto path = dir / "case.toml";
    std::string text = test::read_text(demo);
    const auto at = text.find("[supply]");
    REQUIRE(at != std::string::npos);
    text = text.substr(0, at) + "[supply]\n[supply.waveform]\nfile = \"table.csv\"\n" +
           text.substr(text.find("\n[", at + 1));
    test::write_text(path, text);
    const auto r = test::run_command(fmt::format("{} check {}", GAPFLUX_BINARY, path.string()));
    INFO(r.output);
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Catch::Contains("supply.waveform.file"));
    CHECK_THAT(r.output, Catch::Contains("is a folder, not a CSV table"));
  }
}

TEST_CASE("the demo cases pass the check", "[cases][cli]") {
  for (const char* name :
       {"pump_4p36s.toml", "compressor_2p24s.toml", "reference_radial_4p24s.toml",
        "pump_4p36s_running.toml", "pump_4p36s_disturbed.toml"}) {
    const auto result =
        test::run_command(fmt::format("{} check {}", GAPFLUX_BINARY, test::example(name)));
    INFO(result.output);
    CHECK(result.exit_code == 0);
    CHECK_THAT(result.output, Catch::Contains("check: ok"));
    CHECK_THAT(result.output, Catch::Contains("# accuracy: "));
  }
  // The pump's default sizes: the figure the convergence study measured at its scale.
  const auto pump = test::run_command(
      fmt::format("{} check {}", GAPFLUX_BINARY, test::example("pump_4p36s.toml")));
  CHECK_THAT(pump.output, Catch::Contains("# mesh scale 1.4 ") &&
                              Catch::Contains("# accuracy: within about 0.25 % of a converged"));
}
