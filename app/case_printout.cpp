#include "case_printout.hpp"

#include "solver/winding_resistance.hpp"

#include "postproc/sequences.hpp"

#include <fmt/format.h>
#include <fmt/ostream.h>

#include <cmath>
#include <map>
#include <numbers>

namespace gapflux {
namespace {

constexpr double mm = 1e-3;
constexpr double to_deg = 180.0 / std::numbers::pi;

// An angle in (−180°, 180°].
double wrapped_deg(double rad) {
  double d = std::remainder(rad * to_deg, 360.0);
  if (d <= -180.0) d += 360.0;
  return d;
}

// What the settings' accuracy was on the demo motor's convergence study, and what scale 1 is.
void print_mesh_accuracy(std::ostream& out, const MeshSettings& mesh) {
  const MeshAccuracy& a = mesh.forecast.accuracy;
  fmt::print(
      out,
      "# mesh scale {:.3g} (sizes over the base: airgap / 2 in the gap, stator slot pitch / 3 "
      "in the iron, growth 0.2; the default is {:g})\n",
      a.scale, default_mesh_scale);
  const char* what =
      "airgap harmonics, torque mean and ripple, flux linkage, induced cage current; measured on "
      "the demo pump motor by bench/mesh_convergence.py, another lamination may differ";
  switch (a.basis) {
    case MeshAccuracy::Basis::measured:
      fmt::print(out, "# accuracy: within about {:.2g} % of a converged mesh ({})\n", a.worst_pct,
                 what);
      break;
    case MeshAccuracy::Basis::finer_than_measured:
      fmt::print(out,
                 "# accuracy: finer than the convergence study's settings of order {}, whose "
                 "finest was within {:.2g} % of a converged mesh ({})\n",
                 mesh.order, a.worst_pct, what);
      break;
    case MeshAccuracy::Basis::coarser_than_measured:
      fmt::print(out,
                 "# accuracy: not known: coarser than the convergence study's settings of order "
                 "{}, whose coarsest was already {:.2g} % from a converged mesh ({})\n",
                 mesh.order, a.worst_pct, what);
      break;
  }
}

}  // namespace

void print_resolved_case(std::ostream& out, const Case& c, const Lamination& lam,
                         const MeshSettings& mesh) {
  const auto& s = c.stator.slot;
  fmt::print(out, "# resolved case: {}\n", c.file);
  fmt::print(out, "[machine]\nname = {}\npoles = {}\nstack_length_mm = {:g}\n\n",
             quote_text(c.machine.name), c.machine.poles, c.machine.stack_length_m / mm);
  fmt::print(out, "[stator]\nouter_diameter_mm = {:g}\nbore_diameter_mm = {:g}\nslots = {}\n\n",
             c.stator.outer_diameter_m / mm, c.stator.bore_diameter_m / mm, c.stator.slots);
  fmt::print(out, "[stator.slot]\nshape = \"{}\"\nslot_depth_mm = {:g}\n", to_string(s.shape),
             s.slot_depth_m / mm);
  switch (s.shape) {
    case SlotShape::semi_closed:
      fmt::print(out, "opening_width_mm = {:g}\ntip_height_mm = {:g}\nwedge_angle_deg = {:g}\n",
                 s.opening_width_m / mm, s.tip_height_m / mm, s.wedge_angle_rad * to_deg);
      fmt::print(out, "body = \"{}\"\n", to_string(s.body));
      if (s.body == SlotBody::constant_tooth_width)
        fmt::print(out, "tooth_width_mm = {:g}\n", s.tooth_width_m / mm);
      else
        fmt::print(out, "slot_width_mm = {:g}\n", s.slot_width_m / mm);
      fmt::print(out, "bottom = \"{}\"\n", to_string(s.bottom));
      break;
    case SlotShape::open:
      fmt::print(out, "slot_width_mm = {:g}\nwedge_height_mm = {:g}\nbottom = \"{}\"\n",
                 s.slot_width_m / mm, s.wedge_height_m / mm, to_string(s.bottom));
      break;
    case SlotShape::open_radial:
      fmt::print(out, "slot_angle_deg = {:g}\nwedge_height_mm = {:g}\n", s.slot_angle_rad * to_deg,
                 s.wedge_height_m / mm);
      break;
  }
  const auto& r = c.rotor;
  fmt::print(out, "\n[rotor]\nkind = \"{}\"\nouter_diameter_mm = {:g}\nshaft_diameter_mm = {:g}\n",
             to_string(r.kind), r.outer_diameter_m / mm, r.shaft_diameter_m / mm);
  if (r.kind == RotorKind::cage) {
    const auto& b = r.bar;
    fmt::print(out, "bars = {}\n\n[rotor.bar]\nshape = \"{}\"\n", r.bars, to_string(b.shape));
    switch (b.shape) {
      case BarShape::round:
        fmt::print(out, "diameter_mm = {:g}\n", b.diameter_m / mm);
        break;
      case BarShape::teardrop:
        fmt::print(out, "top_radius_mm = {:g}\nbottom_radius_mm = {:g}\nheight_mm = {:g}\n",
                   b.top_radius_m / mm, b.bottom_radius_m / mm, b.height_m / mm);
        break;
      case BarShape::rectangular:
        fmt::print(out, "width_mm = {:g}\nheight_mm = {:g}\n", b.width_m / mm, b.height_m / mm);
        break;
    }
    fmt::print(out, "closure = \"{}\"\n", to_string(b.closure));
    if (b.closure == BarClosure::closed)
      fmt::print(out, "bridge_thickness_mm = {:g}\n", b.bridge_thickness_m / mm);
    else
      fmt::print(out, "opening_width_mm = {:g}\nopening_height_mm = {:g}\n", b.opening_width_m / mm,
                 b.opening_height_m / mm);
  }
  const auto& w = c.winding;
  fmt::print(
      out,
      "\n[winding]\nlayers = {}\ncoil_pitch_slots = {}\nturns_per_coil = {}\nparallel_paths = {}\n",
      w.layers, w.coil_pitch_slots, w.turns_per_coil, w.parallel_paths);
  const auto& m = c.materials;
  fmt::print(
      out, "\n[materials]\nstator_iron = {}\nrotor_iron = {}\ncoils = {}\nbars = {}\nshaft = {}\n",
      quote_text(m.stator_iron), quote_text(m.rotor_iron), quote_text(m.coils), quote_text(m.bars),
      quote_text(m.shaft));
  const auto& sp = c.supply;
  fmt::print(out, "\n[supply]\nfeed = \"{}\"\nfrequency_hz = {:.9g}{}\n", to_string(sp.feed),
             sp.frequency_hz, sp.frequency_detected ? "  # detected from the waveform table" : "");
  const bool line = sp.voltage_fed() && sp.voltage_basis == VoltageBasis::line_to_line;
  if (sp.voltage_fed())
    fmt::print(out, "connection = \"{}\"\nvoltages = \"{}\"\n", to_string(sp.connection),
               to_string(sp.voltage_basis));
  const char* names[3] = {line ? "ab" : "a", line ? "bc" : "b", line ? "ca" : "c"};
  const char* key = sp.voltage_fed() ? "rms_v" : "rms_a";
  const char* unit = sp.unit();
  if (sp.form == SupplyForm::waveform) {
    fmt::print(out, "waveform.file = \"{}\"  # {} rows, {:.6g} s to {:.6g} s\n", sp.waveform.file,
               sp.waveform.time_s.size(), sp.waveform.time_s.front(), sp.waveform.time_s.back());
  } else {
    if (sp.form == SupplyForm::sequence) {
      const char* seq[3] = {"zero", "positive", "negative"};
      for (int q = 0; q < 3; ++q)
        fmt::print(out, "sequence.{} = {{ {} = {:g}, angle_deg = {:g} }}\n", seq[q], key,
                   sp.sequence[q].rms, sp.sequence[q].angle_rad * to_deg);
      fmt::print(out, "# resolved to phases:\n");
    }
    for (int k = 0; k < 3; ++k)
      fmt::print(out, "{}phases.{} = {{ {} = {:.6g}, angle_deg = {:.6g} }}\n",
                 sp.form == SupplyForm::sequence ? "# " : "", names[k], key, sp.phases[k].rms,
                 sp.phases[k].angle_rad * to_deg);
    // What the description amounts to, per order (Fortescue), before any field is solved.
    std::array<Phasor, 3> f;
    for (int k = 0; k < 3; ++k) f[k] = std::polar(sp.phases[k].rms, sp.phases[k].angle_rad);
    // Line-to-line values: the metrics of the phase set they make (without zero sequence), as
    // the run reports them.
    if (line) f = {(f[0] - f[2]) / 3.0, (f[1] - f[0]) / 3.0, (f[2] - f[1]) / 3.0};
    const SequenceSet q = fortescue(f);
    const UnbalanceMetrics u = unbalance_metrics(f);
    fmt::print(out,
               "# fundamental sequences: positive {:.4g} {}, negative {:.4g} {}, zero {:.4g} {}; "
               "VUF {:.3f} %, LVUR {:.3f} %, PVUR {:.3f} %{}\n",
               std::abs(q.positive), unit, std::abs(q.negative), unit, std::abs(q.zero), unit,
               u.vuf_pct, u.lvur_pct, u.pvur_pct,
               line ? " (of the phase set the line voltages make)" : "");
    for (const SupplyComponent& h : sp.harmonics) {
      std::array<Phasor, 3> x;
      for (int k = 0; k < 3; ++k) x[k] = std::polar(h.rms[k], h.angle_rad[k]);
      const SequenceSet hq = fortescue(x);
      fmt::print(out, "# order {:g}: positive {:.4g} {}, negative {:.4g} {}, zero {:.4g} {}\n",
                 h.order, std::abs(hq.positive), unit, std::abs(hq.negative), unit,
                 std::abs(hq.zero), unit);
    }
    for (const SupplyComponent& h : sp.harmonics)
      fmt::print(out,
                 "# {}: order {:g}: {} {:.4g} {} ∠{:.4g}°, {} {:.4g} {} ∠{:.4g}°, {} {:.4g} {} "
                 "∠{:.4g}°\n",
                 h.key_path, h.order, names[0], h.rms[0], unit, wrapped_deg(h.angle_rad[0]),
                 names[1], h.rms[1], unit, wrapped_deg(h.angle_rad[1]), names[2], h.rms[2], unit,
                 wrapped_deg(h.angle_rad[2]));
  }
  fmt::print(
      out,
      "\n[mesh]\norder = {}\nairgap_size_mm = {:g}\niron_size_mm = {:g}\ngrowth_rate = "
      "{:g}\nband_nodes = {}\nsymmetry = \"{}\"\n# about {:.0f} thousand triangles expected in "
      "the modelled sector\n",
      mesh.order, mesh.airgap_size_m / mm, mesh.iron_size_m / mm, mesh.growth_rate, mesh.band_nodes,
      to_string(c.mesh.symmetry), mesh.forecast.triangles / 1e3);
  print_mesh_accuracy(out, mesh);
  const StudySpec& st = c.study;
  const bool stepping = st.kind == StudyKind::time_stepping;
  const char* kind = stepping                              ? "time_stepping"
                     : st.kind == StudyKind::time_harmonic ? "time_harmonic"
                     : st.kind == StudyKind::slip_curves   ? "slip_curves"
                                                           : "static";
  fmt::print(out, "\n[study]\nkind = \"{}\"\nrotor_angle_deg = {:g}\ntime_s = {:g}\n", kind,
             st.rotor_angle_rad * to_deg, st.time_s);
  if (stepping)
    fmt::print(out, "steps_per_period = {}\nperiods = {:g}\ndiscard_periods = {:g}\n",
               st.steps_per_period, st.periods, st.discard_periods);
  if (st.kind != StudyKind::static_field) {
    const char* motion = st.motion == Motion::slip    ? "slip"
                         : st.motion == Motion::speed ? "speed"
                                                      : "locked";
    fmt::print(out, "motion = \"{}\"\n", motion);
    if (st.motion == Motion::slip) fmt::print(out, "slip = {:g}\n", st.slip);
    if (st.motion == Motion::speed) fmt::print(out, "speed_rpm = {:g}\n", st.speed_rpm);
  }
  if (stepping) fmt::print(out, "band_aligned_steps = {}\n", st.band_aligned_steps);
  if (st.kind == StudyKind::slip_curves)
    fmt::print(out, "slip_from = {:g}\nslip_to = {:g}\npoints = {}\n", st.slip_from, st.slip_to,
               st.points);
  if (c.rotor_currents.bar_rms_a > 0)
    fmt::print(out,
               "\n[rotor_currents]  # imposed, not induced\nbar_rms_a = {:g}\nangle_deg = {:g}\n",
               c.rotor_currents.bar_rms_a, c.rotor_currents.angle_rad * to_deg);
  fmt::print(out, "\n[output]\nfields_every = {}\n", c.output.fields_every);

  const auto& sd = lam.slot;
  const auto& sym = lam.symmetry;
  fmt::print(out, "\n# derived\n");
  fmt::print(out, "airgap_mm = {:.4f}\n", lam.airgap_m() / mm);
  fmt::print(out, "band_radii_mm = [{:.4f}, {:.4f}]\n", lam.band_inner_radius_m / mm,
             lam.band_outer_radius_m / mm);
  fmt::print(out, "slots_per_pole_per_phase = {:.4f}\n", double(lam.slots) / (3.0 * lam.poles));
  fmt::print(out, "slot_pitch_at_bore_mm = {:.4f}\n", sd.slot_pitch_at_bore_m / mm);
  fmt::print(out, "tooth_width_min_mm = {:.4f}\n", sd.tooth_width_min_m / mm);
  fmt::print(out, "slot_area_mm2 = {:.4f}\n", sd.slot_area_m2 / (mm * mm));
  fmt::print(out, "winding_area_mm2 = {:.4f}\n", sd.winding_area_m2 / (mm * mm));
  if (lam.layers == 2)
    fmt::print(out, "coil_side_areas_mm2 = [{:.4f}, {:.4f}]\n", sd.coil_side_area_m2[0] / (mm * mm),
               sd.coil_side_area_m2[1] / (mm * mm));
  fmt::print(out, "stator_yoke_height_mm = {:.4f}\n", sd.yoke_height_m / mm);
  if (lam.bars > 0) {
    fmt::print(out, "bar_pitch_at_surface_mm = {:.4f}\n", lam.bar.bar_pitch_at_surface_m / mm);
    fmt::print(out, "bar_area_mm2 = {:.4f}\n", lam.bar.bar_area_m2 / (mm * mm));
    fmt::print(out, "rotor_tooth_width_min_mm = {:.4f}\n", lam.bar.rotor_tooth_width_min_m / mm);
    fmt::print(out, "rotor_yoke_height_mm = {:.4f}\n",
               (lam.bar.bar_bottom_radius_m - lam.shaft_radius_m) / mm);
  }
  const WindingLayout& lay = lam.winding;
  fmt::print(out, "series_turns_per_phase = {:g}\n", lay.series_turns_per_phase);
  {
    const WindingResistance r = phase_resistance(c, lam, resolve_region_materials(c).coils);
    fmt::print(out, "phase_resistance_ohm = {:.6g}  # {}\n", r.resistance_ohm,
               r.resistance_given
                   ? "given"
                   : fmt::format("DC, at {:g} °C, from the winding's geometry", r.temperature_c));
    fmt::print(out, "end_winding_inductance_mh = {:.6g}  # {}\n", r.end_inductance_h * 1e3,
               r.end_inductance_estimated ? "rough estimate (voltage feed only)" : "given");
  }
  fmt::print(out, "phase_axes_mech_deg = [{:.3f}, {:.3f}, {:.3f}]  # a, b, c magnetic axes\n",
             lay.phase_axis_el_rad[0] * to_deg / lay.pole_pairs,
             lay.phase_axis_el_rad[1] * to_deg / lay.pole_pairs,
             lay.phase_axis_el_rad[2] * to_deg / lay.pole_pairs);
  fmt::print(out, "\n# winding factors (electrical space-harmonic order)\n");
  fmt::print(out, "# {:>6} {:>8} {:>8} {:>8}\n", "order", "kd", "kp", "kw");
  for (const WindingFactor& f : lay.factors)
    fmt::print(out, "# {:>6g} {:>8.5f} {:>8.5f} {:>8.5f}{}\n", f.order, f.kd, f.kp, f.kw,
               f.slot_harmonic ? "  slot harmonic" : "");
  fmt::print(
      out, "\n# slot table: slot, layer, phase and sign (+: positive current out of the plane)\n");
  for (int k = 0; k < lay.slots; ++k) {
    std::string row = fmt::format("# s{:02d}", k + 1);
    for (int l = 0; l < lay.layers; ++l) {
      const CoilSide& side = lay.side(k, l);
      row += fmt::format("  {}{}{}", lay.layers == 2 ? (l == 0 ? "top " : "bottom ") : "",
                         phase_name(side.phase), side.sign > 0 ? "+" : "-");
    }
    fmt::print(out, "{}\n", row);
  }
  fmt::print(out, "\n");
  fmt::print(out,
             "symmetry = \"{}\"  # {} of {} sector(s), {:.4f}°, {} slot(s) and {} bar(s) each\n",
             sym.sectors == 1 ? "full" : (sym.antiperiodic ? "antiperiodic" : "periodic"), 1,
             sym.sectors, sym.sector_angle_rad * to_deg, sym.slots_in_sector, sym.bars_in_sector);
}

void print_mesh_statistics(std::ostream& out, const Mesh& mesh, const MeshQuality& q) {
  fmt::print(out, "mesh: order {}, {} triangles, {} vertices, {} nodes\n", mesh.order, q.triangles,
             q.vertices, q.nodes);
  fmt::print(out, "quality: min angle {:.2f}°, max aspect ratio {:.3f}\n", q.min_angle_deg,
             q.max_aspect_ratio);
  fmt::print(out, "band: {} + {} vertices on r = {:.4f} / {:.4f} mm, pitch {:.5f}°\n",
             mesh.stator_ring.vertices.size(), mesh.rotor_ring.vertices.size(),
             mesh.stator_ring.radius_m / mm, mesh.rotor_ring.radius_m / mm,
             mesh.stator_ring.pitch_rad * to_deg);
  fmt::print(out, "sector: {} of {}, {} periodic node pairs, {} outer nodes\n", 1,
             mesh.symmetry.sectors, mesh.periodic_pairs.size(), mesh.outer_nodes.size());
  fmt::print(out, "area: {:.6f} mm² (sector)\n", q.total_area_m2 / (mm * mm));
  // Regions summed by kind keep the table short on many-slot machines.
  std::map<std::string, std::pair<std::size_t, double>> by_kind;
  for (std::size_t i = 0; i < mesh.regions.size(); ++i) {
    auto& row = by_kind[to_string(mesh.regions[i].tag.kind)];
    row.first += q.triangles_per_region[i];
    row.second += q.area_per_region_m2[i];
  }
  fmt::print(out, "{:<20} {:>10} {:>14}\n", "region kind", "triangles", "area_mm2");
  for (const auto& [kind, row] : by_kind)
    fmt::print(out, "{:<20} {:>10} {:>14.4f}\n", kind, row.first, row.second / (mm * mm));
}

}  // namespace gapflux
