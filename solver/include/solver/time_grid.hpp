#pragma once
// The time steps of a study and the rotor's motion: mechanical speed (1 − s)·2πf/p for slip s,
// a given speed, or locked; rotor angle θ_r(t) = θ_r0 + ω_m·(t − t0). With band-aligned steps the
// step count per period is chosen so the rotor advances a whole number of band pitches per step
// (exact node coincidence in the band).
#include <string>

#include "cases/case.hpp"

namespace gapflux {

struct TimeGrid {
  double frequency_hz = 0.0;
  double start_s = 0.0;
  double dt_s = 0.0;
  int steps_per_period = 0;
  int steps = 0;            // in all
  int discarded_steps = 0;  // start-up steps left out of statistics and spectra
  double mechanical_speed_rad_s = 0.0;
  double rotor_angle0_rad = 0.0;
  int band_pitches_per_step = -1;  // −1 when the steps are not band-aligned

  double time(int step) const { return start_s + step * dt_s; }
  double rotor_angle(int step) const {
    return rotor_angle0_rad + mechanical_speed_rad_s * step * dt_s;
  }
  int retained_steps() const { return steps - discarded_steps; }
  // Spectra use the last whole electrical periods of the retained steps.
  int analysis_periods() const { return retained_steps() / steps_per_period; }
};

// Empty when the slot passing is resolved, else a warning: with fewer than 6 steps per stator or
// rotor slot pitch of rotor travel, slot-passing torque ripple and the slot-harmonic waves
// alias in time (Nyquist is 2; 6 keeps their amplitudes within a few per cent). Also says the
// step count that would resolve them.
std::string slot_passing_warning(const TimeGrid& grid, int stator_slots, int rotor_bars);

// `band_pitch_rad`: angle between neighbouring band nodes. Throws InputError
// (study.band_aligned_steps) when no step count can align the rotor at the case's speed.
TimeGrid make_time_grid(const Case& c, double band_pitch_rad);

}  // namespace gapflux
