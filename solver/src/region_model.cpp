#include "solver/region_model.hpp"

namespace gapflux {

const Material& material_of(RegionKind kind, const RegionMaterials& m) {
  switch (kind) {
    case RegionKind::stator_iron:
      return m.stator_iron;
    case RegionKind::rotor_iron:
      return m.rotor_iron;
    case RegionKind::coil_side:
      return m.coils;
    case RegionKind::bar:
      return m.bars;
    case RegionKind::shaft:
      return m.shaft;
    default:
      return m.air;  // slot openings, airgap layers, band, bar openings
  }
}

RegionModel make_region_model(const Mesh& mesh, const RegionMaterials& materials,
                              const std::vector<double>& current_density_a_per_m2) {
  RegionModel model;
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) {
    model.material.push_back(&material_of(mesh.regions[r].tag.kind, materials));
    ElementSource s;
    s.constant_a_per_m2 = r < current_density_a_per_m2.size() ? current_density_a_per_m2[r] : 0.0;
    model.source.push_back(s);
  }
  return model;
}

}  // namespace gapflux
