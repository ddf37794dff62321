#pragma once
// Quantities derived from one solution snapshot: flux density per element, differential
// permeability, energy and co-energy per region, and the airgap samples on the mid-band circle.
#include <Eigen/Core>
#include <vector>

#include "geometry/mesh.hpp"
#include "geometry/moving_band.hpp"
#include "solver/assembly.hpp"

namespace gapflux {

// Per element record of the assembler (mesh triangles, then band triangles), at the centroid.
struct ElementFields {
  std::vector<Vec2> b_tesla;
  std::vector<double> b_abs_tesla;
  std::vector<double> mu_r_differential;  // 1/(μ0·dH/dB) at |B|
};

ElementFields evaluate_element_fields(const Assembler& assembler, const Eigen::VectorXd& x,
                                      const RegionModel& model);

// Energy W = ∫∫0^B H dB dV and co-energy W' = ∫ B·H dV − W per region, for the whole machine
// (per-metre values × stack length × sectors), in joules.
struct RegionEnergy {
  double energy_j = 0.0;
  double coenergy_j = 0.0;
};
std::vector<RegionEnergy> region_energies(const Assembler& assembler, const Eigen::VectorXd& x,
                                          const RegionModel& model, std::size_t n_regions,
                                          double stack_length_m, int sectors);

// B_r and B_θ at n uniformly spaced angles θ_j = (j + ½)·(sector angle)/n on the mid-band circle
// (stator frame), evaluated inside the band triangles.
struct AirgapSamples {
  double radius_m = 0.0;
  std::vector<double> theta_rad, b_r_tesla, b_theta_tesla;
};
AirgapSamples sample_airgap(const Assembler& assembler, const Eigen::VectorXd& x, const Mesh& mesh,
                            int n_samples);

// Default sample count: two per band pitch over the sector.
int default_airgap_samples(const Mesh& mesh);

// A at the mesh nodes (Wb/m), from the DOF vector.
std::vector<double> nodal_potential(const Mesh& mesh, const DofMap& dofs, const Eigen::VectorXd& x);

}  // namespace gapflux
