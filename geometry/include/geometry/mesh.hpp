#pragma once
// The finite-element mesh of one symmetry sector: Lagrange triangles of order 1 (3 nodes) or 2
// (6 nodes: vertices, then mid-edge nodes of edges 0–1, 1–2, 2–0, as Gmsh and VTK order them),
// counter-clockwise, node coordinates in metres. Stator-side nodes are in the stator frame,
// rotor-side nodes in the rotor frame at rotor angle 0. The moving band is not part of the
// triangles: it is rebuilt from the two rings for every rotor position (moving_band.hpp).
#include <array>
#include <string>
#include <vector>

#include "geometry/lamination.hpp"

namespace gapflux {

struct MeshRegion {
  int id = 0;  // 1-based, as written to files
  std::string name;
  RegionTag tag;
  double exact_area_m2 = 0.0;  // of the CAD geometry, for the sector
};

// Uniformly spaced nodes on one band circle, ordered by angle from θ = 0.
// Sector model: n + 1 vertices, the last the periodic image of the first; full model: n.
struct BandRing {
  double radius_m = 0.0;
  double pitch_rad = 0.0;  // angle between neighbouring vertices
  std::vector<int> vertices;
  std::vector<int> midpoints;  // order 2: node midway between vertices i and i + 1
};

struct Mesh {
  int order = 1;
  std::vector<Vec2> nodes;
  std::vector<int> triangles;        // nodes_per_triangle() entries per triangle
  std::vector<int> triangle_region;  // index into regions
  std::vector<int> tooth_index;      // stator iron: nearest tooth (0-based); −1 elsewhere
  std::vector<MeshRegion> regions;
  std::vector<char> node_on_rotor;
  std::vector<int> outer_nodes;  // on the stator's outer surface (A = 0)
  // Sector models: (node on θ = sector angle, its image on θ = 0); A_first = ±A_second.
  std::vector<std::pair<int, int>> periodic_pairs;
  int origin_node = -1;  // a node at the centre on both sector edges, if any
  BandRing stator_ring;  // outer band circle, stator side
  BandRing rotor_ring;   // inner band circle, rotor side
  SectorSymmetry symmetry;

  int nodes_per_triangle() const { return order == 1 ? 3 : 6; }
  std::size_t n_triangles() const { return triangle_region.size(); }
  std::array<int, 6> triangle(std::size_t t) const;
  int region_index(const std::string& name) const;  // −1 when absent
};

// Area of triangle t with its (curved, for order 2) geometry, exact by quadrature.
double triangle_area(const Mesh& mesh, std::size_t t);

struct MeshQuality {
  std::size_t vertices = 0;  // corner nodes
  std::size_t nodes = 0;
  std::size_t triangles = 0;
  double min_angle_deg = 0.0;     // over the straight-sided vertex triangles
  double max_aspect_ratio = 0.0;  // circumradius / (2 · inradius); 1 for equilateral
  double total_area_m2 = 0.0;
  std::vector<std::size_t> triangles_per_region;
  std::vector<double> area_per_region_m2;
};

MeshQuality mesh_quality(const Mesh& mesh);

}  // namespace gapflux
