#pragma once
// What `gapflux check` does to a case text before any meshing, shared by the fuzz target and the
// regression test that replays every input the fuzzer ever crashed on: read and validate the
// case, resolve the materials, build the lamination (every feasibility check) and an induced
// cage's circuit values, resolve the mesh
// settings (thin features, the mesh forecast) and, for a time-stepping study, the time grid and
// the supply checks that need it. Bad input may only end in an InputError.
#include <numbers>
#include <string_view>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "materials/library.hpp"
#include "solver/cage_parameters.hpp"
#include "solver/supply_currents.hpp"
#include "solver/time_grid.hpp"

namespace gapflux::fuzz {

// Returns true when the case is valid; throws only InputError (a bug otherwise).
inline bool validate_case_text(std::string_view text) {
  try {
    Case c = read_case_text(text, "fuzz.toml");
    const RegionMaterials materials = resolve_region_materials(c);
    const Lamination lamination = build_lamination(c);
    if (c.rotor.kind == RotorKind::cage && c.rotor.bar_currents == BarCurrents::induced)
      cage_values(c, lamination, materials);
    const MeshSettings mesh = resolve_mesh_settings(c, lamination);
    if (c.study.kind == StudyKind::time_stepping)
      make_time_grid(c, 2.0 * std::numbers::pi / mesh.band_nodes);
    else
      check_supply_at_instant(c, c.study.time_s);
    return true;
  } catch (const InputError&) {
    return false;
  }
}

}  // namespace gapflux::fuzz
