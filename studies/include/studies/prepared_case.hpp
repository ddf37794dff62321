#pragma once
// Everything a case needs before meshing, fully checked: what `check` prints and what a sweep
// asks of each of its cases before any of them runs.
#include <optional>
#include <string>

#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh.hpp"
#include "geometry/mesh_cache.hpp"
#include "geometry/mesher.hpp"
#include "solver/cage_parameters.hpp"
#include "solver/time_grid.hpp"

namespace gapflux {

struct PreparedCase {
  Case c;
  Lamination lamination;
  MeshSettings mesh_settings;
  TimeGrid grid;                   // time stepping only
  std::optional<CageValues> cage;  // an induced cage's circuit values
};

// `c` as read from `case_path`; throws InputError naming the file, line and key.
PreparedCase prepare_case(const std::string& case_path, Case c);

// The lamination's mesh, from the mesh cache (geometry/mesh_cache.hpp) when it holds it; says on
// stderr where it came from.
CachedMesh cached_mesh(const Lamination& lam, const MeshSettings& settings);

}  // namespace gapflux
