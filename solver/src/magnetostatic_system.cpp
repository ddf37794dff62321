#include "solver/magnetostatic_system.hpp"

namespace gapflux {

MagnetostaticSystem::MagnetostaticSystem(const Mesh& mesh, double rotor_angle_rad)
    : mesh_(mesh), band_(build_moving_band(mesh, rotor_angle_rad)), dofs_(build_dof_map(mesh)) {
  assembler_ = std::make_unique<Assembler>(build_element_records(mesh_, &band_, dofs_),
                                           total_dofs(dofs_, &band_));
  x_ = Eigen::VectorXd::Zero(assembler_->n_dofs());
}

NewtonReport MagnetostaticSystem::solve(const RegionModel& model, const NewtonSettings& settings) {
  return solve_newton(*assembler_, cholesky_, model, settings, x_);
}

}  // namespace gapflux
