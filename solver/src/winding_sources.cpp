#include "solver/winding_sources.hpp"

namespace gapflux {

CoilRegions coil_regions(const Mesh& mesh, const WindingLayout& layout) {
  CoilRegions c;
  c.phase.assign(mesh.regions.size(), -1);
  c.turns_density_per_m2.assign(mesh.regions.size(), 0.0);
  const MeshQuality q = mesh_quality(mesh);
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) {
    const RegionTag& tag = mesh.regions[r].tag;
    if (tag.kind != RegionKind::coil_side) continue;
    const CoilSide& side = layout.side(tag.index % layout.slots, std::max(0, tag.layer));
    c.phase[r] = side.phase;
    c.turns_density_per_m2[r] = side.sign * double(layout.turns_per_coil) /
                                (layout.parallel_paths * q.area_per_region_m2[r]);
  }
  return c;
}

std::vector<double> region_current_density(const CoilRegions& coils,
                                           const std::array<double, 3>& phase_current_a) {
  std::vector<double> j(coils.phase.size(), 0.0);
  for (std::size_t r = 0; r < j.size(); ++r)
    if (coils.phase[r] >= 0) j[r] = coils.turns_density_per_m2[r] * phase_current_a[coils.phase[r]];
  return j;
}

double integral_of_a(const ElementNodes& e, const LocalVector& a) {
  double sum = 0.0, n[max_element_nodes];
  for (const QuadraturePoint& q : quadrature(e.order)) {
    const PointGeometry g = point_geometry(e, q.xi, q.eta);
    shape_values(e.order, q.xi, q.eta, n);
    double value = 0.0;
    for (int i = 0; i < e.n_nodes(); ++i) value += n[i] * a[i];
    sum += q.weight * g.det_j * value;
  }
  return sum;
}

std::array<double, 3> phase_flux_linkage(const Assembler& assembler, const Eigen::VectorXd& x,
                                         const CoilRegions& coils, double stack_length_m,
                                         int sectors) {
  std::array<double, 3> psi{0.0, 0.0, 0.0};
  const auto& elements = assembler.elements();
  for (std::size_t e = 0; e < elements.size(); ++e) {
    const int r = elements[e].region;
    if (r < 0 || coils.phase[r] < 0) continue;
    psi[coils.phase[r]] += coils.turns_density_per_m2[r] *
                           integral_of_a(elements[e].nodes, assembler.local_values(e, x));
  }
  for (double& p : psi) p *= stack_length_m * sectors;
  return psi;
}

}  // namespace gapflux
