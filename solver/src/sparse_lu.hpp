#pragma once
// A sparse LU factorisation of a complex (not Hermitian) matrix, by UMFPACK through Eigen's
// wrapper; the only file that sees UMFPACK is sparse_lu.cpp. The symbolic analysis is made on the
// first factorisation and kept while the pattern's size does not change.
#include <Eigen/Core>
#include <Eigen/SparseCore>
#include <complex>
#include <memory>

namespace gapflux {

class SparseLu {
 public:
  SparseLu();
  ~SparseLu();
  SparseLu(const SparseLu&) = delete;
  SparseLu& operator=(const SparseLu&) = delete;

  // Throws NumericalError when the matrix is singular.
  void factorize(Eigen::SparseMatrix<std::complex<double>> a);
  Eigen::MatrixXcd solve(const Eigen::MatrixXcd& b) const;

 private:
  struct State;
  std::unique_ptr<State> state_;
};

}  // namespace gapflux
