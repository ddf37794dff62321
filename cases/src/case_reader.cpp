// Case file → Case. One parse function per TOML table; each documents its keys' units and checks
// their ranges (docs/case-file.md is the user-facing list of the same keys).
#include "cases/case_reader.hpp"

#include <fmt/format.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <numbers>
#include <sstream>

#include "supply_reader.hpp"
#include "table_reader.hpp"
#include "value_checks.hpp"

namespace gapflux {
namespace {

using namespace value_checks;

MachineSpec parse_machine(TableReader t) {
  MachineSpec m;
  auto name = t.string("name");
  if (!name || name->empty()) throw t.missing("name", "a non-empty string naming the machine");
  m.name = *name;
  m.poles = integer_in(t, "poles", std::nullopt, 2, 128);
  if (m.poles % 2 != 0)
    throw t.error("poles", fmt::format("the number of poles must be even (got {})", m.poles));
  m.stack_length_m = length_mm(t, "stack_length_mm", std::nullopt, "the core stack length");
  t.finish();
  return m;
}

StatorSlotSpec parse_stator_slot(TableReader t) {
  StatorSlotSpec s;
  s.shape = static_cast<SlotShape>(
      choice(t, "shape", {"semi_closed", "open", "open_radial"}, std::nullopt));
  std::vector<std::pair<std::string, std::string>> not_applicable;
  const auto not_for = [&](const std::string& key, const std::string& reason) {
    not_applicable.emplace_back(key, reason);
  };
  s.slot_depth_m = length_mm(t, "slot_depth_mm", std::nullopt,
                             "the slot depth from the bore to the deepest point of the slot");
  switch (s.shape) {
    case SlotShape::semi_closed: {
      s.opening_width_m = length_mm(t, "opening_width_mm", std::nullopt, "the slot opening width");
      s.tip_height_m = length_mm(t, "tip_height_mm", std::nullopt, "the tooth-tip height");
      s.wedge_angle_rad = number_in(t, "wedge_angle_deg", 20.0, 0.0, 75.0, "degrees") * deg;
      // Earlier names of the two bodies, refused with the new ones (named by what stays constant).
      if (const auto body = t.string("body")) {
        if (*body == "parallel_tooth")
          throw t.error("body",
                        "\"parallel_tooth\" is now named \"constant_tooth_width\" (the "
                        "teeth keep their width, the slot widens outward)");
        if (*body == "parallel_slot")
          throw t.error("body",
                        "\"parallel_slot\" is now named \"constant_slot_width\" (the "
                        "slot keeps its width, the teeth widen outward)");
      }
      s.body = static_cast<SlotBody>(
          choice(t, "body", {"constant_tooth_width", "constant_slot_width"}, std::size_t{0}));
      if (s.body == SlotBody::constant_tooth_width) {
        s.tooth_width_m = length_mm(t, "tooth_width_mm", std::nullopt, "the tooth width");
        not_for("slot_width_mm", "body = \"constant_tooth_width\" takes tooth_width_mm");
      } else {
        s.slot_width_m = length_mm(t, "slot_width_mm", std::nullopt, "the slot width");
        not_for("tooth_width_mm", "body = \"constant_slot_width\" takes slot_width_mm");
      }
      s.bottom = static_cast<SlotBottom>(choice(t, "bottom", {"round", "flat"}, std::size_t{0}));
      not_for("wedge_height_mm", "semi-closed slots take tip_height_mm and wedge_angle_deg");
      not_for("slot_angle_deg", "only open_radial slots have an angular width");
      break;
    }
    case SlotShape::open: {
      s.body = SlotBody::constant_slot_width;
      s.slot_width_m = length_mm(t, "slot_width_mm", std::nullopt, "the slot width");
      s.opening_width_m = s.slot_width_m;
      s.wedge_height_m = length_or_zero_mm(t, "wedge_height_mm", 0.0);
      s.bottom = static_cast<SlotBottom>(choice(t, "bottom", {"round", "flat"}, std::size_t{1}));
      for (const char* k : {"opening_width_mm", "tip_height_mm", "wedge_angle_deg"})
        not_for(k, "open slots have no tooth tips; the opening is the slot width");
      not_for("tooth_width_mm", "open slots are parallel-sided: give slot_width_mm");
      not_for("body", "open slots are parallel-sided");
      not_for("slot_angle_deg", "only open_radial slots have an angular width");
      break;
    }
    case SlotShape::open_radial: {
      s.slot_angle_rad = number_in(t, "slot_angle_deg", std::nullopt, 0.01, 120.0, "degrees") * deg;
      s.wedge_height_m = length_or_zero_mm(t, "wedge_height_mm", 0.0);
      s.bottom = SlotBottom::flat;
      for (const char* k : {"opening_width_mm", "tip_height_mm", "wedge_angle_deg"})
        not_for(k, "open_radial slots have no tooth tips");
      for (const char* k : {"tooth_width_mm", "slot_width_mm", "body", "bottom"})
        not_for(k, "an open_radial slot is an annular sector: give slot_angle_deg");
      break;
    }
  }
  t.finish(not_applicable);
  return s;
}

StatorSpec parse_stator(TableReader t) {
  StatorSpec s;
  s.outer_diameter_m = length_mm(t, "outer_diameter_mm", std::nullopt, "the stator outer diameter");
  s.bore_diameter_m = length_mm(t, "bore_diameter_mm", std::nullopt, "the stator bore diameter");
  if (s.bore_diameter_m >= s.outer_diameter_m)
    throw t.error("bore_diameter_mm",
                  fmt::format("the bore ({} mm) must be smaller than the outer diameter ({} mm)",
                              s.bore_diameter_m / mm, s.outer_diameter_m / mm));
  s.slots = integer_in(t, "slots", std::nullopt, 3, 720);
  s.slot = parse_stator_slot(required_table(t, "slot", "the slot shape and its dimensions"));
  t.finish();
  return s;
}

RotorBarSpec parse_rotor_bar(TableReader t) {
  RotorBarSpec b;
  std::vector<std::pair<std::string, std::string>> not_applicable;
  b.shape =
      static_cast<BarShape>(choice(t, "shape", {"round", "teardrop", "rectangular"}, std::nullopt));
  switch (b.shape) {
    case BarShape::round:
      b.diameter_m = length_mm(t, "diameter_mm", std::nullopt, "the bar diameter");
      for (const char* k : {"top_radius_mm", "bottom_radius_mm", "height_mm", "width_mm"})
        not_applicable.emplace_back(k, "a round bar takes diameter_mm");
      break;
    case BarShape::teardrop:
      b.top_radius_m = length_mm(t, "top_radius_mm", std::nullopt, "the radius of the bar top");
      b.bottom_radius_m =
          length_mm(t, "bottom_radius_mm", std::nullopt, "the radius of the bar bottom");
      b.height_m = length_mm(t, "height_mm", std::nullopt, "the overall bar height");
      if (b.height_m <= 2.0 * std::max(b.top_radius_m, b.bottom_radius_m))
        throw t.error(
            "height_mm",
            fmt::format("a teardrop bar must be taller than twice its larger end "
                        "radius ({} mm) (got {} mm)",
                        2.0 * std::max(b.top_radius_m, b.bottom_radius_m) / mm, b.height_m / mm));
      for (const char* k : {"diameter_mm", "width_mm"})
        not_applicable.emplace_back(k,
                                    "a teardrop bar takes top_radius_mm, bottom_radius_mm "
                                    "and height_mm");
      break;
    case BarShape::rectangular:
      b.width_m = length_mm(t, "width_mm", std::nullopt, "the bar width");
      b.height_m = length_mm(t, "height_mm", std::nullopt, "the bar height");
      for (const char* k : {"diameter_mm", "top_radius_mm", "bottom_radius_mm"})
        not_applicable.emplace_back(k, "a rectangular bar takes width_mm and height_mm");
      break;
  }
  b.closure =
      static_cast<BarClosure>(choice(t, "closure", {"closed", "semi_open"}, std::size_t{0}));
  if (b.closure == BarClosure::closed) {
    b.bridge_thickness_m = length_mm(t, "bridge_thickness_mm", 0.5, "the bridge thickness");
    for (const char* k : {"opening_width_mm", "opening_height_mm"})
      not_applicable.emplace_back(k, "closed bars have a bridge, not an opening");
  } else {
    b.opening_width_m = length_mm(t, "opening_width_mm", std::nullopt, "the slit width");
    b.opening_height_m = length_mm(t, "opening_height_mm", std::nullopt, "the slit height");
    not_applicable.emplace_back("bridge_thickness_mm", "semi-open bars have an opening instead");
  }
  t.finish(not_applicable);
  return b;
}

EndRingSpec parse_end_ring(TableReader t) {
  EndRingSpec e;
  e.mean_diameter_m = length_or_zero_mm(t, "mean_diameter_mm", 0.0);
  e.radial_height_m = length_or_zero_mm(t, "radial_height_mm", 0.0);
  e.axial_width_m = length_or_zero_mm(t, "axial_width_mm", 0.0);
  if (t.has("segment_resistance_uohm")) {
    e.segment_resistance_ohm =
        number_in(t, "segment_resistance_uohm", {}, 0.0, 1e9, "µΩ (per segment of one ring)") *
        1e-6;
    if (!(e.segment_resistance_ohm > 0.0))
      throw t.error("segment_resistance_uohm", "must be greater than 0 µΩ");
    for (const char* k : {"mean_diameter_mm", "radial_height_mm", "axial_width_mm"})
      if (t.has(k))
        throw t.error(k,
                      "does not apply with segment_resistance_uohm given: the dimensions only "
                      "serve to compute it");
  }
  if (t.has("segment_inductance_nh"))
    e.segment_inductance_h =
        number_in(t, "segment_inductance_nh", {}, 0.0, 1e9, "nH (per segment of one ring)") * 1e-9;
  t.finish();
  return e;
}

RotorSpec parse_rotor(TableReader t) {
  RotorSpec r;
  r.kind = static_cast<RotorKind>(choice(t, "kind", {"cage", "smooth"}, std::size_t{0}));
  r.outer_diameter_m = length_mm(t, "outer_diameter_mm", std::nullopt, "the rotor outer diameter");
  r.shaft_diameter_m = length_or_zero_mm(t, "shaft_diameter_mm", 0.0);
  if (r.shaft_diameter_m >= r.outer_diameter_m)
    throw t.error("shaft_diameter_mm",
                  fmt::format("the shaft ({} mm) must be smaller than the rotor ({} mm)",
                              r.shaft_diameter_m / mm, r.outer_diameter_m / mm));
  std::vector<std::pair<std::string, std::string>> not_applicable;
  if (r.kind == RotorKind::cage) {
    r.bars = integer_in(t, "bars", std::nullopt, 3, 720);
    r.bar = parse_rotor_bar(required_table(t, "bar", "the bar shape and its dimensions"));
    r.bar_currents =
        static_cast<BarCurrents>(choice(t, "bar_currents", {"induced", "imposed"}, std::size_t{0}));
    r.cage_temperature_c = number_in(t, "cage_temperature_c", 100.0, -60.0, 400.0, "°C");
    if (auto ring = t.table("ring")) r.ring = parse_end_ring(*ring);
  } else {
    for (const char* k : {"bars", "bar", "bar_currents", "cage_temperature_c", "ring"})
      not_applicable.emplace_back(k, "a smooth rotor has no bars");
  }
  t.finish(not_applicable);
  return r;
}

WindingSpec parse_winding(TableReader t, int slots, int poles) {
  WindingSpec w;
  w.layers = integer_in(t, "layers", 2, 1, 2);
  const int full_pitch = std::max(1, static_cast<int>(std::lround(double(slots) / poles)));
  w.coil_pitch_slots = integer_in(t, "coil_pitch_slots", full_pitch, 1, std::max(1, slots / 2));
  w.turns_per_coil = integer_in(t, "turns_per_coil", std::nullopt, 1, 100000);
  w.parallel_paths = integer_in(t, "parallel_paths", 1, 1, 128);
  w.fill_factor = number_in(t, "fill_factor", 0.40, 0.05, 0.95, "(copper area / coil-side area)");
  if (t.has("end_winding_length_mm"))
    w.end_winding_length_m = length_mm(t, "end_winding_length_mm", {}, "");
  else
    t.know("end_winding_length_mm");
  w.conductor_temperature_c = number_in(t, "conductor_temperature_c", 75.0, -60.0, 300.0, "°C");
  if (t.has("phase_resistance_ohm")) {
    w.phase_resistance_ohm = number_in(t, "phase_resistance_ohm", {}, 0.0, 1e6, "Ω");
    if (!(w.phase_resistance_ohm > 0.0))
      throw t.error("phase_resistance_ohm",
                    "must be greater than 0 Ω (leave it out to compute it from the winding)");
  }
  if (t.has("end_winding_inductance_mh"))
    w.end_winding_inductance_h =
        number_in(t, "end_winding_inductance_mh", {}, 0.0, 1e6, "mH") * 1e-3;
  else
    t.know("end_winding_inductance_mh");
  t.finish();
  return w;
}

MaterialDefinition parse_material_definition(TableReader t, const std::string& name) {
  MaterialDefinition d;
  d.name = name;
  d.kind =
      static_cast<MaterialKind>(choice(t, "kind", {"air", "conductor", "steel"}, std::nullopt));
  auto h = t.number_array("bh_h_a_per_m");
  auto b = t.number_array("bh_b_tesla");
  if (h.has_value() != b.has_value())
    throw t.missing(h ? "bh_b_tesla" : "bh_h_a_per_m",
                    "both bh_h_a_per_m and bh_b_tesla, of the same length");
  if (h) {
    d.bh_h_a_per_m = *h;
    d.bh_b_tesla = *b;
    t.know("relative_permeability");
    if (t.has("relative_permeability"))
      throw t.error("relative_permeability", "give either a B–H table or a relative permeability");
  } else {
    d.relative_permeability = number_in(t, "relative_permeability", 1.0, 1.0, 1e7, "");
  }
  d.conductivity_s_per_m = number_in(t, "conductivity_s_per_m", 0.0, 0.0, 1e9, "S/m");
  d.temperature_coefficient_per_k =
      number_in(t, "temperature_coefficient_per_k", 0.0, -0.1, 0.1, "1/K");
  d.density_kg_per_m3 = number_in(t, "density_kg_per_m3", 0.0, 0.0, 30000.0, "kg/m³");
  d.specific_loss_w_per_kg =
      number_in(t, "specific_loss_w_per_kg", 0.0, 0.0, 1000.0, "W/kg (at 1.5 T, 50 Hz)");
  d.thickness_m = t.has("thickness_mm") ? length_mm(t, "thickness_mm", {}, "") : 0.0;
  if (!t.has("thickness_mm")) t.know("thickness_mm");
  if (d.kind == MaterialKind::conductor && d.conductivity_s_per_m <= 0.0)
    throw t.missing("conductivity_s_per_m", "the conductivity of a conductor, in S/m (> 0)");
  t.finish();
  return d;
}

MaterialsSpec parse_materials(std::optional<TableReader> t) {
  MaterialsSpec m{"M400-50A", "M400-50A", "copper", "die_cast_aluminium", "", "shaft_steel", {}};
  if (!t) return m;
  const auto name = [&](const std::string& key, std::string& out) {
    if (auto v = t->string(key)) {
      if (v->empty()) throw t->error(key, "a material name must not be empty");
      out = *v;
    }
  };
  name("stator_iron", m.stator_iron);
  name("rotor_iron", m.rotor_iron);
  name("coils", m.coils);
  name("bars", m.bars);
  name("rings", m.rings);
  name("shaft", m.shaft);
  if (auto defs = t->table("define")) {
    for (const std::string& key : defs->keys()) {
      auto table = defs->table(key);
      if (!table) throw defs->error(key, "a material definition must be a table");
      m.definitions.push_back(parse_material_definition(*table, key));
    }
    defs->finish();
  }
  t->finish();
  return m;
}

MeshSpec parse_mesh(std::optional<TableReader> t) {
  MeshSpec m;
  if (!t) return m;
  m.order = integer_in(*t, "order", 2, 1, 2);
  if (t->has("airgap_size_mm"))
    m.airgap_size_m = length_mm(*t, "airgap_size_mm", {}, "");
  else
    t->know("airgap_size_mm");
  if (t->has("iron_size_mm"))
    m.iron_size_m = length_mm(*t, "iron_size_mm", {}, "");
  else
    t->know("iron_size_mm");
  m.growth_rate = number_in(*t, "growth_rate", 0.2, 0.02, 2.0, "(mm per mm)");
  m.band_nodes = t->has("band_nodes") ? integer_in(*t, "band_nodes", {}, 12, 200000) : 0;
  if (!t->has("band_nodes")) t->know("band_nodes");
  m.symmetry = static_cast<Symmetry>(choice(*t, "symmetry", {"auto", "full"}, std::size_t{0}));
  t->finish();
  return m;
}

StudySpec parse_study(std::optional<TableReader> t) {
  StudySpec s;
  if (!t) return s;
  s.kind = static_cast<StudyKind>(choice(
      *t, "kind", {"static", "time_stepping", "time_harmonic", "slip_curves"}, std::size_t{0}));
  s.rotor_angle_rad = number_in(*t, "rotor_angle_deg", 0.0, -360.0, 360.0, "degrees") * deg;
  s.time_s = number_in(*t, "time_s", 0.0, -1e6, 1e6, "s");
  std::vector<std::pair<std::string, std::string>> not_applicable;
  if (s.kind != StudyKind::static_field) {
    s.motion =
        static_cast<Motion>(choice(*t, "motion", {"slip", "speed", "locked"}, std::size_t{0}));
    if (s.motion == Motion::slip) {
      s.slip = number_in(*t, "slip", 0.0, -1.0, 2.0, "(per unit)");
      not_applicable.emplace_back("speed_rpm", "motion = \"slip\" takes slip");
    } else if (s.motion == Motion::speed) {
      s.speed_rpm = number_in(*t, "speed_rpm", std::nullopt, -1e5, 1e5, "rpm");
      not_applicable.emplace_back("slip", "motion = \"speed\" takes speed_rpm");
    } else {
      not_applicable.emplace_back("slip", "a locked rotor does not turn");
      not_applicable.emplace_back("speed_rpm", "a locked rotor does not turn");
    }
  }
  if (s.kind == StudyKind::slip_curves) {
    s.rated_given = s.motion == Motion::slip && t->has("slip");
    s.slip_from = number_in(*t, "slip_from", 1.0, -1.0, 2.0, "(per unit)");
    s.slip_to = number_in(*t, "slip_to", -0.02, -1.0, 2.0, "(per unit)");
    if (s.slip_to == s.slip_from)
      throw t->error("slip_to", "must differ from slip_from: a curve needs a range of slips");
    s.points = integer_in(*t, "points", 20, 3, 1000);
    if (s.motion != Motion::slip)
      throw t->error("motion",
                     "slip curves run over a range of slips: give slip_from and "
                     "slip_to, and slip for the rated point");
  } else {
    for (const char* k : {"slip_from", "slip_to", "points"})
      not_applicable.emplace_back(k, "only slip curves (kind = \"slip_curves\") run over slips");
  }
  if (s.kind == StudyKind::time_harmonic || s.kind == StudyKind::slip_curves) {
    for (const char* k :
         {"steps_per_period", "periods", "discard_periods", "band_aligned_steps", "time_scheme",
          "steady_state_tolerance_pct", "start", "stop_when_settled"})
      not_applicable.emplace_back(
          k, "a time-harmonic study solves the steady state at one frequency, without steps");
  } else if (s.kind == StudyKind::time_stepping) {
    s.steps_per_period = integer_in(*t, "steps_per_period", 60, 4, 100000);
    s.periods = number_in(*t, "periods", 1.0, 0.0, 10000.0, "periods");
    if (s.periods <= 0.0) throw t->error("periods", "must be greater than 0");
    s.discard_periods = number_in(*t, "discard_periods", 0.0, 0.0, 10000.0, "periods");
    if (s.discard_periods >= s.periods)
      throw t->error(
          "discard_periods",
          fmt::format("must be below periods ({}): something must be left to analyse", s.periods));
    s.band_aligned_steps = t->boolean("band_aligned_steps").value_or(false);
    s.time_scheme = static_cast<TimeScheme>(
        choice(*t, "time_scheme", {"backward_euler", "bdf2"}, std::size_t{1}));
    s.steady_state_tolerance_pct =
        number_in(*t, "steady_state_tolerance_pct", 0.5, 1e-6, 100.0, "%");
    s.start =
        static_cast<StartKind>(choice(*t, "start", {"cold", "time_harmonic"}, std::size_t{0}));
    s.stop_when_settled = t->boolean("stop_when_settled").value_or(false);
  } else {
    for (const char* k : {"steps_per_period", "periods", "discard_periods", "motion", "slip",
                          "speed_rpm", "band_aligned_steps", "time_scheme",
                          "steady_state_tolerance_pct", "start", "stop_when_settled"})
      not_applicable.emplace_back(
          k, "a static study solves one instant; use kind = \"time_stepping\"");
  }
  t->finish(not_applicable);
  return s;
}

RotorCurrentSpec parse_rotor_currents(std::optional<TableReader> t) {
  RotorCurrentSpec r;
  if (!t) return r;
  r.bar_rms_a = number_in(*t, "bar_rms_a", std::nullopt, 0.0, 1e7, "A");
  r.angle_rad = number_in(*t, "angle_deg", std::nullopt, -360.0, 360.0, "degrees") * deg;
  t->finish();
  return r;
}

SolverSpec parse_solver(std::optional<TableReader> t) {
  SolverSpec s;
  if (!t) return s;
  s.max_iterations = integer_in(*t, "max_iterations", 30, 1, 1000);
  s.residual_tolerance = number_in(*t, "residual_tolerance", 1e-8, 1e-15, 1e-2, "");
  s.update_tolerance = number_in(*t, "update_tolerance", 1e-8, 1e-15, 1e-2, "");
  s.cg_budget = integer_in(*t, "cg_budget", 20, 0, 1000);
  t->finish();
  return s;
}

OutputSpec parse_output(std::optional<TableReader> t) {
  OutputSpec o;
  if (!t) return o;
  o.fields_every = integer_in(*t, "fields_every", 1, 1, 1000000);
  o.airgap_samples =
      t->has("airgap_samples") ? integer_in(*t, "airgap_samples", {}, 16, 1 << 20) : 0;
  if (!t->has("airgap_samples")) t->know("airgap_samples");
  o.saturation_threshold_tesla =
      number_in(*t, "saturation_threshold_tesla", 0.0, 0.0, 5.0,
                "T (0: each iron's deep saturation, differential μr 10)");
  t->finish();
  return o;
}

}  // namespace

Case read_case_text(std::string_view text, const std::string& file_name) {
  Case c;
  c.file = file_name;
  c.sources = SourceMap(file_name);
  TableReader root = TableReader::parse_root(text, file_name, c.sources);
  c.machine = parse_machine(required_table(root, "machine", "name, poles and stack_length_mm"));
  c.stator = parse_stator(required_table(root, "stator", "the stator dimensions"));
  c.rotor = parse_rotor(required_table(root, "rotor", "the rotor dimensions"));
  c.winding = parse_winding(required_table(root, "winding", "at least turns_per_coil"),
                            c.stator.slots, c.machine.poles);
  c.materials = parse_materials(root.table("materials"));
  c.supply = parse_supply(required_table(root, "supply", "at least rms_a"), file_name);
  c.mesh = parse_mesh(root.table("mesh"));
  c.study = parse_study(root.table("study"));
  c.rotor_currents = parse_rotor_currents(root.table("rotor_currents"));
  if (c.supply.voltage_fed() && c.study.kind == StudyKind::static_field)
    throw c.sources.error("supply.feed",
                          "a voltage feed needs [study] kind = \"time_stepping\" or "
                          "\"time_harmonic\": the flux follows the voltage's integral, which one "
                          "instant does not define");
  if (c.study.start == StartKind::time_harmonic && !c.supply.voltage_fed() &&
      !(c.rotor.kind == RotorKind::cage && c.rotor.bar_currents == BarCurrents::induced))
    throw c.sources.error("study.start",
                          "\"time_harmonic\" starts what has memory — an induced cage or a "
                          "voltage feed — and this case has neither; each of its steps stands "
                          "alone, so leave start out");
  if (c.rotor_currents.bar_rms_a > 0.0 && c.rotor.kind != RotorKind::cage)
    throw c.sources.error("rotor_currents.bar_rms_a",
                          "a smooth rotor has no bars to carry currents");
  if (c.rotor.kind == RotorKind::cage) {
    const bool table = c.sources.find("rotor_currents").line > 0;
    if (c.rotor.bar_currents == BarCurrents::induced && table)
      throw c.sources.error("rotor_currents",
                            "does not apply: the bars' currents are induced by the field (the "
                            "default); set rotor.bar_currents = \"imposed\" to impose this set "
                            "instead");
    if (c.rotor.bar_currents == BarCurrents::imposed && !table)
      throw c.sources.error("rotor.bar_currents",
                            "\"imposed\" needs a [rotor_currents] table with bar_rms_a and "
                            "angle_deg");
  }
  c.solver = parse_solver(root.table("solver"));
  c.output = parse_output(root.table("output"));
  root.finish();
  close_isolated_star(c, c.warnings);
  return c;
}

Case read_case_file(const std::string& path) {
  std::error_code ec;
  if (std::filesystem::is_directory(path, ec))
    throw InputError(path, {}, "", "is a folder, not a case file; name the case's .toml file");
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw InputError(
        path, {}, "",
        std::filesystem::exists(path, ec) ? "cannot read the case file" : "no such case file");
  std::stringstream buffer;
  buffer << in.rdbuf();
  return read_case_text(buffer.str(), path);
}

const char* to_string(SlotShape s) {
  switch (s) {
    case SlotShape::semi_closed:
      return "semi_closed";
    case SlotShape::open:
      return "open";
    case SlotShape::open_radial:
      return "open_radial";
  }
  return "?";
}
const char* to_string(SlotBody b) {
  return b == SlotBody::constant_tooth_width ? "constant_tooth_width" : "constant_slot_width";
}
const char* to_string(SlotBottom b) {
  return b == SlotBottom::round ? "round" : "flat";
}
const char* to_string(RotorKind k) {
  return k == RotorKind::cage ? "cage" : "smooth";
}
const char* to_string(BarShape s) {
  switch (s) {
    case BarShape::round:
      return "round";
    case BarShape::teardrop:
      return "teardrop";
    case BarShape::rectangular:
      return "rectangular";
  }
  return "?";
}
const char* to_string(BarClosure c) {
  return c == BarClosure::closed ? "closed" : "semi_open";
}
const char* to_string(Symmetry s) {
  return s == Symmetry::automatic ? "auto" : "full";
}

const char* to_string(Feed f) {
  return f == Feed::voltage ? "voltage" : "current";
}

const char* to_string(Connection c) {
  return c == Connection::star ? "star" : c == Connection::star_neutral ? "star_neutral" : "delta";
}

const char* to_string(VoltageBasis b) {
  return b == VoltageBasis::phase ? "phase" : "line_to_line";
}

const char* to_string(TimeScheme s) {
  return s == TimeScheme::bdf2 ? "bdf2" : "backward_euler";
}

}  // namespace gapflux
