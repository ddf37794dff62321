#pragma once
// The rotor cage with induced currents (design.md §2b), for the bars of the modelled sector.
// Bar k: J = σ·(u_k/ℓ − ∂A/∂t) over its cross-section, ∂A/∂t on the rotor's own mesh (its nodes
// turn with the rotor, so a DOF is a material point), u_k the voltage across the bar;
// i_k = ∫ J dS = G_k·u_k − σ·c_kᵀ·∂x/∂t with G_k = σ·S_k/ℓ and c_k = ∫ N dS over the bar.
// Ring segment k joins bars k and k+1 on each end (both rings alike, current i_r,k from bar k to
// bar k+1 on the front ring): Kirchhoff's current law i_k = i_r,k − i_r,k−1 (i = D·i_r) and the
// voltage law round the loop of bars k, k+1 and the two segments u_k − u_k+1 + 2·Z_r·i_r,k = 0
// (Dᵀu + 2·Z_r·i_r = 0), Z_r = R_r + L_r·d/dt per segment. The sector closes the ring with the
// field's sign: bar N is bar 0 times s = −1 when antiperiodic.
//
// With ∂x/∂t ≈ rate·(x − x_h) (backward Euler or BDF2) the ring currents and then the bar
// voltages eliminate exactly: P·u = σ·rate·Cᵀ(x − x_h) + q, P = G + D·Dᵀ/(2Z), and the field
// equation K(x)·x + σ·rate·M·(x − x_h) − (σ/ℓ)·C·u = f takes the low-rank term
// B = C, M_lr = −(σ²·rate/ℓ)·P⁻¹ (negative definite: the whole stays positive definite, since
// the bars' mean-free eddy currents and the ring's impedance only add), w = (σ/ℓ)·P⁻¹(q −
// σ·rate·Cᵀx_h). The eddy term σ·rate·M itself goes into the sparse matrix (RegionModel).
#include <Eigen/Core>
#include <vector>

#include "cases/case.hpp"
#include "solver/assembly.hpp"
#include "solver/coupled_circuit.hpp"

namespace gapflux {

struct CageParameters {
  int bars = 0;               // in the modelled sector
  int bars_total = 0;         // in the machine
  bool antiperiodic = false;  // the sector's sign
  int sectors = 1;
  double conductivity_s_per_m = 0.0;  // bars, at the cage temperature
  double stack_length_m = 0.0;
  double ring_segment_resistance_ohm = 0.0;  // one segment of one ring
  double ring_segment_inductance_h = 0.0;
};

// The bar (of the sector) an element belongs to, −1 when none.
int bar_of_element(const ElementRecord& rec, const std::vector<int>& bar_of_region);

// Column k: c_k = ∫ N dS over bar k's triangles (with the DOF signs); `bar_of_region` gives each
// mesh region's bar number in the sector (−1: not a bar). Also the bars' meshed areas.
Eigen::MatrixXd bar_coupling(const Assembler& assembler, const std::vector<int>& bar_of_region,
                             int bars, std::vector<double>& bar_area_m2);

// The ring's incidence D (bars × segments): (D·i_r)_k = i_r,k − i_r,k−1, the segment before bar 0
// being the sector's last one with the sector's sign.
Eigen::MatrixXd cage_incidence(const CageParameters& cage);

class CageCircuit : public CoupledCircuit {
 public:
  CageCircuit(const CageParameters& cage, Eigen::MatrixXd coupling, std::vector<double> bar_area_m2,
              TimeScheme scheme);

  // The field and ring currents of the last steps, newest first (one or two): a start sets the
  // field the bars are switched on in, with ring currents of zero.
  void set_history(const std::vector<Eigen::VectorXd>& x_newest_first,
                   const std::vector<Eigen::VectorXd>& ring_current_newest_first);
  // The difference formula of the next step: ∂x/∂t ≈ rate·(x − x_h).
  double rate(double dt_s) const;
  const Eigen::VectorXd& eddy_history() const { return x_h_; }  // x_h, after prepare()
  const Eigen::VectorXd& newest_history() const { return x_history_.front(); }
  // Sets x_h for the next step (call before building the step's RegionModel).
  void prepare(double dt_s);

  LowRankTerm step_term(double t_s, double dt_s) const override;
  void finish_step(const LowRankTerm& term, const Eigen::VectorXd& x, double dt_s) override;

  struct StepResult {
    Eigen::VectorXd bar_current_a;   // per bar of the sector, along +z
    Eigen::VectorXd bar_voltage_v;   // u_k
    Eigen::VectorXd ring_current_a;  // per segment, front ring from bar k to bar k+1
  };
  const StepResult& last() const { return last_; }
  const CageParameters& parameters() const { return cage_; }
  const Eigen::MatrixXd& coupling() const { return c_; }
  // For the bar loss: x_h and the rate the last finished step used.
  const Eigen::VectorXd& last_history() const { return last_x_h_; }
  double last_rate() const { return last_rate_; }

 private:
  bool second_order_next() const;
  Eigen::MatrixXd incidence() const;  // D
  // P and q for the step (after prepare()).
  void loop_matrices(double dt_s, Eigen::MatrixXd& p, Eigen::VectorXd& q) const;

  CageParameters cage_;
  Eigen::MatrixXd c_;  // n × bars
  std::vector<double> area_m2_;
  TimeScheme scheme_;
  std::vector<Eigen::VectorXd> x_history_, ring_history_;  // newest first, at most two
  Eigen::VectorXd x_h_;
  Eigen::VectorXd last_x_h_;
  double last_rate_ = 0.0;
  StepResult last_;
};

// After a step: the bars' current density J = σ·(u_k/ℓ − rate·(A − A_h)) per assembler element
// at its centroid (A/m², 0 off the bars), and the bars' Joule loss ∫ J²/σ dS·ℓ over the sector's
// bars (W; quadrature of the element's own J, so skin and slot effects count).
struct BarFieldResult {
  std::vector<double> current_density_a_per_m2;
  double loss_w = 0.0;
};
BarFieldResult bar_field(const Assembler& assembler, const std::vector<int>& bar_of_region,
                         const Eigen::VectorXd& x, const CageCircuit& cage);

}  // namespace gapflux
