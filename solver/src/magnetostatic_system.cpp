#include "solver/magnetostatic_system.hpp"

namespace gapflux {

MagnetostaticSystem::MagnetostaticSystem(const Mesh& mesh, double rotor_angle_rad)
    : mesh_(mesh), band_(build_moving_band(mesh, rotor_angle_rad)), dofs_(build_dof_map(mesh)) {
  assembler_ = std::make_unique<Assembler>(build_element_records(mesh_, &band_, dofs_),
                                           total_dofs(dofs_, &band_));
  x_ = Eigen::VectorXd::Zero(assembler_->n_dofs());
}

void MagnetostaticSystem::warm_start(const Eigen::VectorXd& previous, int previous_shift) {
  if (previous.size() != x_.size()) return;
  x_ = previous;
  if (mesh_.order != 2 || previous_shift == band_.shift) return;
  // Corner k of a band element: mid-edge nodes 3, 4, 5 sit on edges 0–1, 1–2, 2–0.
  const int first_extra = dofs_.n_dofs;
  const auto& elements = assembler_->elements();
  const int edge_ends[3][2] = {{0, 1}, {1, 2}, {2, 0}};
  for (std::size_t e = mesh_.n_triangles(); e < elements.size(); ++e) {
    const ElementRecord& r = elements[e];
    for (int m = 0; m < 3; ++m) {
      const int dof = r.dof[3 + m];
      if (dof < first_extra) continue;
      const auto value = [&](int corner) {
        return r.dof[corner] < 0 ? 0.0 : r.sign[corner] * previous[r.dof[corner]];
      };
      x_[dof] = r.sign[3 + m] * 0.5 * (value(edge_ends[m][0]) + value(edge_ends[m][1]));
    }
  }
}

NewtonReport MagnetostaticSystem::solve(const RegionModel& model, const NewtonSettings& settings,
                                        const LowRankTerm* low_rank) {
  return solve_newton(*assembler_, cholesky_, model, settings, x_, low_rank);
}

Eigen::MatrixXd MagnetostaticSystem::solve_tangent(const RegionModel& model,
                                                   const Eigen::MatrixXd& rhs) {
  cholesky_.analyze(assembler_->n_dofs(), assembler_->column_starts(), assembler_->row_indices());
  assembler_->assemble(x_, model, true);
  if (cholesky_.factorize(assembler_->values()).status != FactorStatus::ok)
    throw NumericalError("the linearised field matrix could not be factorised", NewtonReport{});
  Eigen::MatrixXd out(rhs.rows(), rhs.cols());
  for (long k = 0; k < rhs.cols(); ++k) cholesky_.solve(rhs.col(k).data(), out.col(k).data());
  return out;
}

}  // namespace gapflux
