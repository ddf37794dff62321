#include "materials/library.hpp"

#include <fmt/format.h>

#include <algorithm>

namespace gapflux {

const std::vector<MaterialEntry>& builtin_materials() {
  static const std::vector<MaterialEntry> entries = {
      {"air", MaterialClass::air, "vacuum permeability, non-conducting"},
      {"copper", MaterialClass::conductor, "annealed copper winding wire"},
      {"aluminium", MaterialClass::conductor, "die-cast cage aluminium"},
      {"M270-35A", MaterialClass::electrical_steel,
       "non-oriented electrical steel, 0.35 mm; typical curve for the grade class, from memory"},
      {"M400-50A", MaterialClass::electrical_steel,
       "non-oriented electrical steel, 0.50 mm; typical curve for the grade class, from memory"},
      {"M800-65A", MaterialClass::electrical_steel,
       "non-oriented electrical steel, 0.65 mm; typical curve for the grade class, from memory"},
      {"shaft_steel", MaterialClass::structural_steel,
       "plain carbon shaft steel; typical curve, from memory"},
  };
  return entries;
}

const MaterialEntry* find_material(const std::string& name) {
  for (const auto& m : builtin_materials())
    if (m.name == name) return &m;
  return nullptr;
}

namespace {

std::string names_of(bool (*accept)(MaterialClass)) {
  std::vector<std::string> names;
  for (const auto& m : builtin_materials())
    if (accept(m.kind)) names.push_back(m.name);
  return fmt::format("{}", fmt::join(names, ", "));
}

void check_one(const Case& c, const std::string& key, const std::string& name,
               bool (*accept)(MaterialClass), const char* what) {
  const MaterialEntry* m = find_material(name);
  if (!m)
    throw c.sources.error("materials." + key,
                          fmt::format("unknown material \"{}\"; the built-in ones for {} are: {}",
                                      name, what, names_of(accept)));
  if (!accept(m->kind))
    throw c.sources.error("materials." + key,
                          fmt::format("\"{}\" cannot be used for {}; choose one of: {}", name, what,
                                      names_of(accept)));
}

bool is_steel(MaterialClass k) {
  return k == MaterialClass::electrical_steel || k == MaterialClass::structural_steel;
}
bool is_conductor(MaterialClass k) {
  return k == MaterialClass::conductor;
}
bool is_shaft(MaterialClass k) {
  return k == MaterialClass::air || is_steel(k);
}

}  // namespace

void check_region_materials(const Case& c) {
  check_one(c, "stator_iron", c.materials.stator_iron, is_steel, "iron regions");
  check_one(c, "rotor_iron", c.materials.rotor_iron, is_steel, "iron regions");
  check_one(c, "coils", c.materials.coils, is_conductor, "coils");
  check_one(c, "bars", c.materials.bars, is_conductor, "bars");
  check_one(c, "shaft", c.materials.shaft, is_shaft, "the shaft");
}

}  // namespace gapflux
