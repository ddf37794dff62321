#pragma once
// Groups of results.h5 shared by the studies (layout: docs/results.md).
#include "geometry/mesh.hpp"
#include "postproc/results_file.hpp"

namespace gapflux {

// mesh/{nodes, triangles, region_ids, region_names, triangle_region, node_on_rotor} and the
// mesh group's attributes (order, sectors, antiperiodic).
void write_mesh_datasets(ResultsFile& file, const Mesh& mesh);

}  // namespace gapflux
