// TransientStudy, what the finished steps hold: the saturation map and iron loss over the last
// period, and the record the run analysis reads.
#include <filesystem>
#include <numbers>

#include "postproc/result_sets.hpp"
#include "postproc/vtu_writer.hpp"
#include "transient_study.hpp"

namespace gapflux {

namespace fs = std::filesystem;

SaturationMap TransientStudy::saturation_over_last_period(int done, const std::vector<double>& all,
                                                          int first_row_step) {
  const std::size_t nt = mesh_.n_triangles();
  const int spp = grid_.steps_per_period;
  const long row = static_cast<long>(nt) * 2;
  const std::vector<double> b_last(all.begin() + (done - spp - first_row_step) * row,
                                   all.begin() + (done - first_row_step) * row);
  std::vector<double> last(b_last.size() / 2);
  for (std::size_t i = 0; i < last.size(); ++i)
    last[i] = std::hypot(b_last[2 * i], b_last[2 * i + 1]);
  // The threshold: the case's, else each iron's deep saturation (none for a linear material).
  const auto knee = [&](const Material& m) {
    if (case_.output.saturation_threshold_tesla > 0) return case_.output.saturation_threshold_tesla;
    return m.curve ? m.curve->deep_saturation_tesla() : 0.0;
  };
  std::vector<double> threshold(nt, 0.0);
  for (std::size_t t = 0; t < nt; ++t) {
    const RegionKind kind = mesh_.regions[mesh_.triangle_region[t]].tag.kind;
    if (kind == RegionKind::stator_iron) threshold[t] = knee(materials_.stator_iron);
    if (kind == RegionKind::rotor_iron) threshold[t] = knee(materials_.rotor_iron);
  }
  SaturationMap map = saturation_map(mesh_, lamination_, last, spp, grid_.dt_s, threshold);
  // Iron loss over the same period.
  std::vector<const Material*> iron(nt, nullptr);
  for (std::size_t t = 0; t < nt; ++t) {
    const RegionKind kind = mesh_.regions[mesh_.triangle_region[t]].tag.kind;
    if (kind == RegionKind::stator_iron) iron[t] = &materials_.stator_iron;
    if (kind == RegionKind::rotor_iron) iron[t] = &materials_.rotor_iron;
  }
  iron_loss_ = iron_loss(mesh_, iron, b_last, spp, grid_.frequency_hz, case_.machine.stack_length_m,
                         mesh_.symmetry.sectors);
  h5_->write("losses/iron_density", iron_loss_.density_w_per_m3, "W/m^3");
  h5_->attribute("losses/iron_density", "stator_iron_w", iron_loss_.stator_w);
  h5_->attribute("losses/iron_density", "rotor_iron_w", iron_loss_.rotor_w);
  std::vector<double> zone(map.zone.begin(), map.zone.end());
  h5_->write("saturation/peak_B", map.peak_tesla, "T");
  h5_->write("saturation/time_over", map.time_over_s, "s");
  h5_->write("saturation/threshold", threshold, "T");
  h5_->write("saturation/zone", map.zone, "1");
  std::vector<std::string> names, phases;
  std::vector<double> peak, median, p95, fraction, angle;
  std::vector<int> tooth;
  for (const SaturationZone& z : map.zones) {
    names.push_back(z.name);
    phases.push_back(z.nearest_phase);
    peak.push_back(z.peak_tesla);
    median.push_back(z.median_tesla);
    p95.push_back(z.p95_tesla);
    fraction.push_back(z.area_fraction_over);
    angle.push_back(z.angle_deg);
    tooth.push_back(z.tooth);
  }
  h5_->write_strings("saturation/zones/name", names);
  h5_->write_strings("saturation/zones/nearest_phase", phases);
  h5_->write("saturation/zones/peak_B", peak, "T");
  h5_->write("saturation/zones/median_B", median, "T");
  h5_->write("saturation/zones/p95_B", p95, "T");
  h5_->write("saturation/zones/area_fraction_over", fraction, "1");
  h5_->write("saturation/zones/angle", angle, "deg");
  h5_->write("saturation/zones/tooth", tooth, "1");
  h5_->attribute("saturation", "period_start_s", grid_.time(done - spp));
  write_mesh_vtu((fs::path(out_dir_) / "saturation.vtu").string(), mesh_, nullptr,
                 {{"peak_B", map.peak_tesla},
                  {"time_over_threshold_s", map.time_over_s},
                  {"threshold_T", threshold},
                  {"zone", zone},
                  {"iron_loss_w_per_m3", iron_loss_.density_w_per_m3}});
  return map;
}

void TransientStudy::read_settle_rows(int done, RunRecord& r) const {
  r.frequency_hz = grid_.frequency_hz;
  r.steps_per_period = grid_.steps_per_period;
  if (done == 0) return;
  r.time_s = h5_->read("steps/time");
  const std::vector<double> psi = h5_->read("steps/flux_linkage");
  for (int n = 0; n < done; ++n)
    for (int k = 0; k < 3; ++k) r.flux_linkage_wb[k].push_back(psi[n * 3 + k]);
  r.torque_nm = h5_->read("steps/torque");
  if (h5_->exists("steps/cage_wave")) {
    const std::vector<double> w = h5_->read("steps/cage_wave");
    for (int n = 0; n < done && 2 * n + 1 < static_cast<int>(w.size()); ++n)
      r.cage_wave_a.emplace_back(w[2 * n], w[2 * n + 1]);
  }
}

RunRecord TransientStudy::settle_record(int done) const {
  RunRecord r;
  read_settle_rows(done, r);
  return r;
}

RunRecord TransientStudy::read_record(int done) const {
  RunRecord r;
  read_settle_rows(done, r);
  // The last whole periods of the retained steps that finished.
  r.periods = std::max(0, done - grid_.discarded_steps) / grid_.steps_per_period;
  r.first_step = done - r.periods * grid_.steps_per_period;
  if (done == 0) return r;
  const std::vector<double> i = h5_->read("steps/phase_current");
  for (int n = 0; n < done; ++n)
    for (int k = 0; k < 3; ++k) r.current_a[k].push_back(i[n * 3 + k]);
  if (circuit_) {
    r.voltage_fed = true;
    const auto rows = [&](const char* name, std::array<std::vector<double>, 3>& out) {
      const std::vector<double> v = h5_->read(name);
      for (int n = 0; n < done; ++n)
        for (int k = 0; k < 3; ++k) out[k].push_back(v[n * 3 + k]);
    };
    rows("steps/supply_voltage", r.supply_voltage_v);
    rows("steps/line_voltage", r.line_voltage_v);
    rows("steps/line_current", r.line_current_a);
    rows("steps/winding_voltage", r.winding_voltage_v);
  }
  const std::vector<double> b = h5_->read("steps/airgap_B_r");
  const std::vector<double> theta = h5_->read("airgap/theta");
  const std::size_t per_sector = theta.size();
  for (int n = 0; n < done; ++n) {
    const std::vector<double> row(b.begin() + n * per_sector, b.begin() + (n + 1) * per_sector);
    const std::vector<double> full =
        full_circle(row, mesh_.symmetry.sectors, mesh_.symmetry.antiperiodic);
    r.airgap.values.insert(r.airgap.values.end(), full.begin(), full.end());
  }
  r.airgap.samples = static_cast<int>(per_sector) * mesh_.symmetry.sectors;
  r.airgap.steps = done;
  r.airgap.theta0_rad = theta.empty() ? 0.0 : theta[0];
  // σ_r is quadratic in B: the sectors repeat it without sign change.
  const std::vector<double> sigma = h5_->read("steps/radial_force_density");
  for (int n = 0; n < done; ++n) {
    const std::vector<double> row(sigma.begin() + n * per_sector,
                                  sigma.begin() + (n + 1) * per_sector);
    const std::vector<double> full = full_circle(row, mesh_.symmetry.sectors, false);
    r.force.values.insert(r.force.values.end(), full.begin(), full.end());
  }
  r.force.samples = r.airgap.samples;
  r.force.steps = done;
  r.force.theta0_rad = r.airgap.theta0_rad;
  r.orders.pole_pairs = case_.machine.pole_pairs();
  r.orders.stator_slots = case_.stator.slots;
  r.orders.rotor_bars = case_.rotor.kind == RotorKind::cage ? case_.rotor.bars : 0;
  r.orders.integral_slot = case_.stator.slots % (3 * case_.machine.poles) == 0;
  r.orders.rotor_speed_pu = grid_.mechanical_speed_rad_s * r.orders.pole_pairs /
                            (2.0 * std::numbers::pi * grid_.frequency_hz);
  return r;
}

}  // namespace gapflux
