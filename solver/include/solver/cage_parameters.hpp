#pragma once
// The cage's circuit values from the case: the bars' conductivity at the cage temperature and
// each end-ring segment's resistance and leakage inductance.
//   Ring: mean diameter D (default: through the middle of the bars), radial height h (default:
//   the bars' radial height) and axial width w (default: the cross-section A = A_bar/(2·sin(πp/R))
//   that carries the ring current of a balanced bar set at the bars' own current density — the
//   segment current is i_bar/(2·sin(πp/R)), classical cage theory; common practice, no source).
//   R_seg = l_seg/(σ_ring·A), l_seg = π·D/R the segment's length along the ring.
//   L_seg = μ0·λ·l_seg with the permeance factor λ = 0.3 the end-winding estimate uses (the form
//   of Pyrhönen, Jokinen, Hrabovcová, Design of Rotating Electrical Machines, ch. 4; factor from
//   memory): a rough figure, to be replaced by the maker's or a 3-D value. The bars' overhang
//   beyond the core is not modelled separately (fold it into the segment values if known).
#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "materials/library.hpp"
#include "solver/cage_circuit.hpp"

namespace gapflux {

struct CageValues {
  CageParameters circuit;
  double ring_mean_diameter_m = 0.0, ring_radial_height_m = 0.0, ring_axial_width_m = 0.0;
  double ring_area_m2 = 0.0;
  bool resistance_given = false, inductance_given = false;
  double temperature_c = 0.0;
  double ring_conductivity_s_per_m = 0.0;
  double bar_dc_resistance_ohm = 0.0;  // one bar, ℓ/(σ·S_bar)
};

// Throws InputError naming the rotor.ring key when the ring cannot be (a cross-section smaller
// than a bar's, a ring that does not reach over the bar ends).
CageValues cage_values(const Case& c, const Lamination& lamination,
                       const RegionMaterials& materials);

}  // namespace gapflux
