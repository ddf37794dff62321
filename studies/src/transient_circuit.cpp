// TransientStudy, voltage feed: the start from the linear steady state with a saturation secant.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "solver/circuit.hpp"
#include "solver/region_model.hpp"
#include "transient_study.hpp"

namespace gapflux {

void TransientStudy::start_circuit(MagnetostaticSystem& system, const RegionModel& model,
                                   const Eigen::MatrixXd& coupling,
                                   const std::vector<double>& bar_density,
                                   const NewtonSettings& settings) {
  const double scale = case_.machine.stack_length_m * mesh_.symmetry.sectors;
  const double t0 = grid_.time(0), dt = grid_.dt_s;
  // The unsaturated field (the tangent at A = 0) for the branch inductances L = s·Cᵀ·J⁻¹·C and
  // the linkage of the imposed bar currents at t0 (their load f at A = 0 is minus the residual).
  system.x().setZero();
  system.assembler().assemble(system.x(), model, false);
  Eigen::MatrixXd rhs(coupling.rows(), 4);
  rhs.leftCols(3) = coupling;
  rhs.col(3) = -system.assembler().residual();
  const Eigen::MatrixXd response = system.solve_tangent(model, rhs);
  LinearWinding winding;
  winding.inductance_h = scale * (coupling.transpose() * response.leftCols(3));
  winding.inductance_h = 0.5 * (winding.inductance_h + winding.inductance_h.transpose()).eval();
  const Eigen::Vector3d rotor = scale * (coupling.transpose() * response.col(3));
  winding.rotor_linkage_wb = positive_sequence_amplitudes({rotor[0], rotor[1], rotor[2]});
  const Eigen::Matrix3d unsaturated = winding.inductance_h;
  const Eigen::Vector3cd rotor_unsaturated = winding.rotor_linkage_wb;
  // Saturation: the field at t0 with the estimated currents, solved in full, against the linear
  // prediction; a factor on the linear winding (a secant of the saturated one) makes them agree.
  const std::vector<double> times{t0, t0 - dt, t0 - 2.0 * dt};
  SteadyStateEstimate estimate;
  double secant = 1.0, last_secant = 1.0, last_miss = 0.0;
  int solves = 0;
  const auto use = [&](double factor) {
    winding.inductance_h = factor * unsaturated;
    winding.rotor_linkage_wb = factor * rotor_unsaturated;
    secant = factor;
  };
  for (; solves < 6; ++solves) {
    estimate = steady_state_estimate(case_.supply, case_.supply.connection, impedance_, winding,
                                     case_.study.time_scheme, dt, t0, times);
    std::vector<double> j = region_current_density(coils_, estimate.current_a[0]);
    for (std::size_t r = 0; r < j.size(); ++r) j[r] += bar_density[r];
    system.solve(make_region_model(mesh_, materials_, j), settings);
    const Eigen::Vector3d field = scale * (coupling.transpose() * system.x());
    Eigen::Vector3d predicted;
    for (int k = 0; k < 3; ++k)
      predicted[k] =
          estimate.linkage_wb[0][k] - impedance_.end_inductance_h * estimate.current_a[0][k];
    // miss(factor) = field / prediction − 1, driven to zero by the secant method (the plain
    // fixed point factor·(1 + miss) converges only linearly, at about 0.4 per solve).
    const double miss = field.dot(predicted) / std::max(predicted.squaredNorm(), 1e-300) - 1.0;
    if (std::abs(miss) < 1e-3 || !(miss > -1.0)) break;
    const double next = solves == 0 || miss == last_miss
                            ? secant * (1.0 + miss)
                            : secant - miss * (secant - last_secant) / (miss - last_miss);
    last_secant = secant, last_miss = miss;
    use(std::clamp(next, 0.05, 2.0));
  }
  // The history the first step differences against: Λ of that state one and two steps before
  // the start, so the start carries no DC flux that would take L/R to decay. system.x() keeps
  // the last solve: the first step's warm start.
  circuit_->set_history({estimate.linkage_wb[1], estimate.linkage_wb[2]});
  const Triple& h1 = estimate.linkage_wb[1];
  const Triple& h2 = estimate.linkage_wb[2];
  h5_->write("circuit/start_history", std::vector<double>{h1[0], h1[1], h1[2], h2[0], h2[1], h2[2]},
             "Wb");
  h5_->write("circuit/start_inductance",
             std::vector<double>(unsaturated.data(), unsaturated.data() + 9), "H");
  h5_->attribute("circuit/start_inductance", "secant_factor", secant);
  h5_->attribute("circuit/start_inductance", "field_solves", static_cast<long>(solves + 1));
  fmt::print(stderr, "start: linear steady state, saturation secant {:.4f} after {} field solves\n",
             secant, solves + 1);
}

}  // namespace gapflux
