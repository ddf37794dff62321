#pragma once
// Newton–Raphson for the nonlinear magnetostatic system with the exact Jacobian, a line search
// on the energy, and warm starts; the Newton step is solved with a new CHOLMOD factor or, when
// the Jacobian has changed little, by conjugate gradients on an earlier iterate's factor.
// Convergence: relative residual ‖r‖/‖f‖ (f = load vector) below residual_tolerance, or relative
// update ‖δ‖/‖x‖ below update_tolerance with the residual below 100× its tolerance.
#include <Eigen/Core>
#include <stdexcept>
#include <string>
#include <vector>

#include "solver/assembly.hpp"
#include "solver/sparse_cholesky.hpp"

namespace gapflux {

struct NewtonSettings {
  int max_iterations = 30;
  double residual_tolerance = 1e-8;
  double update_tolerance = 1e-8;
  int max_halvings = 10;
  // Conjugate-gradient iterations allowed on an earlier iterate's factor before a new
  // factorisation is made; 0: a new factor in every iteration (plain Newton).
  int cg_budget = 20;
};

// A term B·(M·Bᵀx − w) added to the residual and B·M·Bᵀ to the Jacobian, with M symmetric and
// invertible and B of few columns: how the eliminated unknowns of the circuits coupled to the
// field enter it (coupled_circuit.hpp). A stranded winding's M is positive definite; a solid
// conductor's (the cage) negative definite — the Jacobian with every term stays symmetric
// positive definite, as the physics requires. The step solves with the factor of J by the
// Woodbury identity: (J + BMBᵀ)⁻¹r = J⁻¹r − Y·(M⁻¹ + BᵀY)⁻¹·BᵀJ⁻¹r, Y = J⁻¹B.
struct LowRankTerm {
  Eigen::MatrixXd b;          // n × m
  Eigen::MatrixXd m;          // m × m
  Eigen::MatrixXd m_inverse;  // m × m, given by the circuit (it knows it without a solve)
  Eigen::VectorXd w;          // m
  // What the term stands for at x (a winding's loop currents, a cage's scaled bar voltages):
  // w − M·Bᵀx.
  Eigen::VectorXd currents(const Eigen::VectorXd& x) const { return w - m * (b.transpose() * x); }
};

// The terms of several circuits as one: B side by side, M and M⁻¹ block-diagonal, w stacked.
// Each circuit's part of `currents` is the block at its column offset (in the order given).
LowRankTerm stack_terms(const std::vector<const LowRankTerm*>& terms);

struct NewtonIteration {
  int iteration = 0;
  double relative_residual = 0.0;  // at the start of the iteration
  double relative_update = 0.0;    // of the step taken
  double step = 1.0;               // line-search factor
  double assembly_s = 0.0, factorize_s = 0.0, solve_s = 0.0;
  bool factorized = false;  // a new factor of this iterate's Jacobian was made
  int cg_iterations = 0;    // on an earlier factor (also when they fell short and it refactorised)
};

struct NewtonReport {
  bool converged = false;
  int iterations = 0;      // Newton iterations (linearisations solved)
  int factorizations = 0;  // of them with a new factor; the others by CG on an earlier one
  int cg_iterations = 0;
  double relative_residual = 0.0;
  std::vector<NewtonIteration> history;
  bool analysed = false;  // a new symbolic analysis was made
  double analyse_s = 0.0;
  // The last assembly, which found the residual converged: part of the solve's cost, though no
  // iteration follows it.
  double final_assembly_s = 0.0;

  // The relative residual at the start of each iteration and, when converged, the converged
  // value that ended it (a failed solve's history already ends with its last iterate).
  std::vector<double> residuals() const {
    std::vector<double> out;
    for (const NewtonIteration& it : history) out.push_back(it.relative_residual);
    if (converged) out.push_back(relative_residual);
    return out;
  }
};

// Numerical failure: the report and a diagnostic travel with it; the caller saves what exists.
class NumericalError : public std::runtime_error {
 public:
  NumericalError(const std::string& what, NewtonReport report)
      : std::runtime_error(what), report_(std::move(report)) {}
  const NewtonReport& report() const { return report_; }

 private:
  NewtonReport report_;
};

// Solves starting from x (warm start); leaves the last iterate in x. Throws NumericalError on a
// non-positive pivot, a singular matrix or no convergence. A factor `cholesky` still holds from
// an earlier solve on the same pattern preconditions the first step (CG) before a new one is made.
// With `low_rank`, its term joins the residual and the Jacobian, and the coil load B·i it stands
// for joins the reference of the relative residual.
NewtonReport solve_newton(Assembler& assembler, SparseCholesky& cholesky, const RegionModel& model,
                          const NewtonSettings& settings, Eigen::VectorXd& x,
                          const LowRankTerm* low_rank = nullptr);

// Elements with the largest |B| at the centroid, for diagnostics.
std::vector<std::pair<std::size_t, double>> worst_elements(const Assembler& assembler,
                                                           const Eigen::VectorXd& x, int count);

}  // namespace gapflux
