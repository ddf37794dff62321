// TransientStudy, what the cage and the power did over the analysis window (the last whole
// periods of the retained steps): the cage's currents, waves and loss shares, the power balance
// with efficiency and power factors, and with a voltage feed the negative-sequence impedance.
#include <cmath>
#include <numbers>

#include "postproc/airgap_waves.hpp"
#include "transient_study.hpp"

namespace gapflux {

void TransientStudy::cage_and_power_summary(RunSummary& s, int done) const {
  if (!s.analysis || s.analysis->periods < 1) return;
  const int spp = grid_.steps_per_period;
  const int first = done - s.analysis->periods * spp;
  const std::vector<double> time = h5_->read("steps/time");
  const auto rows = [&](const char* name) {
    std::vector<std::vector<double>> out;
    if (!h5_->exists(name)) return out;
    const std::vector<double> v = h5_->read(name);
    const std::size_t width = v.size() / static_cast<std::size_t>(done);
    for (int n = first; n < done; ++n)
      out.emplace_back(v.begin() + n * width, v.begin() + (n + 1) * width);
    return out;
  };
  double cage_w = 0.0;
  if (cage_wanted() && h5_->exists("steps/bar_current")) {
    CageRecord r;
    r.slip = 1.0 - grid_.mechanical_speed_rad_s * case_.machine.pole_pairs() /
                       (2.0 * std::numbers::pi * grid_.frequency_hz);
    r.frequency_hz = grid_.frequency_hz;
    r.pole_pairs = case_.machine.pole_pairs();
    r.bars_total = lamination_.bars;
    r.sectors = mesh_.symmetry.sectors;
    r.conductivity_s_per_m = cage_values_.circuit.conductivity_s_per_m;
    r.stack_length_m = case_.machine.stack_length_m;
    r.ring_segment_resistance_ohm = cage_values_.circuit.ring_segment_resistance_ohm;
    r.time_s.assign(time.begin() + first, time.begin() + done);
    r.bar_current_a = rows("steps/bar_current");
    r.ring_current_a = rows("steps/ring_current");
    r.loss_w = rows("steps/cage_loss");
    r.bar_density = rows("steps/bar_density");
    r.bar_triangle_area_m2 = bar_triangle_areas();
    RunSummary::CageInfo info;
    info.analysis = analyse_cage(r);
    info.temperature_c = cage_values_.temperature_c;
    info.bar_conductivity_s_per_m = cage_values_.circuit.conductivity_s_per_m;
    info.ring_segment_resistance_ohm = cage_values_.circuit.ring_segment_resistance_ohm;
    info.ring_segment_inductance_h = cage_values_.circuit.ring_segment_inductance_h;
    info.ring_resistance_given = cage_values_.resistance_given;
    info.ring_inductance_given = cage_values_.inductance_given;
    info.ring_mean_diameter_m = cage_values_.ring_mean_diameter_m;
    info.ring_area_m2 = cage_values_.ring_area_m2;
    cage_w = info.analysis.loss_w;
    s.cage = info;
  }

  // Branch voltages: a voltage feed records them; a current feed's follow as R·i + dψ/dt
  // (the recorded EMF) + L_end·di/dt.
  PowerRecord p;
  p.frequency_hz = grid_.frequency_hz;
  p.pole_pairs = case_.machine.pole_pairs();
  p.mechanical_speed_rad_s = grid_.mechanical_speed_rad_s;
  const std::vector<double> torque = h5_->read("steps/torque");
  p.torque_nm.assign(torque.begin() + first, torque.begin() + done);
  const std::vector<double> i = h5_->read("steps/phase_current");
  const std::vector<double> v =
      circuit_ ? h5_->read("steps/winding_voltage") : h5_->read("steps/emf");
  for (int n = first; n < done; ++n)
    for (int k = 0; k < 3; ++k) {
      p.branch_current_a[k].push_back(i[n * 3 + k]);
      double volts = v[n * 3 + k];
      if (!circuit_) {
        const double di = n > 0 ? (i[n * 3 + k] - i[(n - 1) * 3 + k]) / grid_.dt_s : 0.0;
        volts += winding_r_.resistance_ohm * i[n * 3 + k] + winding_r_.end_inductance_h * di;
      }
      p.branch_voltage_v[k].push_back(volts);
    }
  {
    const std::vector<double> br = h5_->read("steps/airgap_B_r");
    const std::vector<double> bt = h5_->read("steps/airgap_B_theta");
    const std::size_t width = br.size() / static_cast<std::size_t>(done);
    for (int n = first; n < done; ++n) {
      const std::vector<double> r_row(br.begin() + n * width, br.begin() + (n + 1) * width);
      const std::vector<double> t_row(bt.begin() + n * width, bt.begin() + (n + 1) * width);
      p.airgap_b_r.push_back(
          full_circle(r_row, mesh_.symmetry.sectors, mesh_.symmetry.antiperiodic));
      p.airgap_b_theta.push_back(
          full_circle(t_row, mesh_.symmetry.sectors, mesh_.symmetry.antiperiodic));
    }
  }
  p.copper_w = s.copper_w;
  p.cage_w = cage_w;
  p.iron_w = s.iron_stator_w + s.iron_rotor_w;
  const std::vector<HarmonicPhasors>& voltage =
      circuit_ ? s.analysis->winding_voltage : s.analysis->emf;
  s.power = power_balance(p, voltage, s.analysis->current);

  for (const TorqueHarmonic& t : s.analysis->torque_harmonics)
    if (std::abs(t.order - 2.0) < 1e-6) s.torque_2f_nm = t.amplitude_nm;
  // Only a supply with a measurable voltage unbalance (VUF above 0.01 %) has a negative-sequence
  // impedance worth the name; a balanced bus's V2 and I2 are round-off.
  if (circuit_ && s.analysis->voltage_unbalance.vuf_pct > 0.01) {
    // The negative-sequence impedance the supply meets: phase voltages over phase currents.
    const auto fundamental = [](const std::vector<HarmonicPhasors>& h) -> const HarmonicPhasors* {
      for (const HarmonicPhasors& x : h)
        if (std::abs(x.order - 1.0) < 1e-9) return &x;
      return nullptr;
    };
    const HarmonicPhasors* v1 = fundamental(s.analysis->supply_voltage);
    const HarmonicPhasors* i1 = fundamental(s.analysis->line_current);
    if (v1 && i1 && std::abs(i1->sequences.negative) > 0)
      s.negative_sequence_impedance_ohm = v1->sequences.negative / i1->sequences.negative;
    s.unbalance_amplification =
        s.analysis->line_current_unbalance.vuf_pct / s.analysis->voltage_unbalance.vuf_pct;
  }
}

}  // namespace gapflux
