#pragma once
// The moving band (Davat, Ren, Lajoie-Mazenc 1985): the thin ring between the two band circles,
// re-triangulated for each rotor angle from the uniform nodes of both circles. Each quad between
// stator vertices i, i+1 and the rotor vertices below them is split along its shorter diagonal.
// In a sector model, rotor nodes that have turned past a sector edge are referred to their image
// inside the sector with the (anti)periodic sign.
#include <array>
#include <vector>

#include "geometry/mesh.hpp"

namespace gapflux {

struct BandNodeRef {
  int node = -1;      // mesh node, or mesh.nodes.size() + k for the band's own mid-edge node k
  double sign = 1.0;  // A at this corner = sign · A[node]
  Vec2 position_m = Vec2::Zero();  // where the corner is at this rotor angle (stator frame)
};

struct BandElement {
  std::array<BandNodeRef, 6> corners;  // counter-clockwise; order 2 adds mid-edge nodes
};

struct BandMesh {
  double rotor_angle_rad = 0.0;
  int shift = 0;  // whole band pitches the rotor ring is turned by (the triangulation's topology)
  int n_extra_nodes = 0;  // order 2: mid-edge nodes of the cross edges, owned by the band
  std::vector<BandElement> elements;
};

BandMesh build_moving_band(const Mesh& mesh, double rotor_angle_rad);

}  // namespace gapflux
