#pragma once
// Meshes kept between runs. A mesh depends only on the lamination and the mesh settings, so a
// sweep over supplies, a rerun or a second study of one motor need not mesh it again: the mesh is
// stored under a key made from everything the mesher reads (and the program and Gmsh versions),
// and read back bit for bit. Entries are written under a temporary name and renamed, so runs
// sharing a cache at once never see half an entry; each carries a checksum, and a corrupt one is
// detected, reported and rebuilt.
#include <cstdint>
#include <string>

#include "geometry/mesh.hpp"
#include "geometry/mesher.hpp"

namespace gapflux {

// The cache folder: $GAPFLUX_MESH_CACHE ("off" or "" turns the cache off), else
// $XDG_CACHE_HOME/gapflux/meshes, else $HOME/.cache/gapflux/meshes; "" when off or no home.
std::string mesh_cache_dir();

// 16 hex digits naming the mesh of `lam` with `settings`.
std::string mesh_cache_key(const Lamination& lam, const MeshSettings& settings);

struct CachedMesh {
  Mesh mesh;
  bool from_cache = false;
  std::string note;  // what happened, for the run's log ("mesh from the cache …", a rebuilt entry)
};

// The mesh from `cache_dir` when it holds it, else meshed now (and stored there). An empty
// `cache_dir` meshes without a cache. A cache that cannot be written only costs the next run
// its meshing (the note says why).
CachedMesh mesh_lamination_cached(const Lamination& lam, const MeshSettings& settings,
                                  const std::string& cache_dir);

struct CacheContents {
  int entries = 0;
  std::uintmax_t bytes = 0;
};
CacheContents mesh_cache_contents(const std::string& cache_dir);
// Removes every entry (and stale temporary files); returns what was removed.
CacheContents clear_mesh_cache(const std::string& cache_dir);

}  // namespace gapflux
