#include "postproc/summary.hpp"

#include <fstream>
#include <nlohmann/json.hpp>
#include <stdexcept>

namespace gapflux {

void write_summary_json(const std::string& path, const RunSummary& s) {
  using nlohmann::json;
  json j;
  j["schema"] = "gapflux-summary/1";
  j["case_name"] = s.case_name;
  j["mesh"] = {{"vertices", s.vertices},
               {"triangles", s.triangles},
               {"order", s.order},
               {"dofs", s.dofs},
               {"min_angle_deg", s.min_angle_deg},
               {"sectors", s.sectors},
               {"antiperiodic", s.antiperiodic}};
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
                  {"factors", factors}};
  j["supply"] = {{"frequency_hz", s.frequency_hz},
                 {"feed", "current"},
                 {"instant",
                  {{"time_s", s.time_s},
                   {"rotor_angle_deg", s.rotor_angle_deg},
                   {"phase_current_a", s.phase_current_a}}}};
  j["field"] = {{"flux_linkage_wb", s.flux_linkage_wb},
                {"energy_j", s.energy_j},
                {"coenergy_j", s.coenergy_j},
                {"b_peak_tesla", s.b_peak_tesla}};
  j["airgap"] = {{"radius_m", s.airgap_radius_m}};
  j["solver"] = {{"steps", s.steps},
                 {"newton_iterations", s.newton_iterations},
                 {"converged", s.converged},
                 {"wall_s", s.wall_s},
                 {"residual_history", s.residual_history},
                 {"step_history", s.step_history}};
  if (!s.failure.empty()) j["solver"]["failure"] = s.failure;
  if (s.time_stepping)
    j["study"] = {{"kind", "time_stepping"},
                  {"dt_s", s.dt_s},
                  {"steps_per_period", s.steps_per_period},
                  {"discarded_steps", s.discarded_steps},
                  {"mechanical_speed_rpm", s.mechanical_speed_rpm},
                  {"band_pitches_per_step", s.band_pitches_per_step}};
  if (s.torque_available) {
    json harmonics = json::array();
    for (const auto& [order, amplitude] : s.torque_harmonics)
      harmonics.push_back({{"order", order}, {"amplitude_nm", amplitude}});
    j["torque"] = {
        {"mean_nm", s.torque_mean_nm},       {"min_nm", s.torque_min_nm},
        {"max_nm", s.torque_max_nm},         {"peak_to_peak_nm", s.torque_max_nm - s.torque_min_nm},
        {"ripple_pct", s.torque_ripple_pct}, {"harmonics", harmonics},
        {"method", "Arkkio band integral"}};
  }
  j["rotor_currents"] = {
      {"bar_rms_a", s.bar_rms_a},
      {"note", s.bar_rms_a > 0 ? "imposed on the bars, not induced: the cage's own "
                                 "currents are not modelled"
                               : "none: the cage's own currents are not modelled"}};
  std::ofstream out(path);
  out << j.dump(2) << "\n";
  if (!out) throw std::runtime_error("cannot write " + path);
}

}  // namespace gapflux
