#pragma once
// A circuit coupled to the field: the stator winding when voltage-fed (circuit.hpp), the rotor
// cage with induced bar currents (cage_circuit.hpp). Each describes its own branches and how
// they meet; at every time step it eliminates its unknowns into a low-rank term of the Newton
// system (newton.hpp: B·(M·Bᵀx − w)), so the field's sparse matrix stays symmetric positive
// definite and one CHOLMOD factor, its reuse and the conjugate-gradient steps on a held factor
// serve any number of circuits at once (stack_terms). After the solve each circuit reads its
// branch quantities from the field and moves its history on.
#include <Eigen/Core>

#include "solver/newton.hpp"

namespace gapflux {

class CoupledCircuit {
 public:
  virtual ~CoupledCircuit() = default;
  // The eliminated circuit equations of the step ending at t_s.
  virtual LowRankTerm step_term(double t_s, double dt_s) const = 0;
  // The field x solved with `term`: the step's branch quantities; the step enters the history.
  virtual void finish_step(const LowRankTerm& term, const Eigen::VectorXd& x, double dt_s) = 0;
};

}  // namespace gapflux
