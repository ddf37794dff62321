// Constraints as DOF elimination: Dirichlet outer surface, (anti)periodic sector edges.
#include <catch2/catch.hpp>

#include <set>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "solver/dof_map.hpp"
#include "test_support.hpp"

using namespace gapflux;

TEST_CASE("dof map: outer nodes fixed, sector edges tied with the antiperiodic sign", "[solver]") {
  const Case c = read_case_file(test::example("pump_4p36s.toml"));
  const Lamination lam = build_lamination(c);
  const Mesh mesh = mesh_lamination(lam, resolve_mesh_settings(c, lam));
  const DofMap map = build_dof_map(mesh);
  REQUIRE(mesh.symmetry.antiperiodic);
  for (int n : mesh.outer_nodes) CHECK(map.is_fixed(n));
  for (const auto& [slave, master] : mesh.periodic_pairs) {
    CHECK(map.dof_of_node[slave] == map.dof_of_node[master]);
    if (!map.is_fixed(master)) CHECK(map.sign_of_node[slave] == -1.0);
  }
  // Every free DOF is used by exactly one master node; counts add up.
  std::set<int> slaves;
  for (const auto& pair : mesh.periodic_pairs) slaves.insert(pair.first);
  std::set<int> fixed(mesh.outer_nodes.begin(), mesh.outer_nodes.end());
  if (mesh.origin_node >= 0) fixed.insert(mesh.origin_node);
  std::size_t tied_or_fixed = fixed.size();
  for (int s : slaves) tied_or_fixed += fixed.count(s) ? 0 : 1;
  CHECK(map.n_dofs == static_cast<int>(mesh.nodes.size() - tied_or_fixed));
  std::set<int> dofs;
  for (std::size_t n = 0; n < mesh.nodes.size(); ++n)
    if (!slaves.count(static_cast<int>(n)) && !map.is_fixed(static_cast<int>(n)))
      dofs.insert(map.dof_of_node[n]);
  CHECK(static_cast<int>(dofs.size()) == map.n_dofs);
}
