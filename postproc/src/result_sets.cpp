#include "postproc/result_sets.hpp"

namespace gapflux {

void write_mesh_datasets(ResultsFile& h5, const Mesh& mesh) {
  std::vector<double> nodes;
  for (const Vec2& p : mesh.nodes) nodes.insert(nodes.end(), {p.x(), p.y()});
  h5.write("mesh/nodes", nodes, "m", 2);
  h5.write("mesh/triangles", mesh.triangles, "1", mesh.nodes_per_triangle());
  std::vector<int> region_ids, triangle_region,
      on_rotor(mesh.node_on_rotor.begin(), mesh.node_on_rotor.end());
  std::vector<std::string> names;
  for (const MeshRegion& r : mesh.regions) {
    region_ids.push_back(r.id);
    names.push_back(r.name);
  }
  for (int r : mesh.triangle_region) triangle_region.push_back(mesh.regions[r].id);
  h5.write("mesh/region_ids", region_ids, "1");
  h5.write_strings("mesh/region_names", names);
  h5.write("mesh/triangle_region", triangle_region, "1");
  h5.write("mesh/node_on_rotor", on_rotor, "1");
  h5.attribute("mesh", "order", static_cast<long>(mesh.order));
  h5.attribute("mesh", "sectors", static_cast<long>(mesh.symmetry.sectors));
  h5.attribute("mesh", "antiperiodic", static_cast<long>(mesh.symmetry.antiperiodic));
}

}  // namespace gapflux
