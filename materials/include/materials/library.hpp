#pragma once
// The built-in material names and what each stands for. Curves, conductivities and loss figures
// arrive with the solver; for now the library answers which names exist, so that a case naming
// an unknown material is rejected before any meshing.
#include <string>
#include <vector>

#include "cases/case.hpp"

namespace gapflux {

enum class MaterialClass { air, conductor, electrical_steel, structural_steel };

struct MaterialEntry {
  std::string name;
  MaterialClass kind;
  std::string note;
};

const std::vector<MaterialEntry>& builtin_materials();
const MaterialEntry* find_material(const std::string& name);

// Each region's material must exist and suit the region (iron regions take a steel, coils and
// bars a conductor). Throws InputError naming the [materials] key.
void check_region_materials(const Case& c);

}  // namespace gapflux
