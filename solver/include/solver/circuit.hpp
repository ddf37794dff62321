#pragma once
// Voltage-fed windings (design.md §3). Each winding branch k obeys
//   e_k = R·i_k + dΛ_k/dt,   Λ_k = L_end·i_k + ψ_k,   ψ_k = s·c_kᵀx,
// with e_k the source voltage across the branch's loop, ψ_k the field's flux linkage (s = stack
// length × sectors, c_k the branch's coupling vector: the load per ampere) and L_end the end-
// winding leakage. The branches meet as a star with an isolated neutral (two independent loop
// currents, i_c = −i_a − i_b), a star with its neutral connected, or a delta (three loops; a
// zero-sequence current may circulate). d/dt is backward Euler or BDF2.
//
// The loop equations are linear in (x, i), so the currents eliminate exactly:
//   i_l = Z⁻¹·(q − g·Bᵀx),  B = C·T,  Z = (R + a0·L_end/Δt)·TᵀT,  g = a0·s/Δt,
// and the field problem keeps a symmetric positive-definite Jacobian J + g·B·Z⁻¹·Bᵀ (a rank-m
// update the Newton solver applies with CHOLMOD's factor of J), still the gradient of a convex
// functional, so the energy line search keeps its meaning.
#include <Eigen/Core>
#include <array>
#include <complex>
#include <vector>

#include "cases/case.hpp"
#include "solver/assembly.hpp"
#include "solver/coupled_circuit.hpp"
#include "solver/newton.hpp"
#include "solver/winding_sources.hpp"

namespace gapflux {

using Triple = std::array<double, 3>;

// Branch currents from loop currents: i_w = T·i_l (3×2 for an isolated star, else 3×3 identity).
Eigen::MatrixXd loop_to_branch(Connection connection);

// The supply's voltages at t: line-to-neutral (rebuilt without zero sequence when only
// line-to-line values are given), line-to-line (ab, bc, ca), and across each branch's loop
// (phase voltages for a star, line-to-line for a delta).
Triple supply_phase_voltages_v(const SupplySpec& supply, double t_s);
Triple supply_line_voltages_v(const SupplySpec& supply, double t_s);
Triple branch_source_voltages_v(const SupplySpec& supply, double t_s);
// Line currents from branch currents (a delta's: i_a = i_ab − i_ca, and so on).
Triple line_currents_a(Connection connection, const Triple& branch_current_a);

// Column k: the load vector per ampere in branch k (the scatter of ∫N_i·n_k dS, n_k the turns
// density of the branch's coil sides), so that ψ_k = s·Cᵀx.
Eigen::MatrixXd coil_coupling(const Assembler& assembler, const CoilRegions& coils);

struct BranchImpedance {
  double resistance_ohm = 0.0;
  double end_inductance_h = 0.0;
};

// The winding's circuit through the time steps: it keeps the earlier total linkages Λ that the
// difference formula needs. As a coupled circuit it takes the supply and, at each step, the
// coupling of the step's system (attach()).
class WindingCircuit : public CoupledCircuit {
 public:
  WindingCircuit(Connection connection, BranchImpedance z, TimeScheme scheme, double linkage_scale,
                 SupplySpec supply = {});
  // History: the total linkages of the last steps, newest first (one or two).
  void set_history(const std::vector<Triple>& newest_first);
  // The eliminated loop equations of the step, as the Newton solver's low-rank term.
  LowRankTerm step_term(const Eigen::MatrixXd& coupling, const Triple& source_v, double dt_s) const;

  struct StepResult {
    Triple branch_current_a{0, 0, 0};
    Triple flux_linkage_wb{0, 0, 0};   // ψ from the field
    Triple branch_voltage_v{0, 0, 0};  // across each winding branch: R·i + dΛ/dt
  };
  // After the field is solved: the step's currents and voltages; the step enters the history.
  StepResult finish_step(const LowRankTerm& term, const Eigen::MatrixXd& coupling,
                         const Eigen::VectorXd& x, double dt_s);

  // As a coupled circuit: the coupling of the step's system, then the two calls below.
  void attach(Eigen::MatrixXd coupling) { coupling_ = std::move(coupling); }
  const Eigen::MatrixXd& coupling() const { return coupling_; }
  LowRankTerm step_term(double t_s, double dt_s) const override;
  void finish_step(const LowRankTerm& term, const Eigen::VectorXd& x, double dt_s) override;
  const StepResult& last() const { return last_; }
  bool second_order_next() const;  // BDF2 with two history values
  Connection connection() const { return connection_; }
  const Eigen::MatrixXd& t() const { return t_; }

 private:
  // d/dt y_n ≈ (a0·y_n − h)/Δt with h from the history.
  double a0() const;
  Triple history_term() const;

  Connection connection_;
  Eigen::MatrixXd t_;
  BranchImpedance z_;
  TimeScheme scheme_;
  double scale_;
  SupplySpec supply_;
  Eigen::MatrixXd coupling_;
  StepResult last_;
  std::vector<Triple> history_;  // newest first, at most two
};

// The winding as a linear circuit, for the start-up estimate: the 3×3 branch inductance matrix
// (of the unsaturated field, or a secant of the saturated one) and the fundamental linkage the
// imposed rotor currents make in each branch (complex amplitudes referred to the start, 0 when
// the bars carry none).
struct LinearWinding {
  Eigen::Matrix3d inductance_h = Eigen::Matrix3d::Zero();
  Eigen::Vector3cd rotor_linkage_wb = Eigen::Vector3cd::Zero();
};

// A positive-sequence set's complex amplitudes from one instant of it: X = (2/3)·Σ x_k·e^{jk2π/3}
// and X_k = X·e^{−jk2π/3}, so that x_k(t) = Re(X_k·e^{jω(t − t0)}).
Eigen::Vector3cd positive_sequence_amplitudes(const Triple& at_t0);

struct SteadyStateEstimate {
  std::vector<Triple> linkage_wb;  // total Λ per branch at each time asked
  std::vector<Triple> current_a;   // branch currents at each time asked
};

// The linear periodic state the start-up begins from: per harmonic of the branch source
// voltages (a DFT over one period from t_start), the loop currents through
// Tᵀ(R + s_h(L_end + L))T·I = Tᵀ(E − s_h·Ψ_r) and the linkages Λ_h = (L_end + L)·T·I_h + Ψ_r
// (Ψ_r at the fundamental only), with s_h the difference formula's response to e^{jhωt}
// (→ jhω as Δt → 0). A linear winding started there has no transient at all.
SteadyStateEstimate steady_state_estimate(const SupplySpec& supply, Connection connection,
                                          BranchImpedance z, const LinearWinding& winding,
                                          TimeScheme scheme, double dt_s, double t_start_s,
                                          const std::vector<double>& times_s);

}  // namespace gapflux
