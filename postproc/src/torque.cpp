#include "postproc/torque.hpp"

#include <cmath>

#include "materials/bh_curve.hpp"
#include "postproc/field_evaluation.hpp"

namespace gapflux {

double arkkio_torque_nm(const Assembler& assembler, const Eigen::VectorXd& x, const Mesh& mesh,
                        double stack_length_m) {
  const auto& elements = assembler.elements();
  double integral = 0.0;  // ∫ r·B_r·B_θ dS over the band
  for (std::size_t e = mesh.n_triangles(); e < elements.size(); ++e) {
    const ElementRecord& rec = elements[e];
    const LocalVector a = assembler.local_values(e, x);
    for (const QuadraturePoint& q : quadrature(rec.nodes.order)) {
      const PointGeometry g = point_geometry(rec.nodes, q.xi, q.eta);
      Vec2 grad = Vec2::Zero();
      for (int i = 0; i < rec.nodes.n_nodes(); ++i) grad += a[i] * g.grad[i];
      const Vec2 b(grad.y(), -grad.x());
      const double r = g.x.norm();
      const Vec2 radial = g.x / r, tangential(-radial.y(), radial.x());
      integral += q.weight * g.det_j * r * b.dot(radial) * b.dot(tangential);
    }
  }
  const double thickness = mesh.stator_ring.radius_m - mesh.rotor_ring.radius_m;
  return stack_length_m * mesh.symmetry.sectors * integral / (mu0 * thickness);
}

double total_coenergy_j(const Assembler& assembler, const Eigen::VectorXd& x,
                        const RegionModel& model, double stack_length_m, int sectors) {
  double total = 0.0;
  for (const RegionEnergy& r :
       region_energies(assembler, x, model, model.material.size(), stack_length_m, sectors))
    total += r.coenergy_j;
  return total;
}

}  // namespace gapflux
