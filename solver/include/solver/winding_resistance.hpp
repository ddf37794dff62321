#pragma once
// The stator phase resistance from the winding's geometry: R = ρ(T)·N_s·l_turn/(a·A_c), with N_s
// series turns per path, a parallel paths, l_turn = 2·(L_stack + l_end) the mean turn length and
// A_c = fill · coil-side area / turns per coil the conductor's cross-section. DC resistance:
// skin and proximity effects in the stator conductors are not included.
#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "materials/library.hpp"

namespace gapflux {

struct WindingResistance {
  double conductor_area_m2 = 0.0;
  double end_winding_length_m = 0.0;  // one turn's end connection at one end
  bool end_winding_estimated = false;
  double turn_length_m = 0.0;
  double temperature_c = 0.0;
  double resistance_ohm = 0.0;  // per phase
  bool resistance_given = false;
  double end_inductance_h = 0.0;  // end-winding leakage per phase
  bool end_inductance_estimated = false;
};

// A case's phase_resistance_ohm replaces the computed value. Without a case value the end-winding
// leakage inductance is estimated as L_end = (4m/Q)·μ0·N²·(2·l_end)·λ_end with m = 3 phases,
// N series turns per phase, l_end the end connection per end and a permeance factor
// λ_end = 0.3 (the form of Pyrhönen, Jokinen, Hrabovcová, Design of Rotating Electrical
// Machines, ch. 4; factor from memory): a rough figure, to be replaced by the maker's.
// Without a case value the end-winding length per end is estimated as 1.3 × the coil span's arc
// at the slots' mid radius plus 2 × 10 mm of straight overhang (a rough estimate for random-wound
// coils, from memory).
WindingResistance phase_resistance(const Case& c, const Lamination& lamination,
                                   const Material& conductor);

}  // namespace gapflux
