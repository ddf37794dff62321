#include "postproc/summary.hpp"

#include "postproc/output_file.hpp"

#include <algorithm>
#include <cmath>
#include <fstream>
#include <nlohmann/json.hpp>
#include <stdexcept>

namespace gapflux {
namespace {

using nlohmann::json;

constexpr double rad_to_deg = 180.0 / 3.14159265358979323846;

std::string fmt_key(const char* name, const char* unit) {
  return std::string(name) + "_" + unit;
}

json phasor_json(const Phasor& x, const char* unit_key) {
  return {{unit_key, std::abs(x)}, {"angle_deg", std::arg(x) * rad_to_deg}};
}

json harmonics_json(const std::vector<HarmonicPhasors>& hs, const char* unit_key) {
  json out = json::array();
  for (const HarmonicPhasors& h : hs)
    out.push_back({{"order", h.order},
                   {"a", phasor_json(h.abc[0], unit_key)},
                   {"b", phasor_json(h.abc[1], unit_key)},
                   {"c", phasor_json(h.abc[2], unit_key)},
                   {"positive", phasor_json(h.sequences.positive, unit_key)},
                   {"negative", phasor_json(h.sequences.negative, unit_key)},
                   {"zero", phasor_json(h.sequences.zero, unit_key)}});
  return out;
}

json unbalance_json(const UnbalanceMetrics& u, const std::string& quantity) {
  return {{"vuf_pct", u.vuf_pct},
          {"lvur_pct", u.lvur_pct},
          {"pvur_pct", u.pvur_pct},
          {"quantity", quantity},
          {"definitions",
           {{"vuf_pct", "|negative| / |positive| sequence (IEC 61000-4-30 / IEC 60034-26)"},
            {"lvur_pct",
             "max deviation of |Xa−Xb|, |Xb−Xc|, |Xc−Xa| from their mean / mean (NEMA MG-1 form)"},
            {"pvur_pct", "max deviation of |Xa|, |Xb|, |Xc| from their mean / mean (IEEE form)"}}}};
}

json sequence_json(const std::vector<HarmonicPhasors>& hs, const char* unit) {
  const HarmonicPhasors* f = find_order(hs, 1.0);
  if (!f) return nullptr;
  return {{fmt_key("positive", unit), std::abs(f->sequences.positive)},
          {fmt_key("negative", unit), std::abs(f->sequences.negative)},
          {fmt_key("zero", unit), std::abs(f->sequences.zero)},
          {"values", "RMS of the fundamental"}};
}

void add_analysis(json& j, const RunAnalysis& a, std::size_t max_waves) {
  j["analysis"] = {{"periods", a.periods}, {"window_start_s", a.window_start_s}};
  if (!a.note.empty()) j["analysis"]["note"] = a.note;
  if (a.periods < 1) return;
  const bool voltage_fed = !a.supply_voltage.empty();
  // The unbalance of what the supply imposes: its voltages when voltage-fed, else the currents.
  j["supply"]["unbalance"] =
      voltage_fed ? unbalance_json(a.voltage_unbalance,
                                   "supply phase (line-to-neutral) voltages, fundamental phasors")
                  : unbalance_json(a.current_unbalance, "phase currents, fundamental phasors");
  j["supply"]["current_unbalance"] =
      voltage_fed ? unbalance_json(a.line_current_unbalance, "line currents, fundamental phasors")
                  : unbalance_json(a.current_unbalance, "phase currents, fundamental phasors");
  j["supply"]["current_sequence"] = sequence_json(a.current, "a");
  j["supply"]["current_harmonics"] = harmonics_json(a.current, "rms_a");
  if (voltage_fed) {
    j["supply"]["voltage_sequence"] = sequence_json(a.supply_voltage, "v");
    j["supply"]["voltage_harmonics"] = harmonics_json(a.supply_voltage, "rms_v");
    j["supply"]["line_voltage_harmonics"] = harmonics_json(a.line_voltage, "rms_v");
    j["supply"]["line_current_sequence"] = sequence_json(a.line_current, "a");
    j["supply"]["line_current_harmonics"] = harmonics_json(a.line_current, "rms_a");
    j["supply"]["winding_voltage_harmonics"] = harmonics_json(a.winding_voltage, "rms_v");
    j["supply"]["note"] =
        "current_* keys describe the winding (branch) currents; line_current_* the lines; a "
        "delta's branch currents may carry a circulating zero sequence the lines do not";
  }
  j["field"]["flux_linkage_harmonics"] = harmonics_json(a.flux_linkage, "rms_wb");
  j["field"]["emf_harmonics"] = harmonics_json(a.emf, "rms_v");
  json space = json::array();
  for (const SpaceHarmonic& h : a.space_harmonics)
    space.push_back({{"order_mech", h.order_mech},
                     {"order_el", h.order_el},
                     {"amplitude_tesla", h.amplitude_tesla},
                     {"label", h.label}});
  j["airgap"]["space_harmonics"] = space;
  json waves = json::array();
  for (std::size_t i = 0; i < a.waves.size() && i < max_waves; ++i) {
    const Wave& w = a.waves[i].wave;
    waves.push_back({{"space_order_el", w.space_order_el},
                     {"space_order_mech", w.space_order_mech},
                     {"time_order", w.time_order},
                     {"direction", w.direction > 0           ? "forward"
                                   : w.direction < 0         ? "backward"
                                   : w.space_order_mech == 0 ? "pulsating"
                                                             : "static"},
                     {"amplitude_tesla", w.amplitude},
                     {"phase_deg", w.phase_rad * rad_to_deg},
                     {"label", a.waves[i].label}});
  }
  j["airgap"]["waves"] = waves;
  json forces = json::array();
  for (const ForceWave& w : a.force_waves) {
    if (w.time_order == 0.0) continue;  // static pressure does not vibrate the stator
    if (forces.size() >= 20) break;
    forces.push_back({{"mode", w.mode},
                      {"time_order", w.time_order},
                      {"frequency_hz", w.frequency_hz},
                      {"direction", w.direction > 0   ? "forward"
                                    : w.direction < 0 ? "backward"
                                                      : "pulsating"},
                      {"amplitude_n_per_m2", w.amplitude_n_per_m2},
                      {"low_mode", w.low_mode}});
  }
  j["forces"] = {{"waves", forces},
                 {"quantity", "radial force density (B_r² − B_θ²)/(2μ0) at mid-gap"},
                 {"note",
                  "time-varying waves only, largest first; low modes (0–4) are the ones "
                  "a stator yoke responds to most"}};
  j["airgap"]["locus"] = {
      {"major_tesla", a.locus.major_tesla},       {"minor_tesla", a.locus.minor_tesla},
      {"axis_ratio", a.locus.axis_ratio},         {"forward_tesla", a.locus.forward_tesla},
      {"backward_tesla", a.locus.backward_tesla}, {"major_axis_deg_el", a.locus.major_axis_deg_el}};
}

// start = "time_harmonic": the harmonic model's prediction beside what the stepping gave over the
// analysis window, and their differences (the comparison a user checks the quick model with).
json start_prediction_json(const RunSummary& s) {
  const RunSummary::HarmonicPrediction& p = *s.start_prediction;
  json predicted = {{"slip", p.slip},
                    {"torque_nm", p.torque_nm},
                    {"current_positive_a", p.current_positive_a},
                    {"current_negative_a", p.current_negative_a}};
  if (s.cage)
    predicted.update({{"bar_forward_rms_a", p.bar_forward_rms_a},
                      {"bar_backward_rms_a", p.bar_backward_rms_a},
                      {"cage_loss_w", p.cage_w}});
  json stepped = json::object();
  if (s.torque_available) stepped["torque_nm"] = s.torque_mean_nm;
  const HarmonicPhasors* f =
      s.analysis && s.analysis->periods >= 1 ? find_order(s.analysis->current, 1.0) : nullptr;
  if (f) {
    stepped["current_positive_a"] = std::abs(f->sequences.positive);
    stepped["current_negative_a"] = std::abs(f->sequences.negative);
  }
  if (s.cage && f) {
    const CageAnalysis& c = s.cage->analysis;
    stepped.update({{"bar_forward_rms_a", c.forward_bar_rms_a},
                    {"bar_backward_rms_a", c.backward_bar_rms_a},
                    {"cage_loss_w", c.loss_forward_w + c.loss_backward_w}});
  }
  // Keyed by the quantity with the unit replaced by "pct" (torque_nm → torque_pct), so that a
  // sweep's table titles it in %.
  json difference = json::object();
  for (const auto& [key, value] : stepped.items()) {
    const double v = value.get<double>(), q = predicted[key].get<double>();
    const std::string name = key.substr(0, key.rfind('_')) + "_pct";
    difference[name] = v != 0.0 ? json(100.0 * (q - v) / std::abs(v)) : json(nullptr);
  }
  // What the harmonic model leaves out by construction, measured in the stepped run: the torque
  // of the space harmonics (the total less the pole-pair wave's), the bars' current beyond their
  // forward and backward waves, the cage loss beyond theirs.
  json beyond = json::object();
  if (s.power && s.torque_available && s.torque_mean_nm != 0.0)
    beyond["torque_pct"] =
        100.0 * (s.torque_mean_nm - s.power->fundamental_torque_nm) / std::abs(s.torque_mean_nm);
  if (s.cage && f) {
    const CageAnalysis& c = s.cage->analysis;
    const double waves2 =
        c.forward_bar_rms_a * c.forward_bar_rms_a + c.backward_bar_rms_a * c.backward_bar_rms_a;
    const double rest2 = std::max(0.0, c.bar_rms_a * c.bar_rms_a - waves2);
    if (c.bar_rms_a > 0.0) beyond["bar_current_rms_pct"] = 100.0 * std::sqrt(rest2) / c.bar_rms_a;
    if (c.loss_w > 0.0) beyond["cage_loss_pct"] = 100.0 * c.loss_rest_w / c.loss_w;
  }
  if (!beyond.empty())
    beyond["note"] =
        "shares of the stepped run's torque, bar current (RMS) and cage loss that the slot and "
        "space harmonics carry: what the harmonic model, holding one rotor position and the "
        "fundamental, cannot predict";
  return {{"predicted", predicted},
          {"stepped", stepped},
          {"difference_pct", difference},
          {"beyond_fundamental", beyond.empty() ? json(nullptr) : beyond},
          {"note",
           "predicted: the time-harmonic solution the run started from (supply fundamental, rotor "
           "held, the negative sequence at slip 2 − s on the positive sequence's effective "
           "reluctivity); stepped: the analysis window of this run (currents: fundamental "
           "sequences of the winding branches, RMS; cage loss: its forward and backward waves' "
           "shares). difference_pct: (predicted − stepped) / |stepped| per quantity, in %"}};
}

}  // namespace

void write_summary_json(const std::string& path, const RunSummary& s) {
  json j;
  j["schema"] = "gapflux-summary/1";
  j["case_name"] = s.case_name;
  j["mesh"] = {{"vertices", s.vertices},
               {"triangles", s.triangles},
               {"order", s.order},
               {"dofs", s.dofs},
               {"min_angle_deg", s.min_angle_deg},
               {"sectors", s.sectors},
               {"antiperiodic", s.antiperiodic},
               {"scale", s.mesh_scale},
               {"accuracy_pct", s.mesh_accuracy_pct},
               {"accuracy_basis", s.mesh_accuracy_basis}};
  json factors = json::array();
  for (const WindingFactor& f : s.factors)
    factors.push_back({{"order", f.order},
                       {"kd", f.kd},
                       {"kp", f.kp},
                       {"kw", f.kw},
                       {"slot_harmonic", f.slot_harmonic}});
  j["winding"] = {{"slots", s.slots},
                  {"poles", s.poles},
                  {"layers", s.layers},
                  {"coil_pitch_slots", s.coil_pitch_slots},
                  {"series_turns_per_phase", s.series_turns_per_phase},
                  {"phase_axis_deg_el", s.phase_axis_deg_el},
                  {"factors", factors}};
  j["supply"] = {{"frequency_hz", s.frequency_hz}, {"feed", s.voltage_fed ? "voltage" : "current"}};
  if (s.time_stepping) {
    // Over time, not at one instant: the energies are not recorded per step, so they are left
    // out rather than given as zeros.
    j["field"] = {{"flux_linkage_wb", s.flux_linkage_wb},
                  {"flux_linkage_at", "the last step"},
                  {"b_peak_tesla", s.b_peak_tesla},
                  {"b_peak_over", "every triangle and retained step"}};
  } else {
    j["supply"]["instant"] = {{"time_s", s.time_s},
                              {"rotor_angle_deg", s.rotor_angle_deg},
                              {"phase_current_a", s.phase_current_a}};
    j["field"] = {{"flux_linkage_wb", s.flux_linkage_wb},
                  {"energy_j", s.energy_j},
                  {"coenergy_j", s.coenergy_j},
                  {"b_peak_tesla", s.b_peak_tesla}};
  }
  j["airgap"] = {{"radius_m", s.airgap_radius_m}};
  j["solver"] = {{"steps", s.steps},
                 {"newton_iterations", s.newton_iterations},
                 {"newton_factorizations", s.newton_factorizations},
                 {"cg_iterations", s.cg_iterations},
                 {"converged", s.converged},
                 {"wall_s", s.wall_s},
                 {"set_up_s", s.set_up_s},
                 {"mesh_s", s.mesh_s},
                 {"mesh_from_cache", s.mesh_from_cache},
                 {"start", s.start.empty() ? json(nullptr) : json(s.start)},
                 {"residual_history", s.residual_history},
                 {"step_history", s.step_history}};
  if (!s.failure.empty()) j["solver"]["failure"] = s.failure;
  if (s.start == "time_harmonic") {
    j["solver"]["start_harmonic_solves"] = s.start_harmonic_solves;
    j["solver"]["start_harmonic_s"] = s.start_harmonic_s;
  }
  if (s.time_stepping) {
    j["study"] = {{"kind", "time_stepping"},
                  {"dt_s", s.dt_s},
                  {"steps_per_period", s.steps_per_period},
                  {"discarded_steps", s.discarded_steps},
                  {"mechanical_speed_rpm", s.mechanical_speed_rpm}};
    // Only band-aligned steps move the rotor by a whole number of band pitches.
    if (s.band_pitches_per_step > 0) j["study"]["band_pitches_per_step"] = s.band_pitches_per_step;
  }
  if (s.voltage_fed)
    j["circuit"] = {
        {"connection", s.connection},
        {"voltages_given", s.voltage_basis},
        {"time_scheme", s.time_scheme},
        {"phase_resistance_ohm", s.phase_resistance_ohm},
        {"resistance_given", s.resistance_given},
        {"end_winding_inductance_h", s.end_inductance_h},
        {"end_winding_inductance_estimated", s.end_inductance_estimated},
        {"model",
         s.cage ? "v = R·i + L_end·di/dt + dψ/dt per winding branch, ψ from the field, solved "
                  "with the field and the cage's induced currents at every step"
                : "v = R·i + L_end·di/dt + dψ/dt per winding branch, ψ from the field, solved "
                  "with it at every step; the bars carry no induced currents here (a smooth "
                  "rotor, or bar currents imposed), so the backward field and the "
                  "negative-sequence currents are not damped as a real cage damps them"}};
  if (s.steady_state) {
    const SteadyStateIndicator& ss = *s.steady_state;
    j["steady_state"] = {
        {"period_change_pct", ss.change_pct},
        {"last_change_pct", ss.change_pct.empty() ? json(nullptr) : json(ss.change_pct.back())},
        {"period_dc_pct", ss.dc_pct},
        {"last_dc_pct", ss.dc_pct.empty() ? json(nullptr) : json(ss.dc_pct.back())},
        {"period_torque_change_pct", ss.torque_change_pct},
        {"period_cage_change_pct", ss.cage_change_pct},
        {"last_worst_pct", ss.change_pct.empty() ? json(nullptr) : json(ss.last_worst_pct())},
        {"tolerance_pct", ss.tolerance_pct},
        {"reached", ss.reached},
        {"measure",
         "per whole period from the first step: the largest change of a phase's fundamental "
         "flux-linkage phasor from the period before and the largest DC part of a phase's flux "
         "linkage, in % of the largest fundamental amplitude; the change of the mean torque, in % "
         "of the period's RMS torque; with an induced cage, the change of the magnitudes of the "
         "forward and backward parts of its current wave (pole-pair order, stator frame), in % "
         "of the larger; reached when all are below the tolerance in the last period"}};
    if (s.settled_stop)
      j["steady_state"]["stopped_when_settled"] = {{"settled", s.settled_at_period > 0},
                                                   {"periods_run", s.periods_run},
                                                   {"periods_allowed", s.periods_allowed}};
  }
  if (s.torque_available) {
    json harmonics = json::array();
    if (s.analysis)
      for (const TorqueHarmonic& t : s.analysis->torque_harmonics)
        harmonics.push_back({{"order", t.order},
                             {"amplitude_nm", t.amplitude_nm},
                             {"label", t.label},
                             {"source", t.source}});
    else
      for (const auto& [order, amplitude] : s.torque_harmonics)
        harmonics.push_back({{"order", order}, {"amplitude_nm", amplitude}});
    j["torque"] = {
        {"mean_nm", s.torque_mean_nm},       {"min_nm", s.torque_min_nm},
        {"max_nm", s.torque_max_nm},         {"peak_to_peak_nm", s.torque_max_nm - s.torque_min_nm},
        {"ripple_pct", s.torque_ripple_pct}, {"harmonics", harmonics},
        {"method", "Arkkio band integral"}};
  }
  if (s.cage) {
    const CageAnalysis& c = s.cage->analysis;
    j["cage"] = {
        {"currents", "induced"},
        {"temperature_c", s.cage->temperature_c},
        {"bar_conductivity_s_per_m", s.cage->bar_conductivity_s_per_m},
        {"ring_segment_resistance_ohm", s.cage->ring_segment_resistance_ohm},
        {"ring_segment_resistance",
         s.cage->ring_resistance_given ? "given" : "from the dimensions"},
        {"ring_segment_inductance_h", s.cage->ring_segment_inductance_h},
        {"ring_segment_inductance",
         s.cage->ring_inductance_given ? "given" : "estimated (rough: μ0·0.3·segment length)"},
        {"ring_mean_diameter_m", s.cage->ring_mean_diameter_m},
        {"ring_area_m2", s.cage->ring_area_m2},
        {"bar_rms_a", c.bar_rms_a},
        {"ring_rms_a", c.ring_rms_a},
        {"ring_to_bar", c.ring_to_bar},
        {"ring_to_bar_balanced", c.ring_to_bar_balanced},
        {"forward",
         {{"frequency_hz", c.forward_hz},
          {"bar_rms_a", c.forward_bar_rms_a},
          {"loss_w", c.loss_forward_w}}},
        {"backward",
         {{"frequency_hz", c.backward_hz},
          {"bar_rms_a", c.backward_bar_rms_a},
          {"loss_w", c.loss_backward_w}}},
        {"loss_w", c.loss_w},
        {"loss_bars_w", c.loss_bars_w},
        {"loss_rings_w", c.loss_rings_w},
        {"loss_rest_w", c.loss_rest_w},
        {"over", "the analysis window"},
        {"loss_model",
         "bars: ∫ J²/σ over the FE current density (skin and slot effects included); rings: "
         "R·i² per segment, both rings; the forward and backward shares from the two waves' "
         "frequencies fitted to each bar triangle and ring segment; the rest is harmonics and "
         "what is left of the start"}};
  }
  if (s.start_prediction) j["time_harmonic_start"] = start_prediction_json(s);
  if (s.power) {
    const PowerBalance& p = *s.power;
    j["power"] = {
        {"slip", p.slip},
        {"input_w", p.input_w},
        {"stator_copper_w", p.copper_w},
        {"cage_w", p.cage_w},
        {"airgap_w", p.airgap_w},
        {"slip_times_airgap_w", p.slip_times_airgap_w},
        {"fundamental_torque_nm", p.fundamental_torque_nm},
        {"fundamental_airgap_w", p.fundamental_airgap_w},
        {"slip_times_fundamental_airgap_w", p.slip_times_fundamental_w},
        {"mechanical_w", p.mechanical_w},
        {"iron_estimate_w", p.iron_w},
        {"balance_residual_pct", p.balance_residual_pct},
        {"efficiency_pct", p.efficiency_pct},
        {"power_factor", p.power_factor},
        {"displacement_factor", p.displacement_factor},
        {"over", "the analysis window"},
        {"definitions",
         "input Σ⟨v·i⟩ over the winding branches; air gap T·Ω_sync; mechanical T·Ω_rotor; the "
         "balance compares the input with stator copper + cage + mechanical (the FE iron is "
         "lossless); efficiency = mechanical / (input + iron estimate), no friction, windage or "
         "stray load loss; power_factor = input / Σ V·I (RMS per branch); displacement_factor = "
         "cos(∠V1 − ∠I1) of the positive sequences"}};
    if (s.torque_2f_nm > 0) j["torque"]["twice_supply_frequency_nm"] = s.torque_2f_nm;
  }
  if (s.negative_sequence_impedance_ohm) {
    const std::complex<double> z = *s.negative_sequence_impedance_ohm;
    j["supply"]["negative_sequence_impedance"] = {
        {"ohm", std::abs(z)},
        {"angle_deg", std::arg(z) * 180.0 / 3.14159265358979323846},
        {"resistance_ohm", z.real()},
        {"reactance_ohm", z.imag()},
        {"definition", "V2/I2 of the fundamental phase voltages and line currents"}};
    j["supply"]["unbalance_amplification"] = s.unbalance_amplification;
  }
  j["rotor_currents"] = {
      {"bar_rms_a", s.bar_rms_a},
      {"note",
       s.cage ? "induced: the cage's currents follow from the field (see cage)"
       : s.bar_rms_a > 0
           ? "imposed on the bars, not induced (rotor.bar_currents = \"imposed\")"
           : (s.time_stepping ? "none: a smooth rotor"
                              : "none: a static study has no time for currents to be "
                                "induced (rotor.bar_currents = \"imposed\" imposes a set)")}};
  j["supply"]["form"] = s.supply_form;
  j["supply"]["frequency_detected"] = s.frequency_detected;
  if (s.analysis) {
    add_analysis(j, *s.analysis, 40);
  } else if (s.described_fundamental) {
    // A static study: the supply as described, not as analysed over time.
    const auto& f = *s.described_fundamental;
    const UnbalanceMetrics u = unbalance_metrics(f);
    const SequenceSet q = fortescue(f);
    j["supply"]["unbalance"] = {{"vuf_pct", u.vuf_pct},
                                {"lvur_pct", u.lvur_pct},
                                {"pvur_pct", u.pvur_pct},
                                {"quantity", "phase currents as described, fundamental"}};
    j["supply"]["current_sequence"] = {{"positive_a", std::abs(q.positive)},
                                       {"negative_a", std::abs(q.negative)},
                                       {"zero_a", std::abs(q.zero)},
                                       {"values", "RMS of the fundamental"}};
  }
  if (s.saturation) {
    json zones = json::array();
    double threshold = 0.0;
    for (const SaturationZone& z : s.saturation->zones) {
      json row = {{"name", z.name},
                  {"peak_tesla", z.peak_tesla},
                  {"median_tesla", z.median_tesla},
                  {"p95_tesla", z.p95_tesla},
                  {"area_fraction_over", z.area_fraction_over},
                  {"threshold_tesla", z.threshold_tesla}};
      if (z.tooth >= 0) {
        row["tooth"] = z.tooth;
        row["angle_deg"] = z.angle_deg;
        row["nearest_phase_axis"] = z.nearest_phase;
        threshold = z.threshold_tesla;
      }
      zones.push_back(row);
    }
    j["saturation"] = {{"threshold_tesla", threshold},
                       {"peak_tesla", s.saturation->peak_tesla_overall},
                       {"regions", zones},
                       {"over", "the last electrical period"},
                       {"threshold",
                        "the case's, else each iron's deep saturation: where its differential "
                        "relative permeability falls to 10 (0: linear iron)"},
                       {"percentiles",
                        "median and p95 are area-weighted over the zone's triangles; the peak "
                        "may come from one small triangle at a sharp corner"}};
  }
  if (s.losses_available)
    j["losses"] = {{"iron_w", s.iron_stator_w + s.iron_rotor_w},
                   {"iron_stator_w", s.iron_stator_w},
                   {"iron_rotor_w", s.iron_rotor_w},
                   {"copper_w", s.copper_w},
                   {"copper",
                    {{"phase_resistance_ohm", s.phase_resistance_ohm},
                     {"conductor_temperature_c", s.conductor_temperature_c},
                     {"end_winding_length_m", s.end_winding_length_m},
                     {"end_winding_estimated", s.end_winding_estimated},
                     {"model",
                      "DC resistance ρ(T)·N_s·2(L_stack + l_end)/(a·A_c), A_c = fill × "
                      "coil-side area / turns per coil; I² as the RMS over the period; "
                      "no skin or proximity effect; bars' losses not included (imposed "
                      "currents)"}}},
                   {"over", "the last electrical period"},
                   {"model",
                    "Steinmetz/Bertotti per triangle from the time harmonics of B_x and B_y, each "
                    "as an alternating field; rotational loss not modelled separately; the rotor's "
                    "slip-frequency field is not resolved within one supply period"}};
  if (s.baseline) {
    const BaselineComparison& b = *s.baseline;
    const auto change = [](double run, double base) {
      return json{{"run", run},
                  {"baseline", base},
                  {"change", run - base},
                  {"change_pct", base != 0.0 ? 100.0 * (run - base) / std::abs(base) : 0.0}};
    };
    json zones = json::array();
    for (std::size_t i = 0; i < b.zones.size() && i < 12; ++i)
      zones.push_back({{"name", b.zones[i].name},
                       {"peak_tesla", b.zones[i].peak_tesla},
                       {"baseline_peak_tesla", b.zones[i].baseline_peak_tesla},
                       {"change_tesla", b.zones[i].peak_tesla - b.zones[i].baseline_peak_tesla}});
    json waves = json::array();
    for (const AddedWave& w : b.added_waves)
      waves.push_back({{"space_order_el", w.wave.space_order_el},
                       {"time_order", w.wave.time_order},
                       {"direction", w.wave.direction > 0   ? "forward"
                                     : w.wave.direction < 0 ? "backward"
                                                            : "standing"},
                       {"amplitude_tesla", w.wave.amplitude},
                       {"baseline_amplitude_tesla", w.baseline_amplitude_tesla},
                       {"label", w.label}});
    j["baseline"] = {
        {"dir", b.baseline_dir},
        {"supply",
         {{b.voltage_fed ? "rms_v" : "rms_a", b.fundamental_rms},
          {"angle_deg", b.fundamental_angle_deg},
          {"what", b.voltage_fed
                       ? "balanced, harmonic-free phase voltages at the run's "
                         "positive-sequence supply fundamental, same connection"
                       : "balanced, harmonic-free, the run's positive-sequence fundamental"}}},
        {"losses",
         {{"iron_w", change(b.iron_w, b.baseline_iron_w)},
          {"copper_w", change(b.copper_w, b.baseline_copper_w)},
          {"cage_w", change(b.cage_w, b.baseline_cage_w)},
          {"cage_backward_field_w", b.cage_backward_w},
          {"total_w", change(b.total_w(), b.baseline_total_w())}}},
        {"efficiency_pct", change(b.efficiency_pct, b.baseline_efficiency_pct)},
        {"torque",
         {{"mean_nm", change(b.torque_mean_nm, b.baseline_torque_mean_nm)},
          {"ripple_pct", change(b.ripple_pct, b.baseline_ripple_pct)}}},
        {"saturation", zones},
        {"added_waves", waves},
        {"guidance",
         // The derating figures are recalled from memory (NEMA MG-1 part 14): the text
         // tells users to take them from the standards' current editions.
         std::string("NEMA MG-1 advises against running above 1 % voltage unbalance and "
                     "derates the rated power beyond it (to about 0.82 at 4 % and 0.75 at 5 %); "
                     "IEC 60034-26 gives a similar curve. Take the figures from the current "
                     "editions of those standards. Both refer to voltage unbalance at the "
                     "terminals; ") +
             (b.voltage_fed
                  ? "this voltage-fed run reports it (supply.unbalance); compare its cage loss and "
                    "efficiency with the baseline's (losses above), which is what the derating "
                    "protects."
                  : "a current-fed run reports current unbalance, so compare losses, not the "
                    "percentages.")},
        {"caution",
         "Derating and protection decisions follow the standards, local codes, the motor's maker "
         "and licensed engineering practice, not these figures alone."}};
  }
  std::string model;
  if (s.cage)
    model =
        "Results come from a 2-D model of the field, the cage's induced currents (end rings "
        "as lumped resistance and a rough leakage estimate) and, when voltage-fed, the "
        "winding's circuit; end effects beyond the rings, skew, interbar currents and "
        "temperature rise are not modelled, and the iron loss is a post-processed estimate.";
  else if (s.voltage_fed)
    model =
        "Results come from a 2-D magnetostatic model of the field coupled with the winding's "
        "circuit; the bars carry no induced currents in this run, so negative-sequence and "
        "harmonic currents are far below what a cage motor would draw, and end effects, skew "
        "and temperature rise are not modelled either.";
  else
    model =
        "Results come from a 2-D magnetostatic model with imposed currents; the bars carry "
        "no induced currents in this run, and end effects, skew and temperature rise are not "
        "modelled.";
  j["cautions"] = {
      model,
      "Decisions on derating, protection settings or continued operation of a motor follow the "
      "applicable standards and local codes, the motor's maker and licensed engineering practice, "
      "not these figures alone."};
  write_file_whole(path, j.dump(2) + "\n");
}

}  // namespace gapflux
