#include "postproc/field_evaluation.hpp"

#include <cmath>
#include <stdexcept>

namespace gapflux {

ElementFields evaluate_element_fields(const Assembler& assembler, const Eigen::VectorXd& x,
                                      const RegionModel& model) {
  const auto& elements = assembler.elements();
  ElementFields f;
  f.b_tesla.resize(elements.size());
  f.b_abs_tesla.resize(elements.size());
  f.mu_r_differential.resize(elements.size());
  for (std::size_t e = 0; e < elements.size(); ++e) {
    const Vec2 b =
        flux_density_at(elements[e].nodes, assembler.local_values(e, x), 1.0 / 3, 1.0 / 3);
    f.b_tesla[e] = b;
    f.b_abs_tesla[e] = b.norm();
    const Material& m = *model.material[elements[e].region];
    f.mu_r_differential[e] =
        m.curve ? 1.0 / (mu0 * m.curve->dh_db(b.norm())) : m.relative_permeability;
  }
  return f;
}

std::vector<RegionEnergy> region_energies(const Assembler& assembler, const Eigen::VectorXd& x,
                                          const RegionModel& model, std::size_t n_regions,
                                          double stack_length_m, int sectors) {
  std::vector<RegionEnergy> out(n_regions);
  const auto& elements = assembler.elements();
  for (std::size_t e = 0; e < elements.size(); ++e) {
    const ElementRecord& rec = elements[e];
    const LocalVector a = assembler.local_values(e, x);
    const Material& m = *model.material[rec.region];
    for (const QuadraturePoint& q : quadrature(rec.nodes.order)) {
      const PointGeometry g = point_geometry(rec.nodes, q.xi, q.eta);
      Vec2 grad = Vec2::Zero();
      for (int i = 0; i < rec.nodes.n_nodes(); ++i) grad += a[i] * g.grad[i];
      const double b2 = grad.squaredNorm();
      double nu = 0.0, dnu = 0.0;
      m.reluctivity(b2, nu, dnu);
      const double w = m.energy_density(std::sqrt(b2));
      const double dv = q.weight * g.det_j * stack_length_m * sectors;
      out[rec.region].energy_j += w * dv;
      out[rec.region].coenergy_j += (nu * b2 - w) * dv;
    }
  }
  return out;
}

int default_airgap_samples(const Mesh& mesh) {
  const int intervals =
      static_cast<int>(mesh.stator_ring.vertices.size()) - (mesh.symmetry.sectors > 1 ? 1 : 0);
  return 2 * intervals;
}

AirgapSamples sample_airgap(const Assembler& assembler, const Eigen::VectorXd& x, const Mesh& mesh,
                            int n_samples) {
  AirgapSamples s;
  s.radius_m = 0.5 * (mesh.stator_ring.radius_m + mesh.rotor_ring.radius_m);
  const auto& elements = assembler.elements();
  const std::size_t first_band = mesh.n_triangles();
  const long n_band = static_cast<long>(elements.size() - first_band);
  if (n_band <= 0 || n_samples <= 0) return s;
  const double pitch = mesh.stator_ring.pitch_rad;
  const long intervals = n_band / 2;
  for (int j = 0; j < n_samples; ++j) {
    // Half a spacing in: with two samples per band pitch no point lies on a band edge, where
    // the tangential component of B jumps between the two triangles.
    const double theta = (j + 0.5) * mesh.symmetry.sector_angle_rad / n_samples;
    const Vec2 p = polar(s.radius_m, theta);
    const long guess = std::min(intervals - 1, static_cast<long>(std::floor(theta / pitch)));
    bool found = false;
    // Band triangles come in pairs per stator interval; the point lies in this pair or beside it.
    // In a sector model the last triangles reach past the sector edge (the rotor has turned):
    // a point near θ = 0 may lie in their image one sector on, where the field is ±B.
    const auto search = [&](const Vec2& point, long near, double sign) {
      for (long d : {0L, -1L, 1L, -2L, 2L}) {
        const long i = ((near + d) % intervals + intervals) % intervals;
        for (long k = 0; k < 2; ++k) {
          const std::size_t e = first_band + static_cast<std::size_t>(2 * i + k);
          double xi = 0, eta = 0;
          if (!locate(elements[e].nodes, point, xi, eta)) continue;
          const Vec2 b = flux_density_at(elements[e].nodes, assembler.local_values(e, x), xi, eta);
          const double phi = std::atan2(point.y(), point.x());
          const Vec2 radial(std::cos(phi), std::sin(phi)),
              tangential(-std::sin(phi), std::cos(phi));
          s.theta_rad.push_back(theta);
          s.b_r_tesla.push_back(sign * b.dot(radial));
          s.b_theta_tesla.push_back(sign * b.dot(tangential));
          return true;
        }
      }
      return false;
    };
    found = search(p, guess, 1.0);
    if (!found && mesh.symmetry.sectors > 1) {
      const Vec2 image = Eigen::Rotation2Dd(mesh.symmetry.sector_angle_rad) * p;
      found = search(image, intervals - 1, mesh.symmetry.antiperiodic ? -1.0 : 1.0);
    }
    if (!found) throw std::runtime_error("an airgap sample point lies in no band triangle");
  }
  return s;
}

std::vector<double> nodal_potential(const Mesh& mesh, const DofMap& dofs,
                                    const Eigen::VectorXd& x) {
  std::vector<double> a(mesh.nodes.size(), 0.0);
  for (std::size_t n = 0; n < a.size(); ++n)
    if (dofs.dof_of_node[n] >= 0) a[n] = dofs.sign_of_node[n] * x[dofs.dof_of_node[n]];
  return a;
}

}  // namespace gapflux
