// The time-harmonic field: assembly of K(ν_eff) + jωsσ·M, UMFPACK's factor, the cage and the
// winding solved on small dense systems, and the effective-reluctivity iteration.
#include "solver/harmonic_field.hpp"

#include <fmt/format.h>

#include <Eigen/Dense>
#include <Eigen/Sparse>
#include <algorithm>
#include <cmath>

#include "solver/newton.hpp"
#include "solver/triangle_element.hpp"
#include "sparse_lu.hpp"

namespace gapflux {
namespace {

constexpr Complex j_unit{0.0, 1.0};

// ν·∫∇N_i·∇N_j dS, one element with a constant reluctivity.
LocalMatrix reluctivity_stiffness(const ElementNodes& e, double nu) {
  LocalMatrix k = LocalMatrix::Zero();
  const int n = e.n_nodes();
  for (const QuadraturePoint& q : quadrature(e.order)) {
    const PointGeometry g = point_geometry(e, q.xi, q.eta);
    const double w = q.weight * g.det_j * nu;
    for (int i = 0; i < n; ++i)
      for (int m = 0; m < n; ++m) k(i, m) += w * g.grad[i].dot(g.grad[m]);
  }
  return k;
}

// ∫N_i·N_j dS.
LocalMatrix mass_matrix(const ElementNodes& e) {
  LocalMatrix m = LocalMatrix::Zero();
  LocalVector unused = LocalVector::Zero();
  eddy_element(e, LocalVector::Zero(), 1.0, true, m, unused);
  return m;
}

double region_conductivity(const RegionModel& model, int region) {
  if (model.eddy_s_per_m.empty() || region < 0) return 0.0;
  return model.eddy_s_per_m[static_cast<std::size_t>(region)];
}

// K(ν) + jωsσ·M in compressed columns (both triangles: UMFPACK takes the whole matrix).
Eigen::SparseMatrix<Complex> assemble_harmonic(const Assembler& assembler, const RegionModel& model,
                                               const std::vector<double>& nu, double omega_slip) {
  const auto& elements = assembler.elements();
  std::vector<Eigen::Triplet<Complex>> entries;
  entries.reserve(elements.size() * 36);
  for (std::size_t e = 0; e < elements.size(); ++e) {
    const ElementRecord& rec = elements[e];
    const LocalMatrix k = reluctivity_stiffness(rec.nodes, nu[e]);
    const double sigma = region_conductivity(model, rec.region);
    const LocalMatrix m = sigma > 0.0 ? LocalMatrix(mass_matrix(rec.nodes)) : LocalMatrix::Zero();
    for (int i = 0; i < rec.nodes.n_nodes(); ++i) {
      if (rec.dof[i] < 0) continue;
      for (int l = 0; l < rec.nodes.n_nodes(); ++l) {
        if (rec.dof[l] < 0) continue;
        const double sign = rec.sign[i] * rec.sign[l];
        entries.emplace_back(rec.dof[i], rec.dof[l],
                             sign * Complex(k(i, l), omega_slip * sigma * m(i, l)));
      }
    }
  }
  Eigen::SparseMatrix<Complex> a(assembler.n_dofs(), assembler.n_dofs());
  a.setFromTriplets(entries.begin(), entries.end());
  return a;
}

// B̂ at every element's centroid, and the peak of |B(t)| there.
std::vector<double> element_b_peaks(const Assembler& assembler, const Eigen::VectorXcd& x) {
  const Eigen::VectorXd re = x.real(), im = x.imag();
  std::vector<double> peaks(assembler.elements().size());
  for (std::size_t e = 0; e < peaks.size(); ++e) {
    const ElementNodes& nodes = assembler.elements()[e].nodes;
    const Vec2 b_re = flux_density_at(nodes, assembler.local_values(e, re), 1.0 / 3.0, 1.0 / 3.0);
    const Vec2 b_im = flux_density_at(nodes, assembler.local_values(e, im), 1.0 / 3.0, 1.0 / 3.0);
    peaks[e] =
        ellipse_peak(Eigen::Vector2cd(Complex(b_re.x(), b_im.x()), Complex(b_re.y(), b_im.y())));
  }
  return peaks;
}

std::vector<double> effective_reluctivities(const Assembler& assembler, const RegionModel& model,
                                            const std::vector<double>& b_peak) {
  std::vector<double> nu(assembler.elements().size());
  for (std::size_t e = 0; e < nu.size(); ++e)
    nu[e] = model.material[assembler.elements()[e].region]->effective_reluctivity(b_peak[e]);
  return nu;
}

// One linear solve with the reluctivities `nu`: the winding's response, then the state.
HarmonicState solve_linear(const HarmonicWinding& winding, const HarmonicCage* cage, double omega,
                           double slip, const std::vector<double>& nu, HarmonicOperator& lu) {
  const double omega_slip = omega * slip;
  lu.factorize(nu, omega_slip);

  const Eigen::MatrixXd t = loop_to_branch(winding.connection);
  // The columns the winding drives: per branch ampere (current feed) or per loop ampere.
  const Eigen::MatrixXcd drive = winding.voltage_fed
                                     ? Eigen::MatrixXcd((winding.coupling * t).cast<Complex>())
                                     : Eigen::MatrixXcd(winding.coupling.cast<Complex>());
  Eigen::MatrixXcd response = lu.solve(drive);  // the field per unit drive current, cage open

  HarmonicState s;
  s.omega_rad_per_s = omega;
  s.slip = slip;
  Eigen::MatrixXcd bar_voltage_response;  // û per unit drive current
  Eigen::MatrixXcd p;
  Complex ring_z = 0.0;
  if (cage) {
    const CageParameters& c = cage->parameters;
    const double sigma = c.conductivity_s_per_m, ell = c.stack_length_m;
    const Eigen::MatrixXcd cc = cage->coupling.cast<Complex>();
    const Eigen::MatrixXcd y = lu.solve(cc);  // A0⁻¹C
    ring_z = Complex(c.ring_segment_resistance_ohm, omega_slip * c.ring_segment_inductance_h);
    const Eigen::MatrixXd d = cage_incidence(c);
    p = (d * d.transpose()).cast<Complex>() / (2.0 * ring_z);
    for (int k = 0; k < c.bars; ++k) p(k, k) += sigma * cage->bar_area_m2[k] / ell;
    const Complex coupling = j_unit * omega_slip * sigma;
    const Eigen::MatrixXcd schur = p - (coupling * sigma / ell) * (cc.transpose() * y);
    bar_voltage_response = schur.partialPivLu().solve(coupling * (cc.transpose() * response));
    response += (sigma / ell) * y * bar_voltage_response;
  }

  const double k = winding.linkage_scale;
  Eigen::VectorXcd drive_current;
  if (winding.voltage_fed) {
    const Complex z_branch(winding.impedance.resistance_ohm,
                           omega * winding.impedance.end_inductance_h);
    const Eigen::MatrixXcd tc = t.cast<Complex>();
    const Eigen::MatrixXcd z_loop =
        z_branch * (tc.transpose() * tc) +
        (j_unit * omega * k) * (drive.transpose() * response);  // TᵀC_wᵀ = driveᵀ
    drive_current = z_loop.partialPivLu().solve(tc.transpose() * winding.source);
    s.branch_current_a = tc * drive_current;
  } else {
    drive_current = winding.source;
    s.branch_current_a = winding.source;
  }
  s.x = response * drive_current;
  s.flux_linkage_wb = k * (winding.coupling.cast<Complex>().transpose() * s.x);
  const Complex z_branch(winding.impedance.resistance_ohm,
                         omega * winding.impedance.end_inductance_h);
  s.branch_voltage_v = z_branch * s.branch_current_a + j_unit * omega * s.flux_linkage_wb;
  if (cage) {
    const CageParameters& c = cage->parameters;
    const double sigma = c.conductivity_s_per_m, ell = c.stack_length_m;
    s.bar_voltage_v = bar_voltage_response * drive_current;
    s.bar_current_a = Eigen::VectorXcd(c.bars);
    for (int b = 0; b < c.bars; ++b)
      s.bar_current_a[b] =
          sigma * cage->bar_area_m2[b] / ell * s.bar_voltage_v[b] -
          j_unit * omega_slip * sigma * cage->coupling.col(b).cast<Complex>().dot(s.x);
    s.ring_current_a =
        -(cage_incidence(c).transpose().cast<Complex>() * s.bar_voltage_v) / (2.0 * ring_z);
  }
  s.reluctivity = nu;
  s.iterations = 1;
  return s;
}

}  // namespace

HarmonicOperator::HarmonicOperator(const Assembler& assembler, const RegionModel& model)
    : assembler_(assembler), model_(model), lu_(std::make_unique<SparseLu>()) {}
HarmonicOperator::~HarmonicOperator() = default;

void HarmonicOperator::factorize(const std::vector<double>& reluctivity, double omega_slip) {
  lu_->factorize(assemble_harmonic(assembler_, model_, reluctivity, omega_slip));
}

Eigen::MatrixXcd HarmonicOperator::solve(const Eigen::MatrixXcd& load) const {
  return lu_->solve(load);
}

double ellipse_peak(const Eigen::Vector2cd& b) {
  // |B(t)|² = ½(|a|² + |c|²) + ½(|a|² − |c|²)·cos 2ωt − a·c·sin 2ωt with a = Re B̂, c = Im B̂.
  const Eigen::Vector2d a = b.real(), c = b.imag();
  const double mean = 0.5 * (a.squaredNorm() + c.squaredNorm());
  const double half_difference = 0.5 * (a.squaredNorm() - c.squaredNorm());
  return std::sqrt(mean + std::hypot(half_difference, a.dot(c)));
}

HarmonicState solve_harmonic(const Assembler& assembler, const RegionModel& model,
                             const HarmonicWinding& winding, const HarmonicCage* cage,
                             double omega_rad_per_s, double slip, const HarmonicSettings& settings,
                             const std::vector<double>* fixed_reluctivity) {
  HarmonicOperator lu(assembler, model);
  if (fixed_reluctivity) {
    HarmonicState s = solve_linear(winding, cage, omega_rad_per_s, slip, *fixed_reluctivity, lu);
    s.b_peak_tesla = element_b_peaks(assembler, s.x);
    s.converged = true;
    return s;
  }
  // Start from the reluctivity at 1 T peak: near the working flux of the teeth, so the first
  // solve is neither unsaturated nor deep in saturation. Each iteration moves the flux density
  // the reluctivities are taken at part of the way towards the new solution's: relaxing B
  // rather than ν, whose steep rise in saturation makes plain substitution oscillate.
  std::vector<double> b_used(assembler.elements().size(), 1.0);
  if (settings.initial_b_peak_tesla.size() == b_used.size()) b_used = settings.initial_b_peak_tesla;
  std::vector<double> nu = effective_reluctivities(assembler, model, b_used);
  HarmonicState s;
  const double alpha = settings.relaxation;
  std::vector<double> element_alpha(b_used.size(), alpha), last_step(b_used.size(), 0.0);
  for (int iteration = 1; iteration <= settings.max_iterations; ++iteration) {
    const Eigen::VectorXcd previous = s.x;
    s = solve_linear(winding, cage, omega_rad_per_s, slip, nu, lu);
    s.iterations = iteration;
    s.b_peak_tesla = element_b_peaks(assembler, s.x);
    const std::vector<double> target = effective_reluctivities(assembler, model, s.b_peak_tesla);
    double change = 0.0;
    for (std::size_t e = 0; e < nu.size(); ++e)
      change = std::max(change, std::abs(std::log(target[e] / nu[e])));
    s.reluctivity_change = change;
    s.field_change = previous.size() == s.x.size() ? (s.x - previous).norm() / s.x.norm() : 1.0;
    // Settled: the field stopped moving, or every element already has the reluctivity its flux
    // density asks for (at once for linear iron).
    if (s.field_change < settings.field_tolerance || change < 1e-9) {
      s.converged = true;
      return s;
    }
    // Per element: a step that reverses the last one's direction halves that element's
    // relaxation (elements whose flux the surrounding MMF imposes, such as closed slots' bridges,
    // overshoot with any fixed one); steps in one direction regain it.
    for (std::size_t e = 0; e < nu.size(); ++e) {
      const double step = s.b_peak_tesla[e] - b_used[e];
      if (step * last_step[e] < 0.0)
        element_alpha[e] = std::max(0.01, 0.5 * element_alpha[e]);
      else
        element_alpha[e] = std::min(alpha, 1.5 * element_alpha[e]);
      last_step[e] = step;
      b_used[e] += element_alpha[e] * step;
    }
    nu = effective_reluctivities(assembler, model, b_used);
  }
  NewtonReport report;
  report.iterations = s.iterations;
  throw NumericalError(
      fmt::format("the time-harmonic solve did not settle in {} iterations (relative change of "
                  "the field {:.2e}, asked {:.0e}; largest change of an element's effective "
                  "reluctivity {:.2e})",
                  settings.max_iterations, s.field_change, settings.field_tolerance,
                  s.reluctivity_change),
      report);
}

HarmonicCageLoss harmonic_cage_loss(const Assembler& assembler,
                                    const std::vector<int>& bar_of_region, const HarmonicCage& cage,
                                    const HarmonicState& state) {
  const CageParameters& c = cage.parameters;
  const double sigma = c.conductivity_s_per_m, ell = c.stack_length_m;
  const double omega_slip = state.omega_rad_per_s * state.slip;
  HarmonicCageLoss out;
  out.bar_current_density_amplitude.assign(assembler.elements().size(), 0.0);
  double values[max_element_nodes];
  const Eigen::VectorXd x_re = state.x.real(), x_im = state.x.imag();  // once, not per element
  for (std::size_t e = 0; e < assembler.elements().size(); ++e) {
    const ElementRecord& rec = assembler.elements()[e];
    const int k = bar_of_element(rec, bar_of_region);
    if (k < 0) continue;
    const LocalVector re = assembler.local_values(e, x_re);
    const LocalVector im = assembler.local_values(e, x_im);
    const auto density = [&](double xi, double eta) {
      shape_values(rec.nodes.order, xi, eta, values);
      Complex a = 0.0;
      for (int i = 0; i < rec.nodes.n_nodes(); ++i) a += values[i] * Complex(re[i], im[i]);
      return sigma * (state.bar_voltage_v[k] / ell - j_unit * omega_slip * a);
    };
    for (const QuadraturePoint& q : quadrature(rec.nodes.order))
      out.bars_w += 0.5 * q.weight * point_geometry(rec.nodes, q.xi, q.eta).det_j *
                    std::norm(density(q.xi, q.eta)) / sigma;
    out.bar_current_density_amplitude[e] = std::abs(density(1.0 / 3.0, 1.0 / 3.0));
  }
  out.bars_w *= ell * c.sectors;
  // Two rings, each segment R·|î|²/2 on average.
  out.rings_w = c.ring_segment_resistance_ohm * state.ring_current_a.squaredNorm() * c.sectors;
  return out;
}

}  // namespace gapflux
