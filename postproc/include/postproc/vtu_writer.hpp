#pragma once
// VTK XML unstructured-grid output (the only file that sees VTK is vtu_writer.cpp).
#include <string>

#include "geometry/mesh.hpp"
#include "geometry/moving_band.hpp"

namespace gapflux {

// Writes the mesh (and, if given, the band triangulation at its rotor angle) as linear or
// quadratic triangles. Cell data: region_id, tooth_index (−1 off the stator iron), side
// (0 stator, 1 rotor, 2 band). Field data: region_ids (int32) and region_names (the names as
// NUL-terminated UTF-8 bytes, in region_ids order): the id → name map.
// Rotor-side nodes are drawn turned by the band's rotor angle. Throws std::runtime_error on I/O
// failure.
void write_mesh_vtu(const std::string& path, const Mesh& mesh, const BandMesh* band);

}  // namespace gapflux
