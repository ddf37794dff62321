#pragma once
// Sparse symmetric positive-definite factorisation through CHOLMOD's supernodal LLᵀ (the only
// file that sees CHOLMOD is sparse_cholesky.cpp). The symbolic analysis is done once per
// sparsity pattern and reused by every numeric factorisation on it. Status is a value.
#include <memory>
#include <vector>

namespace gapflux {

enum class FactorStatus { ok, not_positive_definite, ill_conditioned, failed };

enum class Ordering { minimum_degree, nested_dissection };

struct FactorResult {
  FactorStatus status = FactorStatus::ok;
  int bad_column = -1;  // first column where a pivot was not positive
  double rcond = 0.0;   // CHOLMOD's reciprocal condition estimate of the factor
};

class SparseCholesky {
 public:
  SparseCholesky();
  ~SparseCholesky();
  SparseCholesky(const SparseCholesky&) = delete;
  SparseCholesky& operator=(const SparseCholesky&) = delete;

  // Lower triangle in compressed columns. Re-analyses only if the pattern differs from the last.
  // Returns true when a new analysis was made.
  bool analyze(int n, const std::vector<int>& column_starts, const std::vector<int>& row_indices);
  FactorResult factorize(const std::vector<double>& values);
  // A factor from a successful factorize() on the current pattern is held.
  bool has_factor() const { return has_factor_; }
  // x = A⁻¹ b with the last factor.
  void solve(const double* b, double* x) const;
  // Frees the factor and the analysis (the next analyze() starts afresh): a run that has no
  // further use for them gives their memory, the largest of a solve, to its output.
  void release();
  // The fill-reducing ordering of the next analyses (sparse_cholesky.cpp has the figures):
  // minimum degree by default, nested dissection for a system solved at one pattern only.
  void set_ordering(Ordering o) { ordering_ = o; }
  int analyses() const { return analyses_; }
  std::size_t factor_nonzeros() const;

 private:
  struct State;
  std::unique_ptr<State> state_;
  int analyses_ = 0;
  bool has_factor_ = false;
  Ordering ordering_ = Ordering::minimum_degree;
};

}  // namespace gapflux
