#pragma once
// Lamination → mesh, through Gmsh (the only file that sees Gmsh is gmsh_mesher.cpp).
#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh.hpp"
#include "geometry/mesh_forecast.hpp"

namespace gapflux {

struct MeshSettings {
  int order = 2;
  double airgap_size_m = 0.0;       // element size in the airgap
  double iron_size_m = 0.0;         // largest element size
  double growth_rate = 0.2;         // size increase per unit distance from the band
  int band_nodes = 0;               // nodes on each band circle over the full circle
  double elements_per_turn = 16.0;  // on small arcs (slot bottoms, bar ends)
  MeshForecast forecast;            // thin features against the sizes; triangles expected
};

// Resolves the case's mesh table against the lamination (defaults documented in
// docs/case-file.md); a band node count that the sector cannot carry, a feature below the
// thinnest a lamination carries or a mesh far too large is an InputError (mesh_forecast.hpp).
MeshSettings resolve_mesh_settings(const Case& c, const Lamination& lam);

Mesh mesh_lamination(const Lamination& lam, const MeshSettings& settings);

}  // namespace gapflux
