// The cage with induced currents: the bars' eddy term against Field's skin-effect factors, and
// the cage circuit's ring currents against classical cage theory; the same bar as phasors.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <numbers>

#include "materials/library.hpp"
#include "solver/cage_circuit.hpp"
#include "solver/harmonic_field.hpp"
#include "solver/newton.hpp"
#include "solver/sparse_cholesky.hpp"

using namespace gapflux;

namespace {

constexpr double pi = std::numbers::pi;

// A rectangular bar b wide and h deep filling an open slot of ideal iron: structured P2
// triangles over [0, b] × [0, h]; the iron walls and bottom are natural boundaries (no
// tangential H), the top y = h carries A = 0 (the reference).
std::vector<ElementRecord> slot_bar(double b, double h, int nx, int ny, int& n_dofs) {
  const int cols = 2 * nx + 1, rows = 2 * ny + 1;
  std::vector<int> dof(cols * rows, -1);
  n_dofs = 0;
  for (int j = 0; j < rows - 1; ++j)  // the top row stays −1 (A = 0)
    for (int i = 0; i < cols; ++i) dof[j * cols + i] = n_dofs++;
  const auto at = [&](int i, int j) { return Vec2(b * i / (cols - 1), h * j / (rows - 1)); };
  std::vector<ElementRecord> out;
  const auto add = [&](std::array<std::pair<int, int>, 6> n) {
    ElementRecord r;
    r.nodes.order = 2;
    r.region = 0;
    for (int k = 0; k < 6; ++k) {
      r.nodes.x[k] = at(n[k].first, n[k].second);
      r.dof[k] = dof[n[k].second * cols + n[k].first];
      r.sign[k] = 1.0;
    }
    out.push_back(r);
  };
  for (int j = 0; j < ny; ++j)
    for (int i = 0; i < nx; ++i) {
      const int x0 = 2 * i, y0 = 2 * j;
      // Two counter-clockwise triangles per cell: vertices, then mid-edge nodes 0–1, 1–2, 2–0.
      add({{{x0, y0},
            {x0 + 2, y0},
            {x0 + 2, y0 + 2},
            {x0 + 1, y0},
            {x0 + 2, y0 + 1},
            {x0 + 1, y0 + 1}}});
      add({{{x0, y0},
            {x0 + 2, y0 + 2},
            {x0, y0 + 2},
            {x0 + 1, y0 + 1},
            {x0 + 1, y0 + 2},
            {x0, y0 + 1}}});
    }
  return out;
}

}  // namespace

TEST_CASE("a deep bar's AC resistance and reactance follow Field's factors", "[solver][cage]") {
  // Field (1905), for a rectangular bar of depth h in a slot of ideal iron, ξ = h·√(ωμ0σ/2):
  //   k_R = R_ac/R_dc = ξ·(sinh 2ξ + sin 2ξ)/(cosh 2ξ − cos 2ξ),
  //   k_X = X_ac/X_dc = (3/(2ξ))·(sinh 2ξ − sin 2ξ)/(cosh 2ξ − cos 2ξ),
  // R_dc = ℓ/(σ·b·h), X_dc = ω·μ0·ℓ·h/(3b) (the slot's internal flux). The FE bar carries an
  // imposed sinusoidal current i(t) = Î·cos ωt and the impedance is the voltage across it over
  // the current, fundamental phasors over the last of three periods. Tolerance 2 %: the issue's;
  // measured errors are far below it (P2 elements of a tenth of the skin depth or less, BDF2 at
  // 240 steps per period: (ωΔt)²/3 ≈ 2e-4).
  const double b = 0.006, h = 0.03, sigma = 3.0e7, ell = 1.0, f = 50.0, omega = 2 * pi * f;
  int n_dofs = 0;
  std::vector<ElementRecord> elements = slot_bar(b, h, 2, 60, n_dofs);
  Assembler assembler(std::move(elements), n_dofs);
  Material conductor;
  conductor.name = "bar";
  conductor.relative_permeability = 1.0;
  RegionModel model;
  model.material = {&conductor};
  model.source = {ElementSource{}};
  model.eddy_s_per_m = {sigma};
  std::vector<double> area;
  const Eigen::MatrixXd c = bar_coupling(assembler, {0}, 1, area);
  REQUIRE(area[0] == Approx(b * h).epsilon(1e-12));
  NewtonSettings settings;
  settings.cg_budget = 0;
  for (double xi : {0.5, 1.0, 2.0, 3.0}) {
    // The frequency that gives ξ with this σ and h: σ' = 2ξ²/(ωμ0h²).
    const double s = 2.0 * xi * xi / (omega * mu0 * h * h);
    model.eddy_s_per_m = {s};
    const int steps = 240;
    const double dt = 1.0 / (f * steps), amplitude = 1000.0;
    std::vector<Eigen::VectorXd> history{Eigen::VectorXd::Zero(n_dofs)};
    SparseCholesky cholesky;
    Eigen::VectorXd x = Eigen::VectorXd::Zero(n_dofs);
    std::complex<double> u_phasor = 0.0, i_phasor = 0.0;
    for (int n = 0; n < 3 * steps; ++n) {
      const double t = (n + 1) * dt, i = amplitude * std::cos(omega * t);
      // BDF2 after the first step: ∂x/∂t ≈ rate·(x − x_h).
      const bool second = history.size() >= 2;
      const double rate = (second ? 1.5 : 1.0) / dt;
      const Eigen::VectorXd x_h =
          second ? Eigen::VectorXd((2.0 * history[0] - 0.5 * history[1]) / 1.5) : history[0];
      model.eddy_rate = rate;
      model.eddy_history = &x_h;
      // The imposed current eliminates the bar voltage: i = (σS/ℓ)·u − σ·rate·cᵀ(x − x_h).
      LowRankTerm term;
      term.b = c;
      term.m = Eigen::MatrixXd::Constant(1, 1, -s * rate / (b * h));
      term.m_inverse = Eigen::MatrixXd::Constant(1, 1, -(b * h) / (s * rate));
      term.w = Eigen::VectorXd::Constant(1, (i - s * rate * c.col(0).dot(x_h)) / (b * h));
      solve_newton(assembler, cholesky, model, settings, x, &term);
      const double u = ell / (s * b * h) * (i + s * rate * c.col(0).dot(x - x_h));
      history.insert(history.begin(), x);
      if (history.size() > 2) history.pop_back();
      if (n >= 2 * steps) {
        const std::complex<double> turn = std::polar(1.0, -omega * t);
        u_phasor += u * turn;
        i_phasor += i * turn;
      }
    }
    const std::complex<double> z = u_phasor / i_phasor;
    const double r_dc = ell / (s * b * h), x_dc = omega * mu0 * ell * h / (3.0 * b);
    const double k_r =
        xi * (std::sinh(2 * xi) + std::sin(2 * xi)) / (std::cosh(2 * xi) - std::cos(2 * xi));
    const double k_x =
        1.5 / xi * (std::sinh(2 * xi) - std::sin(2 * xi)) / (std::cosh(2 * xi) - std::cos(2 * xi));
    INFO("ξ = " << xi << ": k_R " << z.real() / r_dc << " vs " << k_r << ", k_X " << z.imag() / x_dc
                << " vs " << k_x);
    CHECK(z.real() / r_dc == Approx(k_r).epsilon(0.02));
    CHECK(z.imag() / x_dc == Approx(k_x).epsilon(0.02));
  }
}

TEST_CASE("time-harmonic: a deep bar's impedance follows Field's factors", "[solver][harmonic]") {
  // The same bar and the same factors (Field 1905) as above, now as phasors: the complex system
  // (K + jωσM)·x̂ = (σ/ℓ)·c·û gives the bar's admittance i/u = G − jωσ²/ℓ·cᵀ(K + jωσM)⁻¹c. No
  // time discretisation error remains, only the mesh's (P2, elements h/60, a tenth of the skin
  // depth or less), measured 1e-5 and below: tolerance 0.1 %.
  const double b = 0.006, h = 0.03, ell = 1.0, f = 50.0, omega = 2 * pi * f;
  int n_dofs = 0;
  std::vector<ElementRecord> elements = slot_bar(b, h, 2, 60, n_dofs);
  Assembler assembler(std::move(elements), n_dofs);
  Material conductor;
  conductor.name = "bar";
  conductor.relative_permeability = 1.0;
  RegionModel model;
  model.material = {&conductor};
  model.source = {ElementSource{}};
  std::vector<double> area;
  const Eigen::MatrixXcd c = bar_coupling(assembler, {0}, 1, area).cast<std::complex<double>>();
  const std::vector<double> nu(assembler.elements().size(), 1.0 / mu0);
  for (double xi : {0.5, 1.0, 2.0, 3.0}) {
    const double sigma = 2.0 * xi * xi / (omega * mu0 * h * h);
    model.eddy_s_per_m = {sigma};
    HarmonicOperator op(assembler, model);
    op.factorize(nu, omega);
    const std::complex<double> cy = (c.transpose() * op.solve(c))(0, 0);
    const std::complex<double> admittance =
        sigma * area[0] / ell - std::complex<double>(0.0, omega) * sigma * sigma / ell * cy;
    const std::complex<double> z = 1.0 / admittance;
    const double r_dc = ell / (sigma * b * h), x_dc = omega * mu0 * ell * h / (3.0 * b);
    const double k_r =
        xi * (std::sinh(2 * xi) + std::sin(2 * xi)) / (std::cosh(2 * xi) - std::cos(2 * xi));
    const double k_x =
        1.5 / xi * (std::sinh(2 * xi) - std::sin(2 * xi)) / (std::cosh(2 * xi) - std::cos(2 * xi));
    INFO("ξ = " << xi << ": k_R " << z.real() / r_dc << " vs " << k_r << ", k_X " << z.imag() / x_dc
                << " vs " << k_x);
    CHECK(z.real() / r_dc == Approx(k_r).epsilon(0.001));
    CHECK(z.imag() / x_dc == Approx(k_x).epsilon(0.001));
  }
}

TEST_CASE("a balanced bar set: ring segment current = bar current / (2·sin(πp/N))",
          "[solver][cage]") {
  // Classical cage theory (e.g. Pyrhönen, Jokinen, Hrabovcová, Design of Rotating Electrical
  // Machines, ch. 7, from memory): bar currents forming a p-pole-pair wave over N bars drive ring
  // currents 1/(2·sin(πp/N)) as large, phase-shifted by 90° − πp/N. Here the field's induced
  // voltage on bar k is imposed as a wave (the coupling of bar k is a unit vector on DOF k, and
  // the field's change σ·rate·cᵀ(x − x_h) is that wave), for a whole cage of 28 bars and for its
  // quarter with the antiperiodic sign (p = 2: a quarter is one pole pitch). Tolerance 1e-6:
  // round-off; the relation is exact for a sinusoidal set.
  for (const int sectors : {1, 4}) {
    const int total = 28, p = 2, n = total / sectors;
    CageParameters cage;
    cage.bars = n;
    cage.bars_total = total;
    cage.sectors = sectors;
    cage.antiperiodic = sectors == 4;
    cage.conductivity_s_per_m = 3.0e7;
    cage.stack_length_m = 0.15;
    cage.ring_segment_resistance_ohm = 2e-6;
    cage.ring_segment_inductance_h = 0.0;
    const Eigen::MatrixXd coupling = Eigen::MatrixXd::Identity(n, n);
    CageCircuit circuit(cage, coupling, std::vector<double>(n, 6e-5), TimeScheme::backward_euler);
    const double dt = 1e-4;
    const double phi = 0.3;
    Eigen::VectorXd wave(n);
    for (int k = 0; k < n; ++k) wave[k] = std::cos(2 * pi * p * (k + 0.5) / total + phi);
    // x − x_h = wave/(σ·rate) makes the induced term exactly the wave.
    const double rate = 1.0 / dt;
    circuit.set_history({Eigen::VectorXd::Zero(n)}, {});
    circuit.prepare(dt);
    const LowRankTerm term = circuit.step_term(0.0, dt);
    const Eigen::VectorXd x = wave / (cage.conductivity_s_per_m * rate);
    circuit.finish_step(term, x, dt);
    const Eigen::VectorXd& bar = circuit.last().bar_current_a;
    const Eigen::VectorXd& ring = circuit.last().ring_current_a;
    // Amplitudes by a least-squares fit of a·cos + b·sin at the bar and segment angles.
    const auto amplitude = [&](const Eigen::VectorXd& v, double offset) {
      Eigen::MatrixXd a(n, 2);
      for (int k = 0; k < n; ++k) {
        const double angle = 2 * pi * p * (k + offset) / total;
        a(k, 0) = std::cos(angle), a(k, 1) = std::sin(angle);
      }
      const Eigen::Vector2d ab = (a.transpose() * a).ldlt().solve(a.transpose() * v);
      CHECK((a * ab - v).norm() < 1e-9 * v.norm());  // a pure wave
      return ab.norm();
    };
    // Segment k lies between bars k and k+1, at angle (k + 1)·2π/N.
    const double ratio = amplitude(ring, 1.0) / amplitude(bar, 0.5);
    INFO(sectors << " sector(s): ring/bar " << ratio);
    CHECK(ratio == Approx(1.0 / (2.0 * std::sin(pi * p / total))).epsilon(1e-6));
    // Kirchhoff's current law at every bar end.
    for (int k = 1; k < n; ++k) CHECK(bar[k] == Approx(ring[k] - ring[k - 1]).margin(1e-9));
  }
}
