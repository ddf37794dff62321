// TransientStudy, start = "time_harmonic": the first step begins from the time-harmonic solution
// at the case's slip (solver/harmonic_field.hpp), so that the cage's currents and the winding's
// flux need not build up over the rotor's and the winding's time constants.
//
// The harmonic solution holds the rotor at the first step's angle; with X(t) = Re{X̂·e^{jωt}} in
// the stator's frame, a rotor DOF (a material point of the rotor) sees the forward field at s·ω
// and the backward one at (2 − s)·ω: x_r(t0 + τ) = Re{X̂₁·e^{jsωτ} + X̂₂·e^{j(2−s)ωτ}}. The cage
// keeps its history on its bars' DOFs and its ring currents (rotor quantities), the winding its
// total linkages Λ = ψ + L_end·i (stator quantities, at ω). The supply's harmonics are not in
// the start: their own transients are small and fast.
#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <numbers>

#include "solver/circuit.hpp"
#include "solver/harmonic_field.hpp"
#include "solver/newton_settings.hpp"
#include "supply_sequences.hpp"
#include "transient_study.hpp"

namespace gapflux {
namespace {

// Re{a·e^{jφa} + b·e^{jφb}} for complex vectors a, b (b may be empty).
Eigen::VectorXd real_at(const Eigen::VectorXcd& a, double phase_a, const Eigen::VectorXcd& b,
                        double phase_b) {
  Eigen::VectorXd out = (a * std::polar(1.0, phase_a)).real();
  if (b.size() == a.size()) out += (b * std::polar(1.0, phase_b)).real();
  return out;
}

}  // namespace

void TransientStudy::start_from_harmonic(MagnetostaticSystem& system, const RegionModel& model) {
  const auto clock_start = std::chrono::steady_clock::now();
  const double omega = 2.0 * std::numbers::pi * case_.supply.frequency_hz;
  const double slip = slip_of(case_);
  const double dt = grid_.dt_s;

  // Set up: the winding and the cage in phasor form, on the first step's system.
  const HarmonicWinding winding = harmonic_winding(
      case_, system.assembler(), coils_, {winding_r_.resistance_ohm, winding_r_.end_inductance_h},
      mesh_.symmetry.sectors);
  RegionModel harmonic_model = model;  // the sources in it are not used
  std::unique_ptr<HarmonicCage> cage;
  if (cage_wanted())
    cage = std::make_unique<HarmonicCage>(
        harmonic_cage(system.assembler(), cage_values_.circuit, bar_of_region_, harmonic_model));

  // Solve: both sequences of the supply's fundamental, referred to the first step's instant.
  const Eigen::Vector3cd source =
      supply_fundamental(case_.supply, winding.voltage_fed, grid_.time(0));
  const SequenceFields f =
      solve_sequences(system.assembler(), harmonic_model, winding, cage.get(), omega, slip, source);
  const HarmonicState& p = f.positive;
  const HarmonicState* n = f.has_negative ? &f.negative : nullptr;
  const Eigen::VectorXcd none;

  // The history at t0 − dt and t0 − 2·dt, newest first, and the field at t0 as Newton's start.
  const double backward = 2.0 - slip;
  std::vector<Eigen::VectorXd> x_history, ring_history;
  std::vector<Triple> linkage_history;
  for (int k = 1; k <= 2; ++k) {
    const double tau = -k * dt;
    x_history.push_back(real_at(p.x, slip * omega * tau, n ? n->x : none, backward * omega * tau));
    if (cage)
      ring_history.push_back(real_at(p.ring_current_a, slip * omega * tau,
                                     n ? n->ring_current_a : none, backward * omega * tau));
    Eigen::Vector3cd total =
        p.flux_linkage_wb + winding.impedance.end_inductance_h * p.branch_current_a;
    if (n) total += n->flux_linkage_wb + winding.impedance.end_inductance_h * n->branch_current_a;
    const Eigen::Vector3d lambda = (total * std::polar(1.0, omega * tau)).real();
    linkage_history.push_back({lambda[0], lambda[1], lambda[2]});
  }
  system.x() = real_at(p.x, 0.0, n ? n->x : none, 0.0);
  if (circuit_) circuit_->set_history(linkage_history);
  if (cage_wanted()) {
    start_cage(system, model, newton_settings(case_.solver), /*cold=*/false);
    cage_->set_history(x_history, ring_history);
  }

  // What the harmonic model predicts for this run, shown beside the stepped result at the end.
  const HarmonicPoint point = evaluate_point(
      point_context(case_, system, winding, cage.get(), bar_of_region_, omega), f, slip);
  const double root2 = std::sqrt(2.0);
  const std::vector<double> predicted{slip,
                                      point.torque_nm,
                                      std::abs(point.current_seq.positive) / root2,
                                      std::abs(point.current_seq.negative) / root2,
                                      point.bar_forward_rms_a,
                                      point.bar_backward_rms_a,
                                      point.cage_bars_w + point.cage_rings_w};

  // Output: what the start was, for the record.
  const double seconds =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - clock_start).count();
  start_iterations_ = p.iterations + (n ? n->iterations : 0);
  start_s_ = seconds;
  h5_->attribute("/", "start", std::string("time_harmonic"));
  h5_->attribute("/", "start_harmonic_iterations", static_cast<long>(start_iterations_));
  h5_->write("start/predicted", predicted, "slip, N·m, A, A, A, A, W");
  h5_->attribute("start/predicted", "columns",
                 std::string("slip, torque, winding current positive and negative sequence "
                             "(RMS), bar forward and backward (RMS, largest bar), cage loss"));
  if (circuit_) {
    const Triple& h1 = linkage_history[0];
    const Triple& h2 = linkage_history[1];
    h5_->write("circuit/start_history",
               std::vector<double>{h1[0], h1[1], h1[2], h2[0], h2[1], h2[2]}, "Wb");
  }
  fmt::print(stderr,
             "start: time-harmonic solution at slip {:.4g} ({} linear solves{}, {:.1f} s)\n", slip,
             start_iterations_, p.converged ? "" : ", NOT converged: a rougher start", seconds);
}

}  // namespace gapflux
