#pragma once
// Newton–Raphson for the nonlinear magnetostatic system with the exact Jacobian, a
// backtracking line search on the residual norm, and warm starts. Convergence: relative residual
// ‖r‖/‖f‖ (f = load vector) below residual_tolerance, or relative update ‖δ‖/‖x‖ below
// update_tolerance with the residual below 100× its tolerance.
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
};

struct NewtonIteration {
  int iteration = 0;
  double relative_residual = 0.0;  // at the start of the iteration
  double relative_update = 0.0;    // of the step taken
  double step = 1.0;               // line-search factor
  double assembly_s = 0.0, factorize_s = 0.0, solve_s = 0.0;
};

struct NewtonReport {
  bool converged = false;
  int iterations = 0;  // linear solves made
  double relative_residual = 0.0;
  std::vector<NewtonIteration> history;
  bool analysed = false;  // a new symbolic analysis was made
  double analyse_s = 0.0;
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
// non-positive pivot, a singular matrix or no convergence.
NewtonReport solve_newton(Assembler& assembler, SparseCholesky& cholesky, const RegionModel& model,
                          const NewtonSettings& settings, Eigen::VectorXd& x);

// Elements with the largest |B| at the centroid, for diagnostics.
std::vector<std::pair<std::size_t, double>> worst_elements(const Assembler& assembler,
                                                           const Eigen::VectorXd& x, int count);

}  // namespace gapflux
