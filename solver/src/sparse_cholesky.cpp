#include "solver/sparse_cholesky.hpp"

#include <cholmod.h>

#include <algorithm>
#include <cstring>
#include <stdexcept>

#include "blas_threads.hpp"

namespace gapflux {

struct SparseCholesky::State {
  cholmod_common common;
  cholmod_sparse* matrix = nullptr;  // the pattern only; factorize() lends it the values
  cholmod_factor* factor = nullptr;
  State() {
    cholmod_start(&common);
    common.supernodal = CHOLMOD_SUPERNODAL;
    common.print = 0;
    common.quick_return_if_not_posdef = 1;
  }
  ~State() {
    if (factor) cholmod_free_factor(&factor, &common);
    if (matrix) cholmod_free_sparse(&matrix, &common);
    cholmod_finish(&common);
  }
};

SparseCholesky::SparseCholesky() : state_(std::make_unique<State>()) {}
SparseCholesky::~SparseCholesky() = default;

bool SparseCholesky::analyze(int n, const std::vector<int>& column_starts,
                             const std::vector<int>& row_indices) {
  State& s = *state_;
  const std::size_t nnz = row_indices.size();
  if (s.matrix && static_cast<int>(s.matrix->nrow) == n && s.matrix->nzmax == nnz &&
      std::equal(column_starts.begin(), column_starts.end(), static_cast<int*>(s.matrix->p)) &&
      std::equal(row_indices.begin(), row_indices.end(), static_cast<int*>(s.matrix->i)))
    return false;
  has_factor_ = false;
  if (s.factor) cholmod_free_factor(&s.factor, &s.common);
  if (s.matrix) cholmod_free_sparse(&s.matrix, &s.common);
  // stype −1: the lower triangle holds the symmetric matrix. Pattern only: the values are the
  // caller's, lent at each factorisation (no copy of them is kept).
  s.matrix = cholmod_allocate_sparse(n, n, nnz, 1, 1, -1, CHOLMOD_PATTERN, &s.common);
  if (!s.matrix) throw std::runtime_error("CHOLMOD could not allocate the matrix");
  std::memcpy(s.matrix->p, column_starts.data(), sizeof(int) * (n + 1));
  std::memcpy(s.matrix->i, row_indices.data(), sizeof(int) * nnz);
  // Orderings measured on the demo's meshes (docs/performance.md): nested dissection (METIS)
  // fills 15–17 % less than AMD and needs 40 % fewer flops, but computing it costs about 2 s at
  // 280 k unknowns: a static run there peaks 7 % lower and takes 4–9 % longer. A rotor step,
  // which needs a new analysis each time, loses (given the first step's ordering again, the
  // fill grows as the rotor turns: the band's connections move).
  s.common.nmethods = 1;
  s.common.method[0].ordering =
      ordering_ == Ordering::nested_dissection ? CHOLMOD_METIS : CHOLMOD_AMD;
  s.factor = cholmod_analyze(s.matrix, &s.common);
  if (!s.factor) throw std::runtime_error("CHOLMOD's symbolic analysis failed");
  ++analyses_;
  return true;
}

FactorResult SparseCholesky::factorize(const std::vector<double>& values) {
  State& s = *state_;
  // The pattern with the caller's values: CHOLMOD only reads them.
  cholmod_sparse a = *s.matrix;
  a.x = const_cast<double*>(values.data());
  a.xtype = CHOLMOD_REAL;
  FactorResult r;
  has_factor_ = false;
  {
    const SerialBlas serial;
    cholmod_factorize(&a, s.factor, &s.common);
  }
  if (s.common.status == CHOLMOD_NOT_POSDEF) {
    r.status = FactorStatus::not_positive_definite;
    r.bad_column = static_cast<int>(s.factor->minor);
    return r;
  }
  if (s.common.status < CHOLMOD_OK) {
    r.status = FactorStatus::failed;
    return r;
  }
  r.rcond = cholmod_rcond(s.factor, &s.common);
  // A matrix that is singular in exact arithmetic (a floating potential) factors with a pivot
  // at rounding level: its condition estimate falls to the order of machine epsilon.
  if (!(r.rcond > 1e-14)) r.status = FactorStatus::ill_conditioned;
  has_factor_ = r.status == FactorStatus::ok;
  return r;
}

void SparseCholesky::solve(const double* b, double* x) const {
  State& s = *state_;
  const int n = static_cast<int>(s.matrix->nrow);
  cholmod_dense* rhs = cholmod_allocate_dense(n, 1, n, CHOLMOD_REAL, &s.common);
  std::memcpy(rhs->x, b, sizeof(double) * n);
  cholmod_dense* sol = nullptr;
  {
    const SerialBlas serial;
    sol = cholmod_solve(CHOLMOD_A, s.factor, rhs, &s.common);
  }
  std::memcpy(x, sol->x, sizeof(double) * n);
  cholmod_free_dense(&sol, &s.common);
  cholmod_free_dense(&rhs, &s.common);
}

void SparseCholesky::release() {
  State& s = *state_;
  if (s.factor) cholmod_free_factor(&s.factor, &s.common);
  if (s.matrix) cholmod_free_sparse(&s.matrix, &s.common);
  has_factor_ = false;
}

std::size_t SparseCholesky::factor_nonzeros() const {
  const cholmod_factor* f = state_->factor;
  if (!f) return 0;
  if (f->is_super) {
    std::size_t total = 0;
    const int* super = static_cast<const int*>(f->super);
    const int* pi = static_cast<const int*>(f->pi);
    for (std::size_t k = 0; k < f->nsuper; ++k)
      total += static_cast<std::size_t>(super[k + 1] - super[k]) * (pi[k + 1] - pi[k]);
    return total;
  }
  return static_cast<std::size_t>(static_cast<const int*>(f->p)[f->n]);
}

}  // namespace gapflux
