#pragma once
// VTK XML unstructured-grid output (the only file that sees VTK is vtu_writer.cpp).
#include <string>
#include <utility>
#include <vector>

#include "geometry/mesh.hpp"
#include "geometry/moving_band.hpp"
#include "solver/assembly.hpp"

namespace gapflux {

// Writes the mesh (and, if given, the band triangulation at its rotor angle) as linear or
// quadratic triangles. Cell data: region_id, tooth_index (−1 off the stator iron), side
// (0 stator, 1 rotor, 2 band). Field data: region_ids (int32) and region_names (the names as
// NUL-terminated UTF-8 bytes, in region_ids order): the id → name map.
// Rotor-side nodes are drawn turned by the band's rotor angle. Throws std::runtime_error on I/O
// failure.
// `cell_fields`: extra per-triangle arrays (mesh triangles only; band cells get 0).
void write_mesh_vtu(
    const std::string& path, const Mesh& mesh, const BandMesh* band,
    const std::vector<std::pair<std::string, std::vector<double>>>& cell_fields = {});

}  // namespace gapflux

namespace gapflux {

// One field snapshot as drawn: per element its nodes' drawn positions, A at every node as point
// data "A" (Wb/m), and per cell "Bx", "By", "B_abs" (T), "mu_r" (differential relative
// permeability), "region_id", "side" (0 stator, 1 rotor, 2 band) and, with an induced cage, "J"
// (A/m², the bars' current density; 0 elsewhere). Built by make_field_snapshot
// (field_snapshot.hpp).
struct FieldSnapshot {
  int order = 2;
  std::vector<ElementNodes> nodes;
  std::vector<LocalVector> corner_values;  // A at each element's nodes
  std::vector<Vec2> b_tesla;
  std::vector<double> b_abs_tesla, mu_r;
  std::vector<int> region_id, side;
  std::vector<double>
      current_density;  // "J" (A/m², along +z), when the bars carry induced currents
};
void write_fields_vtu(const std::string& path, const FieldSnapshot& snapshot);

// A ParaView-style collection file listing (time, file) pairs; files relative to the .pvd.
void write_pvd(const std::string& path, const std::vector<std::pair<double, std::string>>& files);

}  // namespace gapflux
