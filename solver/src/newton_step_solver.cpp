#include "newton_step_solver.hpp"

namespace gapflux {

NewtonStepSolver::NewtonStepSolver(const Assembler& assembler, SparseCholesky& cholesky,
                                   const LowRankTerm* low_rank)
    : assembler_(assembler),
      cholesky_(cholesky),
      low_rank_(low_rank && low_rank->b.cols() > 0 ? low_rank : nullptr) {}

FactorResult NewtonStepSolver::refactor() {
  const FactorResult result = cholesky_.factorize(assembler_.values());
  has_factor_ = result.status == FactorStatus::ok;
  if (has_factor_) prepare_low_rank();
  return result;
}

bool NewtonStepSolver::adopt_held_factor() {
  has_factor_ = cholesky_.has_factor();
  if (has_factor_) prepare_low_rank();
  return has_factor_;
}

void NewtonStepSolver::prepare_low_rank() {
  if (!low_rank_) return;
  const Eigen::MatrixXd& b = low_rank_->b;
  const long m = b.cols();
  y_.resize(b.rows(), m);
  for (long k = 0; k < m; ++k) cholesky_.solve(b.col(k).data(), y_.col(k).data());
  // Symmetric but indefinite when a winding's term (M > 0) and a cage's (M < 0) are stacked:
  // a full-pivoting LU of this small matrix. (Not PartialPivLU<MatrixXd>: libgmsh exports its
  // own, and an instantiation here would be interposed with it — a mismatched allocator.)
  capacitance_.compute(low_rank_->m_inverse + b.transpose() * y_);
}

void NewtonStepSolver::apply_factor(const Eigen::VectorXd& b, Eigen::VectorXd& delta) {
  delta.resize(b.size());
  cholesky_.solve(b.data(), delta.data());
  if (low_rank_) delta -= y_ * capacitance_.solve(low_rank_->b.transpose() * delta);
}

void NewtonStepSolver::multiply(const Eigen::VectorXd& v, Eigen::VectorXd& out) const {
  // The assembler keeps the lower triangle in compressed columns.
  const auto& col = assembler_.column_starts();
  const auto& row = assembler_.row_indices();
  const auto& val = assembler_.values();
  out.setZero(v.size());
  for (long j = 0; j + 1 < static_cast<long>(col.size()); ++j) {
    double upper = 0.0;
    for (int p = col[j]; p < col[j + 1]; ++p) {
      const int i = row[p];
      out[i] += val[p] * v[j];
      if (i != j) upper += val[p] * v[i];
    }
    out[j] += upper;
  }
  if (low_rank_) out += low_rank_->b * (low_rank_->m * (low_rank_->b.transpose() * v));
}

int NewtonStepSolver::conjugate_gradients(const Eigen::VectorXd& b, double eta, int budget,
                                          Eigen::VectorXd& delta) {
  delta.setZero(b.size());
  r_ = b;
  const double target = eta * b.norm();
  apply_factor(r_, z_);
  p_ = z_;
  double rz = r_.dot(z_);
  for (int k = 1; k <= budget; ++k) {
    multiply(p_, q_);
    const double curvature = p_.dot(q_);
    if (!(curvature > 0.0)) return -k;
    const double alpha = rz / curvature;
    delta += alpha * p_;
    r_ -= alpha * q_;
    if (r_.norm() <= target) return k;
    apply_factor(r_, z_);
    const double rz_next = r_.dot(z_);
    p_ = z_ + (rz_next / rz) * p_;
    rz = rz_next;
  }
  return -budget;
}

}  // namespace gapflux
