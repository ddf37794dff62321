#pragma once
// Windings as field sources and as flux linkages (design.md §3). Coil side s of phase k with
// N_s conductors over area S_s carries J = ±N_s·i_k/(a·S_s); the phase flux linkage is
// ψ_k = L_stack·n_sectors·Σ_s ±(N_s/(a·S_s))·∫_{S_s} A dS (a sector model holds 1/n of the
// winding, and its images carry the same product of sign and field).
#include <array>
#include <vector>

#include "geometry/mesh.hpp"
#include "geometry/winding_layout.hpp"
#include "solver/assembly.hpp"

namespace gapflux {

// For each mesh region: the phase it belongs to (−1: none) and its turns density ±N_s/(a·S_s)
// in 1/m², with S_s the region's meshed area.
struct CoilRegions {
  std::vector<int> phase;
  std::vector<double> turns_density_per_m2;
};

CoilRegions coil_regions(const Mesh& mesh, const WindingLayout& layout);

// Instantaneous phase currents (A) → current density per region (A/m²).
std::vector<double> region_current_density(const CoilRegions& coils,
                                           const std::array<double, 3>& phase_current_a);

// Flux linkage per phase (Wb) from the solution x.
std::array<double, 3> phase_flux_linkage(const Assembler& assembler, const Eigen::VectorXd& x,
                                         const CoilRegions& coils, double stack_length_m,
                                         int sectors);

// ∫ A dS over element e with local values a.
double integral_of_a(const ElementNodes& e, const LocalVector& a);

}  // namespace gapflux
