#pragma once
// Currents imposed on the cage bars (not induced): a balanced set at slip frequency forming a
// wave of p pole pairs that turns with the stator's current wave and lies δ electrical behind it
// (clockwise). Bar j (centred at θ'_j = (j + ½)·2π/R in the rotor frame) carries
//   i_j(t) = √2·I_bar·cos(p·(θ'_j + θ_r(t)) − θ_K − ωt + δ),
// with θ_K = (phase a's magnetic axis + 90°) electrical, where a positive-sequence stator current
// sheet peaks at t = 0. In the rotor frame that is slip frequency ω − p·ω_m. With δ between 90°
// and 180° (rotor currents opposing the stator's, as in a loaded induction motor) the torque on
// the rotor is forward (counter-clockwise, motoring).
#include <vector>

#include "cases/case.hpp"
#include "geometry/mesh.hpp"
#include "geometry/winding_layout.hpp"

namespace gapflux {

// Current density (A/m²) per mesh region: bars only.
std::vector<double> bar_current_density(const Mesh& mesh, const Case& c,
                                        const WindingLayout& winding, int bars, double time_s,
                                        double rotor_angle_rad);

}  // namespace gapflux
