#include "sparse_lu.hpp"

#include <Eigen/UmfPackSupport>

#include "blas_threads.hpp"
#include "solver/newton.hpp"

namespace gapflux {

struct SparseLu::State {
  // UMFPACK's solve reads the matrix again (iterative refinement): it must outlive the factor.
  Eigen::SparseMatrix<std::complex<double>> matrix;
  Eigen::UmfPackLU<Eigen::SparseMatrix<std::complex<double>>> lu;
  Eigen::Index nonzeros = -1;
};

SparseLu::SparseLu() : state_(std::make_unique<State>()) {
  // No iterative refinement: it repeats every solve up to twice more with a residual in between,
  // which measured half of a time-harmonic study's time (perf: UMFPACK's solves and the
  // refinement's norms) for changes far below the effective-reluctivity iteration's tolerance.
  state_->lu.umfpackControl()(UMFPACK_IRSTEP) = 0;
}
SparseLu::~SparseLu() = default;

void SparseLu::factorize(Eigen::SparseMatrix<std::complex<double>> a) {
  state_->matrix = std::move(a);
  if (state_->matrix.nonZeros() != state_->nonzeros) {
    state_->lu.analyzePattern(state_->matrix);
    state_->nonzeros = state_->matrix.nonZeros();
  }
  {
    const SerialBlas serial;
    state_->lu.factorize(state_->matrix);
  }
  if (state_->lu.info() != Eigen::Success)
    throw NumericalError("UMFPACK could not factorise the time-harmonic system (singular?)", {});
}

Eigen::MatrixXcd SparseLu::solve(const Eigen::MatrixXcd& b) const {
  const SerialBlas serial;
  Eigen::MatrixXcd x = state_->lu.solve(b);
  if (state_->lu.info() != Eigen::Success)
    throw NumericalError("UMFPACK's solve of the time-harmonic system failed", {});
  return x;
}

}  // namespace gapflux
