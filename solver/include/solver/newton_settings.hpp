#pragma once
// The case file's [solver] table as Newton's settings.
#include "cases/case.hpp"
#include "solver/newton.hpp"

namespace gapflux {

inline NewtonSettings newton_settings(const SolverSpec& spec) {
  NewtonSettings s;
  s.max_iterations = spec.max_iterations;
  s.residual_tolerance = spec.residual_tolerance;
  s.update_tolerance = spec.update_tolerance;
  s.cg_budget = spec.cg_budget;
  return s;
}

}  // namespace gapflux
