#pragma once
// Degrees of freedom after the constraints, applied in this one step: A = 0 on the stator's outer
// surface; on a sector model each node of the θ = sector-angle edge is its image on θ = 0 with
// the (anti)periodic sign; an antiperiodic sector's centre node is zero (A = −A there).
#include <vector>

#include "geometry/mesh.hpp"

namespace gapflux {

struct DofMap {
  std::vector<int> dof_of_node;      // −1: fixed at zero
  std::vector<double> sign_of_node;  // A[node] = sign · x[dof]
  int n_dofs = 0;

  bool is_fixed(int node) const { return dof_of_node[node] < 0; }
};

DofMap build_dof_map(const Mesh& mesh);

}  // namespace gapflux
