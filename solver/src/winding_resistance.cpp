#include "solver/winding_resistance.hpp"

#include <numbers>

namespace gapflux {

WindingResistance phase_resistance(const Case& c, const Lamination& lam, const Material& copper) {
  WindingResistance r;
  const WindingLayout& w = lam.winding;
  const double side_area = lam.slot.coil_side_area_m2[0];
  r.conductor_area_m2 = c.winding.fill_factor * side_area / w.turns_per_coil;
  if (c.winding.end_winding_length_m > 0) {
    r.end_winding_length_m = c.winding.end_winding_length_m;
  } else {
    const double mid_radius =
        0.5 * (lam.bore_radius_m + lam.stator_outer_radius_m - lam.slot.yoke_height_m);
    const double span = 2.0 * std::numbers::pi * mid_radius * w.coil_pitch_slots / w.slots;
    r.end_winding_length_m = 1.3 * span + 2.0 * 0.010;
    r.end_winding_estimated = true;
  }
  r.turn_length_m = 2.0 * (c.machine.stack_length_m + r.end_winding_length_m);
  r.temperature_c = c.winding.conductor_temperature_c;
  const double sigma = copper.conductivity_at(r.temperature_c);
  r.resistance_ohm =
      w.series_turns_per_phase * r.turn_length_m / (w.parallel_paths * sigma * r.conductor_area_m2);
  if (c.winding.phase_resistance_ohm > 0) {
    r.resistance_ohm = c.winding.phase_resistance_ohm;
    r.resistance_given = true;
  }
  if (c.winding.end_winding_inductance_h >= 0) {
    r.end_inductance_h = c.winding.end_winding_inductance_h;
  } else {
    constexpr double mu0 = 4e-7 * std::numbers::pi, permeance_factor = 0.3;
    const double n = w.series_turns_per_phase;
    r.end_inductance_h =
        4.0 * 3.0 / w.slots * mu0 * n * n * 2.0 * r.end_winding_length_m * permeance_factor;
    r.end_inductance_estimated = true;
  }
  return r;
}

}  // namespace gapflux
