#include "studies/prepared_case.hpp"

#include <fmt/format.h>

#include <numbers>

#include "geometry/mesh_cache.hpp"

#include "materials/library.hpp"
#include "solver/supply_currents.hpp"

namespace gapflux {

PreparedCase prepare_case(const std::string&, Case c) {
  PreparedCase p;
  p.c = std::move(c);
  const RegionMaterials materials = resolve_region_materials(p.c);
  p.lamination = build_lamination(p.c);
  if (p.c.rotor.kind == RotorKind::cage && p.c.rotor.bar_currents == BarCurrents::induced)
    p.cage = cage_values(p.c, p.lamination, materials);
  p.mesh_settings = resolve_mesh_settings(p.c, p.lamination);
  if (p.c.study.kind == StudyKind::time_stepping)
    p.grid = make_time_grid(p.c, 2.0 * std::numbers::pi / p.mesh_settings.band_nodes);
  else
    check_supply_at_instant(p.c, p.c.study.time_s);
  return p;
}

CachedMesh cached_mesh(const Lamination& lam, const MeshSettings& settings) {
  CachedMesh m = mesh_lamination_cached(lam, settings, mesh_cache_dir());
  if (!m.note.empty()) fmt::print(stderr, "{}\n", m.note);
  return m;
}

}  // namespace gapflux
