#pragma once
// The linear solve inside one Newton iteration, (J + B·M·Bᵀ)·δ = −r: with a fresh factor of J
// directly (Woodbury for the low-rank term), or with the factor of an earlier iterate's J as
// the preconditioner of conjugate gradients (inexact Newton). Private to newton.cpp.
#include <Eigen/Dense>

#include "solver/assembly.hpp"
#include "solver/newton.hpp"
#include "solver/sparse_cholesky.hpp"

namespace gapflux {

class NewtonStepSolver {
 public:
  NewtonStepSolver(const Assembler& assembler, SparseCholesky& cholesky,
                   const LowRankTerm* low_rank);

  // A factor of some earlier iterate's Jacobian is held on the assembler's pattern.
  bool has_factor() const { return has_factor_; }
  // Factorises the assembler's current Jacobian; on success, later solves use it.
  FactorResult refactor();
  // Takes the factor the Cholesky object already holds (an earlier solve's, on the same
  // pattern) as this solve's preconditioner. Returns false when it holds none.
  bool adopt_held_factor();
  // δ = (F + BMBᵀ)⁻¹·b with the factor F held: exact right after refactor().
  void apply_factor(const Eigen::VectorXd& b, Eigen::VectorXd& delta);
  // Conjugate gradients on the assembler's current (J + BMBᵀ)·δ = b from δ = 0, preconditioned
  // by the factor held, until ‖b − (J + BMBᵀ)δ‖ ≤ η‖b‖. Returns the iterations used, negated
  // when `budget` ran out (or the curvature test failed) first.
  int conjugate_gradients(const Eigen::VectorXd& b, double eta, int budget, Eigen::VectorXd& delta);

 private:
  void multiply(const Eigen::VectorXd& v, Eigen::VectorXd& out) const;
  void prepare_low_rank();  // Woodbury's F⁻¹B and capacitance for the factor held

  const Assembler& assembler_;
  SparseCholesky& cholesky_;
  const LowRankTerm* low_rank_;  // null or with columns
  bool has_factor_ = false;
  Eigen::MatrixXd y_;                              // F⁻¹B
  Eigen::FullPivLU<Eigen::MatrixXd> capacitance_;  // M⁻¹ + BᵀF⁻¹B
  Eigen::VectorXd r_, z_, p_, q_;
};

}  // namespace gapflux
