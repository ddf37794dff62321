#pragma once
// One magnetostatic system at one rotor position: the band triangulated at that angle, the
// constraints, the element set, the assembler and the factorisation it reuses, and the solution
// vector (kept between solves for warm starts). Mesh and model are the caller's.
#include <Eigen/Core>
#include <memory>

#include "geometry/mesh.hpp"
#include "geometry/moving_band.hpp"
#include "solver/assembly.hpp"
#include "solver/dof_map.hpp"
#include "solver/newton.hpp"
#include "solver/sparse_cholesky.hpp"

namespace gapflux {

class MagnetostaticSystem {
 public:
  MagnetostaticSystem(const Mesh& mesh, double rotor_angle_rad);
  // Warm start from a solution of another rotor position: the mesh DOFs carry over (nodes move
  // with their side); when the band's topology changed (another whole-pitch shift), its own
  // mid-edge DOFs belong to other edges and are set to the mean of their edge's ends.
  void warm_start(const Eigen::VectorXd& previous, int previous_shift);
  // Throws NumericalError; x() keeps the last iterate either way.
  NewtonReport solve(const RegionModel& model, const NewtonSettings& settings,
                     const LowRankTerm* low_rank = nullptr);
  // The tangent at x() solved for each column of `rhs` (one factorisation): the linearised
  // field's response, e.g. the unsaturated inductances at x() = 0. Throws NumericalError.
  Eigen::MatrixXd solve_tangent(const RegionModel& model, const Eigen::MatrixXd& rhs);
  // The factor's memory back (a later solve analyses and factorises afresh).
  void release_factor() { cholesky_.release(); }
  // A system solved at one rotor position only: nested dissection (SparseCholesky::Ordering).
  void set_ordering(Ordering o) { cholesky_.set_ordering(o); }
  std::size_t factor_nonzeros() const { return cholesky_.factor_nonzeros(); }

  const Mesh& mesh() const { return mesh_; }
  const BandMesh& band() const { return band_; }
  const DofMap& dofs() const { return dofs_; }
  const Assembler& assembler() const { return *assembler_; }
  Assembler& assembler() { return *assembler_; }
  const Eigen::VectorXd& x() const { return x_; }
  Eigen::VectorXd& x() { return x_; }

 private:
  const Mesh& mesh_;
  BandMesh band_;
  DofMap dofs_;
  std::unique_ptr<Assembler> assembler_;
  SparseCholesky cholesky_;
  Eigen::VectorXd x_;
};

}  // namespace gapflux
