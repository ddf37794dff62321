#pragma once
// Electromagnetic torque on the rotor, counter-clockwise positive.
//  - Arkkio (1987): T = L/(μ0·(r_o − r_i))·∫_band r·B_r·B_θ dS, the Maxwell stress averaged over
//    the band's thickness (design.md §4), times the number of sectors.
//  - Virtual work: T = ∂W'/∂θ_r at constant current, from the co-energy at two rotor angles.
#include <Eigen/Core>

#include "geometry/mesh.hpp"
#include "solver/assembly.hpp"

namespace gapflux {

double arkkio_torque_nm(const Assembler& assembler, const Eigen::VectorXd& x, const Mesh& mesh,
                        double stack_length_m);

// Total co-energy (J, whole machine) of a solved state.
double total_coenergy_j(const Assembler& assembler, const Eigen::VectorXd& x,
                        const RegionModel& model, double stack_length_m, int sectors);

}  // namespace gapflux
