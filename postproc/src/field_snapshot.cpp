#include "postproc/field_snapshot.hpp"

#include <cmath>
#include <numbers>

namespace gapflux {
namespace {

// Angle in [0, 2π) of a point.
double angle_of(const Vec2& p) {
  const double a = std::atan2(p.y(), p.x());
  return a < 0.0 ? a + 2.0 * std::numbers::pi : a;
}

}  // namespace

FieldSnapshot make_field_snapshot(const Assembler& assembler, const Eigen::VectorXd& x,
                                  const Mesh& mesh, const ElementFields& fields,
                                  const std::vector<double>* current_density) {
  const SectorSymmetry& sym = mesh.symmetry;
  const double sector = sym.sectors > 1 ? sym.sector_angle_rad : 0.0;
  FieldSnapshot s;
  s.order = mesh.order;
  const auto& elements = assembler.elements();
  const auto add = [&](std::size_t e, int m) {
    const ElementRecord& rec = elements[e];
    const Eigen::Rotation2Dd turn(-m * sector);
    const double sign = sym.antiperiodic && (m % 2 != 0) ? -1.0 : 1.0;
    ElementNodes nodes = rec.nodes;
    for (int i = 0; i < nodes.n_nodes(); ++i) nodes.x[i] = turn * nodes.x[i];
    s.nodes.push_back(nodes);
    s.corner_values.push_back(sign * assembler.local_values(e, x));
    s.b_tesla.push_back(sign * (turn * fields.b_tesla[e]));
    s.b_abs_tesla.push_back(fields.b_abs_tesla[e]);
    s.mu_r.push_back(fields.mu_r_differential[e]);
    if (current_density) s.current_density.push_back(sign * (*current_density)[e]);
    const MeshRegion& region = mesh.regions[rec.region];
    s.region_id.push_back(region.id);
    s.side.push_back(region.tag.kind == RegionKind::moving_band ? 2
                     : is_rotor_side(region.tag.kind)           ? 1
                                                                : 0);
  };
  for (std::size_t e = 0; e < elements.size(); ++e) {
    const bool rotor = is_rotor_side(mesh.regions[elements[e].region].tag.kind);
    if (!rotor || sector <= 0.0) {
      add(e, 0);
      continue;
    }
    // The images whose copy of this triangle reaches into [0, sector): by its corners' angles.
    const ElementNodes& n = elements[e].nodes;
    double lo = 1e300, hi = -1e300, reach = 0.0;
    for (int i = 0; i < 3; ++i) reach = std::max(reach, n.x[i].norm());
    double reference = -1.0;
    for (int i = 0; i < 3; ++i) {
      if (n.x[i].norm() < 1e-9 * reach) continue;  // a corner on the axis has no angle
      // Corner angles unwrapped next to the first one's, so a triangle across 0 stays whole.
      double a = angle_of(n.x[i]);
      if (reference < 0.0) reference = a;
      a += 2.0 * std::numbers::pi * std::round((reference - a) / (2.0 * std::numbers::pi));
      lo = std::min(lo, a), hi = std::max(hi, a);
    }
    const double tol = 1e-9;  // corners on a sector edge carry round-off in their angle
    for (int m = static_cast<int>(std::floor((lo - sector) / sector)) - 1;
         m <= static_cast<int>(std::ceil(hi / sector)) + 1; ++m) {
      const double a0 = lo - m * sector, a1 = hi - m * sector;
      if (a1 > tol && a0 < sector - tol) add(e, m);
    }
  }
  return s;
}

}  // namespace gapflux
