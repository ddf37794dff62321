#include "solver/newton.hpp"

#include "newton_step_solver.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>

namespace gapflux {
namespace {

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

std::string history_text(const NewtonReport& r) {
  std::string s;
  for (const NewtonIteration& it : r.history)
    s += fmt::format("\n  iteration {:2d}: residual {:.3e}, update {:.3e}, step {:.3g}",
                     it.iteration, it.relative_residual, it.relative_update, it.step);
  return s;
}

}  // namespace

std::vector<std::pair<std::size_t, double>> worst_elements(const Assembler& assembler,
                                                           const Eigen::VectorXd& x, int count) {
  std::vector<std::pair<std::size_t, double>> all;
  for (std::size_t e = 0; e < assembler.elements().size(); ++e) {
    const Vec2 b = flux_density_at(assembler.elements()[e].nodes, assembler.local_values(e, x),
                                   1.0 / 3.0, 1.0 / 3.0);
    all.emplace_back(e, b.norm());
  }
  const std::size_t n = std::min<std::size_t>(count, all.size());
  std::partial_sort(all.begin(), all.begin() + n, all.end(),
                    [](const auto& a, const auto& b) { return a.second > b.second; });
  all.resize(n);
  return all;
}

LowRankTerm stack_terms(const std::vector<const LowRankTerm*>& terms) {
  long n = 0, m = 0;
  for (const LowRankTerm* t : terms) {
    n = std::max(n, static_cast<long>(t->b.rows()));
    m += t->b.cols();
  }
  LowRankTerm out;
  out.b = Eigen::MatrixXd::Zero(n, m);
  out.m = Eigen::MatrixXd::Zero(m, m);
  out.m_inverse = Eigen::MatrixXd::Zero(m, m);
  out.w = Eigen::VectorXd::Zero(m);
  long at = 0;
  for (const LowRankTerm* t : terms) {
    const long k = t->b.cols();
    out.b.middleCols(at, k) = t->b;
    out.m.block(at, at, k, k) = t->m;
    out.m_inverse.block(at, at, k, k) = t->m_inverse;
    out.w.segment(at, k) = t->w;
    at += k;
  }
  return out;
}

NewtonReport solve_newton(Assembler& assembler, SparseCholesky& cholesky, const RegionModel& model,
                          const NewtonSettings& settings, Eigen::VectorXd& x,
                          const LowRankTerm* low_rank) {
  NewtonReport report;
  const int n = assembler.n_dofs();
  if (x.size() != n) x = Eigen::VectorXd::Zero(n);
  Eigen::VectorXd delta(n), trial(n), residual(n);
  // The residual at `at` after assembly there, the low-rank term included; returns the norm of
  // the load the term stands for.
  const auto total_residual = [&](const Eigen::VectorXd& at) {
    residual = assembler.residual();
    if (!low_rank) return 0.0;
    const Eigen::VectorXd coil_load = low_rank->b * low_rank->currents(at);
    residual -= coil_load;
    return coil_load.norm();
  };

  const auto t_analyse = std::chrono::steady_clock::now();
  report.analysed = cholesky.analyze(n, assembler.column_starts(), assembler.row_indices());
  report.analyse_s = seconds_since(t_analyse);

  double last_update = 1.0;
  NewtonStepSolver step_solver(assembler, cholesky, low_rank);
  int last_cg = 0;  // CG iterations the last step took on the factor held (0 after a new one)
  // An earlier solve on the same pattern (the same rotor position: a locked rotor's last step,
  // a voltage feed's start-up solves) left its factor: the first step tries CG on it first.
  bool first_on_held =
      !report.analysed && settings.cg_budget > 0 && step_solver.adopt_held_factor();
  for (int it = static_cast<int>(report.history.size());; ++it) {
    NewtonIteration record;
    record.iteration = it;
    auto t0 = std::chrono::steady_clock::now();
    assembler.assemble(x, model, true);
    const double coil_load = total_residual(x);
    record.assembly_s = seconds_since(t0);
    const double load = std::hypot(assembler.load_norm(), coil_load);
    const double reference = std::max(load, 1e-300);
    const double residual_norm = residual.norm();
    record.relative_residual = residual_norm / reference;
    report.relative_residual = record.relative_residual;
    // No load at all: A = 0 is the answer.
    if (load == 0.0 && residual_norm == 0.0) {
      report.converged = true;
      return report;
    }
    const bool converged = record.relative_residual < settings.residual_tolerance ||
                           (last_update < settings.update_tolerance &&
                            record.relative_residual < 100.0 * settings.residual_tolerance);
    if (converged) {
      report.converged = true;
      report.final_assembly_s = record.assembly_s;  // the assembly that showed convergence
      return report;
    }
    if (it >= settings.max_iterations) {
      report.history.push_back(record);
      throw NumericalError(fmt::format("Newton did not converge in {} iterations (relative "
                                       "residual {:.3e}, tolerance {:.1e}){}",
                                       settings.max_iterations, record.relative_residual,
                                       settings.residual_tolerance, history_text(report)),
                           report);
    }

    // A factor kept from an earlier iterate preconditions conjugate gradients on this one's
    // Jacobian (inexact Newton: the linear residual down to η·‖r‖); a new factor is made when
    // CG does not get there within its budget, or when the last step moved the field so far
    // (or CG needed so many iterations) that it would not. Near the solution J hardly changes,
    // and a few back-substitutions replace a factorisation.
    const Eigen::VectorXd rhs = -residual;
    bool solved = false;
    t0 = std::chrono::steady_clock::now();
    const bool worth_trying =
        (first_on_held || last_update < 3e-3) && 2 * last_cg <= settings.cg_budget;
    first_on_held = false;
    if (step_solver.has_factor() && settings.cg_budget > 0 && worth_trying) {
      // η ∝ ‖r‖ keeps the rate quadratic; never stricter than the tolerance needs.
      const double rho = record.relative_residual;
      const double eta =
          std::min(0.05, std::max(10.0 * rho, 0.1 * settings.residual_tolerance / rho));
      const int used = step_solver.conjugate_gradients(rhs, eta, settings.cg_budget, delta);
      record.cg_iterations = std::abs(used);
      report.cg_iterations += std::abs(used);
      solved = used > 0;
      last_cg = used;
    }
    record.solve_s = seconds_since(t0);
    if (!solved) {
      t0 = std::chrono::steady_clock::now();
      const FactorResult factor = step_solver.refactor();
      record.factorize_s = seconds_since(t0);
      record.factorized = true;
      ++report.factorizations;
      last_cg = 0;
      if (factor.status != FactorStatus::ok) {
        report.history.push_back(record);
        const std::string why =
            factor.status == FactorStatus::not_positive_definite
                ? fmt::format("the Jacobian is not positive definite (pivot {} of {})",
                              factor.bad_column, n)
            : factor.status == FactorStatus::ill_conditioned
                ? fmt::format(
                      "the matrix is singular (condition estimate {:.1e}): the field has "
                      "no fixed reference — is A = 0 applied anywhere?",
                      factor.rcond)
                : std::string("CHOLMOD failed to factorise the Jacobian");
        throw NumericalError(why + history_text(report), report);
      }
      t0 = std::chrono::steady_clock::now();
      step_solver.apply_factor(rhs, delta);
      record.solve_s += seconds_since(t0);
    }
    ++report.iterations;

    // Line search on the energy functional, which is convex along δ: its slope there is
    // g(α) = r(x + αδ)·δ, negative at α = 0. Bracket its zero, then find it by regula falsi
    // (Illinois variant) to within a tenth of |g(0)|; a full step that lands there is kept.
    double step = 1.0;
    const double g0 = residual.dot(delta);
    const auto slope = [&](double alpha) {
      trial = x + alpha * delta;
      const auto t_ls = std::chrono::steady_clock::now();
      assembler.assemble(trial, model, false);
      total_residual(trial);
      record.assembly_s += seconds_since(t_ls);
      return residual.dot(delta);
    };
    // Bracket the minimum: the step may also be too short (iron coming down from deep
    // saturation, where the tangent overestimates the curvature), so expand up to 8×.
    // Close to the solution the full Newton step is right (quadratic region): no search.
    const bool search = record.relative_residual > 1e-3;
    double a = 0.0, fa = g0, b = 1.0, fb = g0 < 0.0 && search ? slope(1.0) : 0.0;
    while (g0 < 0.0 && fb < 0.0 && b < 8.0) {
      a = b, fa = fb;
      b *= 2.0;
      fb = slope(b);
    }
    step = b;
    if (search && g0 < 0.0 && fb > 0.0 && std::abs(fb) > 0.1 * std::abs(g0)) {
      int side = 0;
      for (int h = 0; h < settings.max_halvings; ++h) {
        const double c = (a * fb - b * fa) / (fb - fa);
        const double fc = slope(c);
        step = c;
        if (std::abs(fc) <= 0.1 * std::abs(g0)) break;
        if (fc > 0.0) {
          b = c, fb = fc;
          if (side == -1) fa *= 0.5;
          side = -1;
        } else {
          a = c, fa = fc;
          if (side == +1) fb *= 0.5;
          side = +1;
        }
      }
    }
    x += step * delta;
    record.step = step;
    last_update = step * delta.norm() / std::max(x.norm(), 1e-300);
    record.relative_update = last_update;
    report.history.push_back(record);
  }
}

}  // namespace gapflux
