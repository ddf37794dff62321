#include "solver/rotor_currents.hpp"

#include <cmath>
#include <numbers>

namespace gapflux {

std::vector<double> bar_current_density(const Mesh& mesh, const Case& c,
                                        const WindingLayout& winding, int bars, double time_s,
                                        double rotor_angle_rad) {
  std::vector<double> j(mesh.regions.size(), 0.0);
  const RotorCurrentSpec& spec = c.rotor_currents;
  if (spec.bar_rms_a <= 0.0 || bars <= 0) return j;
  const MeshQuality q = mesh_quality(mesh);
  const double pi = std::numbers::pi;
  const int p = c.machine.pole_pairs();
  const double omega = 2.0 * pi * c.supply.frequency_hz;
  const double sheet_axis = winding.phase_axis_el_rad[0] + pi / 2.0;
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) {
    const RegionTag& tag = mesh.regions[r].tag;
    if (tag.kind != RegionKind::bar) continue;
    const double theta = (tag.index + 0.5) * 2.0 * pi / bars + rotor_angle_rad;
    const double i = std::sqrt(2.0) * spec.bar_rms_a *
                     std::cos(p * theta - sheet_axis - omega * time_s + spec.angle_rad);
    j[r] = i / q.area_per_region_m2[r];
  }
  return j;
}

}  // namespace gapflux
