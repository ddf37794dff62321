#include "solver/dof_map.hpp"

namespace gapflux {

DofMap build_dof_map(const Mesh& mesh) {
  const std::size_t n = mesh.nodes.size();
  constexpr int fixed = -1, free = -2;
  DofMap map;
  map.dof_of_node.assign(n, free);
  map.sign_of_node.assign(n, 1.0);
  for (int node : mesh.outer_nodes) map.dof_of_node[node] = fixed;
  if (mesh.origin_node >= 0 && mesh.symmetry.antiperiodic)
    map.dof_of_node[mesh.origin_node] = fixed;

  // Slaves point at their master; numbered after all masters are known.
  std::vector<int> master_of(n, -1);
  for (const auto& [slave, master] : mesh.periodic_pairs) master_of[slave] = master;

  for (std::size_t i = 0; i < n; ++i)
    if (master_of[i] < 0 && map.dof_of_node[i] == free) map.dof_of_node[i] = map.n_dofs++;
  const double flip = mesh.symmetry.antiperiodic ? -1.0 : 1.0;
  for (std::size_t i = 0; i < n; ++i) {
    if (master_of[i] < 0) continue;
    const int master_dof = map.dof_of_node[master_of[i]];
    map.dof_of_node[i] = master_dof;  // −1 stays fixed
    map.sign_of_node[i] = master_dof < 0 ? 1.0 : flip;
  }
  return map;
}

}  // namespace gapflux
