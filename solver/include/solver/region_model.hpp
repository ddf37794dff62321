#pragma once
// The machine's regions as the solver sees them: a material per region kind, and a constant
// current density per region (coil sides from the winding; zero elsewhere).
#include <vector>

#include "geometry/mesh.hpp"
#include "materials/library.hpp"
#include "solver/assembly.hpp"

namespace gapflux {

const Material& material_of(RegionKind kind, const RegionMaterials& materials);

// `materials` must outlive the model (it holds pointers into it).
RegionModel make_region_model(const Mesh& mesh, const RegionMaterials& materials,
                              const std::vector<double>& current_density_a_per_m2);

}  // namespace gapflux
