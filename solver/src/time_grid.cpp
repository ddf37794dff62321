#include "solver/time_grid.hpp"

#include "solver/supply_currents.hpp"

#include <fmt/format.h>

#include <cmath>
#include <numbers>

namespace gapflux {

TimeGrid make_time_grid(const Case& c, double band_pitch_rad) {
  const StudySpec& s = c.study;
  TimeGrid g;
  g.frequency_hz = c.supply.frequency_hz;
  g.start_s = s.time_s;
  g.rotor_angle0_rad = s.rotor_angle_rad;
  const double omega = 2.0 * std::numbers::pi * g.frequency_hz;
  const int p = c.machine.pole_pairs();
  switch (s.motion) {
    case Motion::slip:
      g.mechanical_speed_rad_s = (1.0 - s.slip) * omega / p;
      break;
    case Motion::speed:
      g.mechanical_speed_rad_s = s.speed_rpm * 2.0 * std::numbers::pi / 60.0;
      break;
    case Motion::locked:
      g.mechanical_speed_rad_s = 0.0;
      break;
  }
  int n = s.steps_per_period;
  if (s.band_aligned_steps && g.mechanical_speed_rad_s != 0.0) {
    // Band pitches the rotor passes in one electrical period; the step count must divide it.
    const double pitches = std::abs(g.mechanical_speed_rad_s) / g.frequency_hz / band_pitch_rad;
    const long m = std::lround(pitches);
    if (m < 1 || std::abs(pitches - m) > 1e-6 * pitches)
      throw c.sources.error(
          "study.band_aligned_steps",
          fmt::format(
              "the rotor passes {:.6f} band pitches per electrical period at this speed, not "
              "a whole number, so no step count moves it by whole pitches; set "
              "band_aligned_steps = false, or a slip/speed that makes it whole",
              pitches));
    long best = 1;
    for (long d = 1; d <= m; ++d)
      if (m % d == 0 && std::abs(d - n) < std::abs(best - n)) best = d;
    n = static_cast<int>(best);
    g.band_pitches_per_step = static_cast<int>(m / best);
  }
  g.steps_per_period = n;
  g.dt_s = 1.0 / (g.frequency_hz * n);
  g.steps = std::max(1, static_cast<int>(std::lround(s.periods * n)));
  g.discarded_steps = static_cast<int>(std::lround(s.discard_periods * n));
  check_supply_on_grid(c, g);
  return g;
}

std::string slot_passing_warning(const TimeGrid& g, int stator_slots, int rotor_bars) {
  const double travel_rad = std::abs(g.mechanical_speed_rad_s) * g.dt_s;  // per step
  const int slots = std::max(stator_slots, rotor_bars);
  if (travel_rad == 0.0 || slots == 0) return "";
  const double steps_per_pitch = 2.0 * std::numbers::pi / slots / travel_rad;
  if (steps_per_pitch >= 6.0) return "";
  const double per_period_rad = std::abs(g.mechanical_speed_rad_s) / g.frequency_hz;
  const int needed =
      static_cast<int>(std::ceil(6.0 * per_period_rad / (2.0 * std::numbers::pi / slots)));
  return fmt::format(
      "the rotor turns {:.2f}° per step, {:.1f} steps per slot pitch ({} slots or bars): "
      "slot-passing torque ripple and slot-harmonic waves are under-sampled and alias in time; "
      "steps_per_period = {} or more resolves them",
      travel_rad * 180.0 / std::numbers::pi, steps_per_pitch, slots, needed);
}

}  // namespace gapflux
