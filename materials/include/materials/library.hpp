#pragma once
// Materials: the built-in library and the case's own definitions, resolved per region.
// A material is linear (relative permeability) or nonlinear (a B–H curve); conductors carry a
// conductivity at 20 °C with its temperature coefficient; steels carry a density and the
// grade's specific-loss figure.
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "cases/case.hpp"
#include "materials/bh_curve.hpp"
#include "materials/iron_loss.hpp"

namespace gapflux {

enum class MaterialClass { air, conductor, electrical_steel, structural_steel };

struct Material {
  std::string name;
  MaterialClass kind = MaterialClass::air;
  std::string note;                      // where the data come from
  double relative_permeability = 1.0;    // used when `curve` is empty
  std::shared_ptr<const BHCurve> curve;  // nonlinear steels
  double conductivity_s_per_m = 0.0;     // at 20 °C
  double temperature_coefficient_per_k = 0.0;
  double density_kg_per_m3 = 0.0;
  double specific_loss_w_per_kg = 0.0;  // grade figure at 1.5 T, 50 Hz (EN 10106 naming)
  double lamination_thickness_m = 0.0;  // electrical steels
  IronLossModel iron_loss;              // fitted to the grade figure; empty without one

  bool nonlinear() const { return static_cast<bool>(curve); }
  // ν and dν/d(B²) at B² (T²).
  void reluctivity(double b_squared, double& nu, double& dnu_db2) const;
  double energy_density(double b_tesla) const;
  // The effective reluctivity of a time-harmonic solve (m/H) for a flux density alternating
  // sinusoidally with peak `b_peak_tesla`: the constant ν whose field stores the same magnetic
  // energy averaged over a period, ν_eff·B̂²/4 = ⟨w(B̂·|sin ωt|)⟩ with w(B) = ∫₀ᴮ H dB — the
  // energy-equivalent choice among those compared by Luomi, Niemenmaa and Arkkio (ICEM 1986,
  // "On the use of effective reluctivities in magnetic field analysis of induction motors fed
  // from a sinusoidal voltage source"; from memory). Equals ν for a linear material.
  double effective_reluctivity(double b_peak_tesla) const;
  double conductivity_at(double temperature_c) const;
};

const std::vector<Material>& builtin_materials();
const Material* find_material(const std::string& name);

// Materials of the machine's regions, looked up and checked for suitability (iron regions take
// a steel, coils and bars a conductor). Throws InputError naming the [materials] key.
struct RegionMaterials {
  Material stator_iron, rotor_iron, coils, bars, rings, shaft, air;
};
RegionMaterials resolve_region_materials(const Case& c);

}  // namespace gapflux
