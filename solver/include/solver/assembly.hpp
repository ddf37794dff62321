#pragma once
// Global assembly of the magnetostatic system over mesh triangles and band triangles, after the
// constraints of dof_map.hpp. The sparsity pattern (lower triangle, compressed columns, as
// CHOLMOD takes it) and each element's scatter positions are computed once per element set;
// every Newton iteration then only recomputes values.
#include <Eigen/Core>
#include <vector>

#include "geometry/mesh.hpp"
#include "geometry/moving_band.hpp"
#include "solver/dof_map.hpp"
#include "solver/triangle_element.hpp"

namespace gapflux {

struct ElementRecord {
  ElementNodes nodes;                          // positions at the current rotor angle
  std::array<int, max_element_nodes> dof;      // −1: fixed at zero
  std::array<double, max_element_nodes> sign;  // A_local = sign · x[dof]
  int region = 0;                              // index into mesh.regions
};

// Mesh triangles (rotor side turned by the band's rotor angle) followed by the band's triangles.
// Band-owned nodes get DOFs after the mesh's: dofs.n_dofs + k.
std::vector<ElementRecord> build_element_records(const Mesh& mesh, const BandMesh* band,
                                                 const DofMap& dofs);
int total_dofs(const DofMap& dofs, const BandMesh* band);

// Per-region material and source, the solver's view of a case. Solid conductors with induced
// currents (the cage's bars) add the eddy term σ·rate·(A − A_h) in their regions: `eddy_s_per_m`
// holds σ per region (0: none), `eddy_rate` the time scheme's a0/Δt and `eddy_history` A_h at
// every DOF (the difference formula's history over a0), both unset in a magnetostatic solve.
struct RegionModel {
  std::vector<const Material*> material;  // per region
  std::vector<ElementSource> source;      // per region
  std::vector<double> eddy_s_per_m;       // per region; empty: no eddy currents anywhere
  double eddy_rate = 0.0;
  const Eigen::VectorXd* eddy_history = nullptr;
};

class Assembler {
 public:
  Assembler(std::vector<ElementRecord> elements, int n_dofs);

  // Values of the tangent (if asked) and the residual at x, and the load vector's norm.
  // Uses OpenMP threads as set by omp_set_num_threads; the same thread count gives the same
  // sums bit for bit (each thread sums into buffers of its own, added in thread order).
  void assemble(const Eigen::VectorXd& x, const RegionModel& model, bool tangent);

  int n_dofs() const { return n_dofs_; }
  const std::vector<int>& column_starts() const { return col_; }
  const std::vector<int>& row_indices() const { return row_; }
  const std::vector<double>& values() const { return values_; }
  const Eigen::VectorXd& residual() const { return residual_; }
  double load_norm() const { return load_norm_; }
  const std::vector<ElementRecord>& elements() const { return elements_; }
  LocalVector local_values(std::size_t element, const Eigen::VectorXd& x) const;

 private:
  std::vector<ElementRecord> elements_;
  int n_dofs_ = 0;
  std::vector<int> col_, row_;
  std::vector<double> values_;
  std::vector<int> scatter_;  // per element, max_element_nodes² positions in values_ (−1 none)
  Eigen::VectorXd residual_;
  std::vector<double> load_;
  // Per thread beyond the first: its share of the sums (deterministic summation, no atomics).
  std::vector<std::vector<double>> thread_values_, thread_residual_, thread_load_;
  double load_norm_ = 0.0;
};

}  // namespace gapflux
