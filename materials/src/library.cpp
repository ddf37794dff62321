#include "materials/library.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <numbers>

namespace gapflux {

void Material::reluctivity(double b_squared, double& nu, double& dnu_db2) const {
  if (curve) {
    curve->reluctivity(b_squared, nu, dnu_db2);
    return;
  }
  nu = 1.0 / (mu0 * relative_permeability);
  dnu_db2 = 0.0;
}

double Material::energy_density(double b_tesla) const {
  if (curve) return curve->energy_density(b_tesla);
  return 0.5 * b_tesla * b_tesla / (mu0 * relative_permeability);
}

double Material::effective_reluctivity(double b_peak_tesla) const {
  double nu = 0.0, dnu = 0.0;
  reluctivity(0.0, nu, dnu);
  if (!curve || b_peak_tesla < 1e-9) return nu;
  // ⟨w(B̂·sin θ)⟩ over θ in [0, π/2] (a quarter period holds every value), Gauss–Legendre with
  // 12 points: w is smooth except at the curve's table points, where it is still C¹.
  static constexpr std::array<double, 6> node{0.1252334085114689, 0.3678314989981802,
                                              0.5873179542866175, 0.7699026741943047,
                                              0.9041172563704749, 0.9815606342467192};
  static constexpr std::array<double, 6> weight{0.2491470458134028, 0.2334925365383548,
                                                0.2031674267230659, 0.1600783285433462,
                                                0.1069393259953184, 0.0471753363865118};
  constexpr double quarter = std::numbers::pi / 4.0;  // half the interval [0, π/2]
  double mean = 0.0;
  for (std::size_t i = 0; i < node.size(); ++i)
    for (double sign : {-1.0, 1.0}) {
      const double theta = quarter * (1.0 + sign * node[i]);
      mean += weight[i] * energy_density(b_peak_tesla * std::sin(theta));
    }
  mean *= 0.5;  // the weights sum to 2 over [−1, 1]: the mean over the interval
  return 4.0 * mean / (b_peak_tesla * b_peak_tesla);
}

double Material::conductivity_at(double temperature_c) const {
  return conductivity_s_per_m / (1.0 + temperature_coefficient_per_k * (temperature_c - 20.0));
}

namespace {

std::shared_ptr<const BHCurve> curve(std::vector<double> h, std::vector<double> b) {
  return std::make_shared<const BHCurve>(std::move(h), std::move(b));
}

// `thickness` and `sigma` (electrical conductivity of the sheet) give the classical eddy-current
// part of the loss fit.
Material steel(const std::string& name, const std::string& note, std::shared_ptr<const BHCurve> c,
               double density, double loss, double thickness = 0.0, double sigma = 0.0,
               MaterialClass kind = MaterialClass::electrical_steel) {
  Material m;
  m.name = name;
  m.kind = kind;
  m.note = note;
  m.curve = std::move(c);
  m.density_kg_per_m3 = density;
  m.specific_loss_w_per_kg = loss;
  m.lamination_thickness_m = thickness;
  m.conductivity_s_per_m = sigma;
  if (loss > 0.0) m.iron_loss = fit_iron_loss(loss, thickness, sigma, density);
  return m;
}

Material conductor(const std::string& name, const std::string& note, double sigma, double alpha,
                   double density) {
  Material m;
  m.name = name;
  m.kind = MaterialClass::conductor;
  m.note = note;
  m.conductivity_s_per_m = sigma;
  m.temperature_coefficient_per_k = alpha;
  m.density_kg_per_m3 = density;
  return m;
}

}  // namespace

const std::vector<Material>& builtin_materials() {
  // Steel curves: typical shapes for each grade class, from memory — no maker's data. H in A/m,
  // B in T. Loss figures: the grade name's maximum specific loss at 1.5 T, 50 Hz (EN 10106).
  static const std::vector<Material> all = [] {
    std::vector<Material> m;
    Material air;
    air.name = "air";
    air.note = "vacuum permeability, non-conducting";
    m.push_back(air);
    // Conductivity at 20 °C and temperature coefficient: handbook values (annealed copper
    // 100 % IACS 5.80e7 S/m, 0.00393 /K; aluminium 3.77e7 S/m, 0.00403 /K), from memory.
    m.push_back(conductor("copper", "annealed copper, 100 % IACS; handbook values, from memory",
                          5.80e7, 0.00393, 8960));
    m.push_back(conductor("aluminium",
                          "pure aluminium; handbook values, from memory; die-cast "
                          "cage alloys conduct less",
                          3.77e7, 0.00403, 2700));
    // Die-cast rotor aluminium (99.5 % grades, porosity included): about 3.2e7 S/m at 20 °C and
    // 0.0039 /K, typical values from memory; alloyed casting grades conduct less still.
    m.push_back(conductor("die_cast_aluminium",
                          "die-cast rotor aluminium, 99.5 % grade with casting porosity; typical "
                          "values, from memory",
                          3.2e7, 0.0039, 2700));
    m.push_back(steel("M270-35A",
                      "non-oriented electrical steel 0.35 mm; typical curve for the grade class, "
                      "from memory",
                      curve({0, 30, 45, 60, 80, 110, 160, 250, 400, 700, 1200, 2200, 4000, 7000,
                             12000, 20000, 40000, 100000},
                            {0, 0.25, 0.55, 0.85, 1.05, 1.18, 1.27, 1.35, 1.42, 1.48, 1.53, 1.59,
                             1.66, 1.73, 1.80, 1.87, 1.97, 2.12}),
                      7600, 2.70, 0.35e-3, 1.92e6));  // 52 μΩ·cm, from memory
    m.push_back(steel("M400-50A",
                      "non-oriented electrical steel 0.50 mm; typical curve for the grade class, "
                      "from memory",
                      curve({0,    40,   60,   80,   100,  150,   200,   300,   450,   700,
                             1000, 1500, 2500, 4000, 6000, 10000, 15000, 25000, 50000, 100000},
                            {0,    0.25, 0.50, 0.75, 0.92, 1.10, 1.20, 1.30, 1.38, 1.45,
                             1.50, 1.55, 1.62, 1.68, 1.73, 1.80, 1.86, 1.94, 2.04, 2.14}),
                      7700, 4.00, 0.50e-3, 2.38e6));  // 42 μΩ·cm, from memory
    m.push_back(steel("M800-65A",
                      "non-oriented electrical steel 0.65 mm; typical curve for the grade class, "
                      "from memory",
                      curve({0, 50, 80, 110, 150, 200, 300, 450, 700, 1100, 1700, 2800, 4500, 7500,
                             12000, 20000, 40000, 100000},
                            {0, 0.20, 0.45, 0.70, 0.90, 1.05, 1.18, 1.28, 1.37, 1.45, 1.52, 1.59,
                             1.65, 1.72, 1.79, 1.87, 1.97, 2.12}),
                      7800, 8.00, 0.65e-3, 3.33e6));  // 30 μΩ·cm, from memory
    m.push_back(steel("shaft_steel", "plain carbon shaft steel; typical curve, from memory",
                      curve({0, 200, 400, 700, 1200, 2000, 4000, 8000, 16000, 40000, 100000},
                            {0, 0.30, 0.70, 1.00, 1.22, 1.38, 1.55, 1.68, 1.80, 1.95, 2.10}),
                      7850, 0.0, 0.0, 0.0, MaterialClass::structural_steel));
    return m;
  }();
  return all;
}

const Material* find_material(const std::string& name) {
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

Material from_definition(const Case& c, const MaterialDefinition& d) {
  Material m;
  m.name = d.name;
  m.kind = d.kind == MaterialKind::air         ? MaterialClass::air
           : d.kind == MaterialKind::conductor ? MaterialClass::conductor
                                               : MaterialClass::electrical_steel;
  m.note = "defined in the case file";
  m.relative_permeability = d.relative_permeability;
  m.conductivity_s_per_m = d.conductivity_s_per_m;
  m.temperature_coefficient_per_k = d.temperature_coefficient_per_k;
  m.density_kg_per_m3 = d.density_kg_per_m3;
  if (!d.bh_b_tesla.empty()) {
    try {
      m.curve = std::make_shared<const BHCurve>(d.bh_h_a_per_m, d.bh_b_tesla);
    } catch (const std::invalid_argument& e) {
      throw c.sources.error("materials.define." + d.name + ".bh_b_tesla", e.what());
    }
  }
  m.specific_loss_w_per_kg = d.specific_loss_w_per_kg;
  m.lamination_thickness_m = d.thickness_m;
  if (d.specific_loss_w_per_kg > 0.0) {
    if (!(d.density_kg_per_m3 > 0.0))
      throw c.sources.error("materials.define." + d.name + ".specific_loss_w_per_kg",
                            "a loss figure needs density_kg_per_m3 too");
    try {
      m.iron_loss = fit_iron_loss(d.specific_loss_w_per_kg, d.thickness_m, d.conductivity_s_per_m,
                                  d.density_kg_per_m3);
    } catch (const std::invalid_argument& e) {
      throw c.sources.error("materials.define." + d.name + ".thickness_mm", e.what());
    }
  }
  return m;
}

Material lookup(const Case& c, const std::string& key, const std::string& name,
                bool (*accept)(MaterialClass), const char* what) {
  const Material* m = find_material(name);
  std::optional<Material> defined;
  for (const MaterialDefinition& d : c.materials.definitions)
    if (d.name == name) defined = from_definition(c, d);
  if (defined) m = &*defined;
  if (!m)
    throw c.sources.error("materials." + key,
                          fmt::format("unknown material {}; define it under [materials.define.{}] "
                                      "or use a built-in one for {}: {}",
                                      quote_text(name), quote_text(name), what, names_of(accept)));
  if (!accept(m->kind))
    throw c.sources.error("materials." + key,
                          fmt::format("{} cannot be used for {}; choose one of: {}",
                                      quote_text(name), what, names_of(accept)));
  return *m;
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

RegionMaterials resolve_region_materials(const Case& c) {
  // Every definition must build, even one no region uses.
  for (const MaterialDefinition& d : c.materials.definitions) from_definition(c, d);
  RegionMaterials r;
  r.stator_iron = lookup(c, "stator_iron", c.materials.stator_iron, is_steel, "iron regions");
  r.rotor_iron = lookup(c, "rotor_iron", c.materials.rotor_iron, is_steel, "iron regions");
  r.coils = lookup(c, "coils", c.materials.coils, is_conductor, "coils");
  r.bars = lookup(c, "bars", c.materials.bars, is_conductor, "bars");
  r.rings = c.materials.rings.empty()
                ? r.bars
                : lookup(c, "rings", c.materials.rings, is_conductor, "end rings");
  // Induced bar currents need a conductor that conducts, at the cage temperature.
  if (c.rotor.kind == RotorKind::cage && c.rotor.bar_currents == BarCurrents::induced)
    for (const auto& [key, m] :
         {std::pair<const char*, const Material*>{"bars", &r.bars}, {"rings", &r.rings}}) {
      const double sigma = m->conductivity_at(c.rotor.cage_temperature_c);
      if (!(sigma > 0.0))
        throw c.sources.error(
            std::string("materials.") + (c.materials.rings.empty() ? "bars" : key),
            fmt::format("{} has no positive conductivity at the cage temperature ({} °C): an "
                        "induced cage needs one (a definition's conductivity_s_per_m and "
                        "temperature_coefficient_per_k)",
                        quote_text(m->name), c.rotor.cage_temperature_c));
    }
  r.shaft = lookup(c, "shaft", c.materials.shaft, is_shaft, "the shaft");
  r.air = *find_material("air");
  return r;
}

}  // namespace gapflux
