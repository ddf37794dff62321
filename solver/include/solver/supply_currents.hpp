#pragma once
// The phase currents a current-fed supply imposes: the sum of its components
// i_k(t) = √2·Σ_h I_h,k·cos(h·ω·t + φ_h,k), or the measured table interpolated linearly.
#include <array>

#include "cases/case.hpp"
#include "solver/time_grid.hpp"

namespace gapflux {

// The described three-phase set at t, in its own unit and basis (A for a current feed; V, phase
// or line-to-line as given, for a voltage feed).
std::array<double, 3> supply_values(const SupplySpec& supply, double t_s);
inline std::array<double, 3> supply_phase_currents_a(const SupplySpec& supply, double t_s) {
  return supply_values(supply, t_s);
}

// Checks that need the time steps (throw InputError at the offending key): every harmonic below
// half the steps per period (else it aliases) and completing whole periods in the analysis
// window (else its spectrum leaks); a waveform table that covers every step.
void check_supply_on_grid(const Case& c, const TimeGrid& grid);
void check_supply_at_instant(const Case& c, double t_s);  // a static study's instant

}  // namespace gapflux
