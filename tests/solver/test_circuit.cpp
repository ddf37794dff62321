// Voltage-fed windings: connections, the eliminated loop equations, the coupled Newton solve and
// the periodic start, against Kirchhoff's laws and the circuit equations of design.md §3.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <complex>
#include <numbers>

#include "geometry/mesh.hpp"
#include "solver/circuit.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver_fixtures.hpp"

using namespace gapflux;

namespace {

constexpr double pi = std::numbers::pi;

SupplySpec voltage_supply(VoltageBasis basis, Connection connection,
                          std::array<std::pair<double, double>, 3> rms_angle_deg) {
  SupplySpec s;
  s.feed = Feed::voltage;
  s.voltage_basis = basis;
  s.connection = connection;
  s.frequency_hz = 50.0;
  for (int k = 0; k < 3; ++k)
    s.phases[k] = {rms_angle_deg[k].first, rms_angle_deg[k].second * pi / 180.0};
  return s;
}

}  // namespace

TEST_CASE("line-to-line and phase voltages obey Kirchhoff's voltage law", "[solver][circuit]") {
  // An unbalanced line-to-line set that closes (u_ab + u_bc + u_ca = 0): its third phasor is
  // minus the sum of the first two.
  const std::complex<double> ab = std::polar(410.0, 0.52), bc = std::polar(395.0, -1.61);
  const std::complex<double> ca = -(ab + bc);
  const SupplySpec s = voltage_supply(VoltageBasis::line_to_line, Connection::star,
                                      {{{std::abs(ab), std::arg(ab) * 180 / pi},
                                        {std::abs(bc), std::arg(bc) * 180 / pi},
                                        {std::abs(ca), std::arg(ca) * 180 / pi}}});
  for (double t : {0.0, 0.0031, 0.0177}) {
    const Triple u = supply_phase_voltages_v(s, t), l = supply_line_voltages_v(s, t);
    // Differences of the rebuilt phase set give the line set back (KVL); it holds no zero
    // sequence.
    CHECK(u[0] - u[1] == Approx(l[0]).margin(1e-9));
    CHECK(u[1] - u[2] == Approx(l[1]).margin(1e-9));
    CHECK(u[2] - u[0] == Approx(l[2]).margin(1e-9));
    CHECK(u[0] + u[1] + u[2] == Approx(0.0).margin(1e-9));
    // A star's branches see the phase set, a delta's the line set.
    CHECK(branch_source_voltages_v(s, t)[1] == Approx(u[1]).margin(1e-12));
  }
  // Balanced 400 V line-to-line at the default angles: phase a is 400/√3 V RMS at 0° (the
  // line set leads by 30°; common practice, no source).
  SupplySpec b = voltage_supply(VoltageBasis::line_to_line, Connection::delta,
                                {{{400.0, 30.0}, {400.0, -90.0}, {400.0, -210.0}}});
  CHECK(supply_phase_voltages_v(b, 0.0)[0] == Approx(400.0 / std::sqrt(3.0) * std::sqrt(2.0)));
  CHECK(branch_source_voltages_v(b, 0.0)[0] == Approx(400.0 * std::sqrt(2.0) * std::cos(pi / 6)));
}

TEST_CASE("a delta's line currents drop the circulating zero sequence", "[solver][circuit]") {
  // Kirchhoff's current law at each terminal: i_a = i_ab − i_ca (common practice, no source).
  const Triple zero = line_currents_a(Connection::delta, {2.5, 2.5, 2.5});
  for (double i : zero) CHECK(i == Approx(0.0).margin(1e-15));
  // A positive-sequence branch set gives lines √3 larger, 30° behind.
  const double w = 2 * pi * 50, t = 0.0013;
  Triple branch;
  for (int k = 0; k < 3; ++k) branch[k] = std::cos(w * t - k * 2 * pi / 3);
  const Triple line = line_currents_a(Connection::delta, branch);
  CHECK(line[0] == Approx(std::sqrt(3.0) * std::cos(w * t - pi / 6)));
  CHECK(line_currents_a(Connection::star, branch)[2] == branch[2]);
}

TEST_CASE("the eliminated loop equations solve the coupled field and circuit system",
          "[solver][circuit]") {
  // A dense stand-in for the field (J symmetric positive definite, coupling C), so the
  // unreduced equations can be checked directly: J·x = C·T·i_l and, per loop,
  // Tᵀ[R·T·i_l + (a0·(L·T·i_l + s·Cᵀx) − h)/Δt] = Tᵀe.
  const int n = 9;
  Eigen::MatrixXd a = Eigen::MatrixXd::Random(n, n);
  const Eigen::MatrixXd j = a * a.transpose() + n * Eigen::MatrixXd::Identity(n, n);
  const Eigen::MatrixXd c = Eigen::MatrixXd::Random(n, 3);
  const BranchImpedance z{0.7, 2e-3};
  const double dt = 1e-4, s = 0.3;
  const Triple e{120.0, -35.0, -70.0};
  for (Connection conn : {Connection::star, Connection::star_neutral, Connection::delta})
    for (TimeScheme scheme : {TimeScheme::backward_euler, TimeScheme::bdf2}) {
      INFO("connection " << to_string(conn) << ", " << to_string(scheme));
      WindingCircuit circuit(conn, z, scheme, s);
      const std::vector<Triple> history{{0.01, -0.02, 0.005}, {0.012, -0.018, 0.004}};
      circuit.set_history(history);
      const bool bdf2 = circuit.second_order_next();
      CHECK(bdf2 == (scheme == TimeScheme::bdf2));
      const LowRankTerm term = circuit.step_term(c, e, dt);
      const Eigen::VectorXd x =
          (j + term.b * term.m * term.b.transpose()).ldlt().solve(term.b * term.w);
      const Eigen::VectorXd il = term.currents(x);
      const Eigen::MatrixXd t = loop_to_branch(conn);
      CHECK((j * x - c * t * il).norm() < 1e-10 * (c * t * il).norm());
      const double a0 = bdf2 ? 1.5 : 1.0;
      Eigen::Vector3d h, ev;
      for (int k = 0; k < 3; ++k) {
        h[k] = bdf2 ? 2 * history[0][k] - 0.5 * history[1][k] : history[0][k];
        ev[k] = e[k];
      }
      const Eigen::Vector3d iw = t * il;
      const Eigen::Vector3d linkage = z.end_inductance_h * iw + s * c.transpose() * x;
      const Eigen::VectorXd kvl =
          t.transpose() * (z.resistance_ohm * iw + (a0 * linkage - h) / dt - ev);
      CHECK(kvl.norm() < 1e-9 * ev.norm());
      // The step's branch voltages close the loops with the source (KVL again).
      const WindingCircuit::StepResult r = circuit.finish_step(term, c, x, dt);
      Eigen::Vector3d v;
      for (int k = 0; k < 3; ++k) v[k] = r.branch_voltage_v[k];
      CHECK((t.transpose() * (v - ev)).norm() < 1e-9 * ev.norm());
      if (conn == Connection::star) CHECK(iw.sum() == Approx(0.0).margin(1e-12 * iw.norm()));
    }
}

TEST_CASE("the start is the discrete periodic solution of a linear winding", "[solver][circuit]") {
  // One field unknown per branch with J = 1 and coupling c_k: ψ = s·c_k²·i, so the branch
  // inductance matrix is diagonal, L_kk = s·c_k². An imposed source f_k(t), a balanced set
  // turning at the supply frequency, stands for the rotor currents: its linkage is s·c_k·f_k.
  // Started from steady_state_estimate, a period of steps must end where it began: no
  // transient at all (the difference formula's periodic solution).
  const double s = 1.0, f = 50.0, spp = 40, dt = 1.0 / (f * spp);
  Eigen::MatrixXd c = Eigen::MatrixXd::Zero(3, 3);
  c.diagonal() << 0.2, 0.2, 0.2;
  const Eigen::Matrix3d l = s * (c.transpose() * c);
  SupplySpec supply = voltage_supply(VoltageBasis::phase, Connection::star,
                                     {{{10.0, 0.0}, {9.0, -125.0}, {10.5, -236.0}}});
  SupplyComponent fifth;
  fifth.order = 5;
  for (int k = 0; k < 3; ++k)
    fifth.rms[k] = 0.5, fifth.angle_rad[k] = 5 * supply.phases[k].angle_rad;
  supply.harmonics.push_back(fifth);
  const BranchImpedance z{0.3, 1e-3};
  for (Connection conn : {Connection::star, Connection::star_neutral, Connection::delta})
    for (TimeScheme scheme : {TimeScheme::backward_euler, TimeScheme::bdf2}) {
      INFO("connection " << to_string(conn) << ", " << to_string(scheme));
      supply.connection = conn;
      WindingCircuit circuit(conn, z, scheme, s);
      const double w = 2 * pi * f;
      const auto rotor_source = [&](double t) {
        Eigen::Vector3d v;
        for (int k = 0; k < 3; ++k) v[k] = 30.0 * std::cos(w * t - k * 2 * pi / 3 + 2.5);
        return v;
      };
      LinearWinding winding;
      winding.inductance_h = l;
      const Eigen::Vector3d rotor0 = s * (c.transpose() * rotor_source(0.0));
      winding.rotor_linkage_wb = positive_sequence_amplitudes({rotor0[0], rotor0[1], rotor0[2]});
      const SteadyStateEstimate start =
          steady_state_estimate(supply, conn, z, winding, scheme, dt, 0.0, {-dt, -2 * dt});
      circuit.set_history(start.linkage_wb);
      std::vector<Triple> currents;
      for (int step = 0; step <= spp; ++step) {
        const double t = step * dt;
        const LowRankTerm term = circuit.step_term(c, branch_source_voltages_v(supply, t), dt);
        const Eigen::MatrixXd jr =
            Eigen::MatrixXd::Identity(3, 3) + term.b * term.m * term.b.transpose();
        const Eigen::VectorXd x = jr.ldlt().solve(term.b * term.w + rotor_source(t));
        currents.push_back(circuit.finish_step(term, c, x, dt).branch_current_a);
      }
      // The estimate's own currents one step before the start continue into the first step.
      const SteadyStateEstimate at0 =
          steady_state_estimate(supply, conn, z, winding, scheme, dt, 0.0, {0.0});
      for (int k = 0; k < 3; ++k)
        CHECK(at0.current_a[0][k] ==
              Approx(currents[0][k]).margin(1e-9 * std::abs(currents[0][k]) + 1e-9));
      double largest = 0;
      for (double i : currents[0]) largest = std::max(largest, std::abs(i));
      REQUIRE(largest > 0.1);
      for (int k = 0; k < 3; ++k)
        CHECK(currents[spp][k] == Approx(currents[0][k]).margin(1e-9 * largest));
    }
}

TEST_CASE("coupled Newton: a voltage-fed nonlinear solve equals a current-fed one at its current",
          "[solver][circuit][newton]") {
  // Coaxial conductor (one turn, returning at A = 0) inside a saturating iron tube; one step of
  // a single branch driven by 300 V through 0.01 Ω from rest. The Woodbury step and the energy line
  // search must land on the field that the current it finds would make on its own, and the
  // branch's voltage equation must hold.
  const double c_r = 0.004, a = 0.006, b = 0.020;
  const Lamination lam = test::ring_lamination({{RegionKind::coil_side, 0.0, c_r},
                                                {RegionKind::airgap_stator, c_r, a},
                                                {RegionKind::stator_iron, a, b}},
                                               8, false);
  const Mesh mesh = mesh_lamination(lam, test::uniform_settings(2, 1.0e-3));
  Material air = test::linear_material(1.0), iron;
  iron.name = "test steel";
  iron.kind = MaterialClass::electrical_steel;
  iron.curve = std::make_shared<const BHCurve>(
      std::vector<double>{0, 100, 200, 400, 800, 2000, 5000, 20000, 100000},
      std::vector<double>{0, 0.6, 1.0, 1.3, 1.5, 1.65, 1.78, 1.95, 2.15});
  const MeshQuality q = mesh_quality(mesh);
  CoilRegions coils;
  RegionModel model;
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) {
    const bool coil = mesh.regions[r].tag.kind == RegionKind::coil_side;
    coils.phase.push_back(coil ? 0 : -1);
    // One turn over the whole conductor: J = i/(πc²); the sector holds an eighth of it.
    coils.turns_density_per_m2.push_back(coil ? 1.0 / (8.0 * q.area_per_region_m2[r]) : 0.0);
    model.material.push_back(mesh.regions[r].tag.kind == RegionKind::stator_iron ? &iron : &air);
    model.source.push_back(ElementSource{});
  }
  NewtonSettings settings;
  settings.residual_tolerance = 1e-11;
  settings.update_tolerance = 1e-13;
  const double dt = 1e-4, scale = 8.0;  // 1 m of stack × 8 sectors
  const BranchImpedance z{0.01, 0.0};
  WindingCircuit circuit(Connection::star_neutral, z, TimeScheme::backward_euler, scale);
  circuit.set_history({{0.0, 0.0, 0.0}});
  MagnetostaticSystem coupled(mesh, 0.0);
  const Eigen::MatrixXd coupling = coil_coupling(coupled.assembler(), coils);
  const Triple e{300.0, 0.0, 0.0};  // 0.03 Wb in one step: past the iron's knee
  const LowRankTerm term = circuit.step_term(coupling, e, dt);
  const NewtonReport report = coupled.solve(model, settings, &term);
  REQUIRE(report.converged);
  const WindingCircuit::StepResult r = circuit.finish_step(term, coupling, coupled.x(), dt);
  const double i = r.branch_current_a[0];
  INFO("current " << i << " A after " << report.iterations << " Newton iterations");
  CHECK(i > 1000.0);  // deep into the iron's saturation (H at the bore above 25 kA/m)
  // The branch equation: e = R·i + (ψ − 0)/Δt.
  CHECK(z.resistance_ohm * i + r.flux_linkage_wb[0] / dt == Approx(e[0]).epsilon(1e-9));
  // The same current imposed: the same field.
  RegionModel imposed = model;
  for (std::size_t k = 0; k < mesh.regions.size(); ++k)
    imposed.source[k].constant_a_per_m2 = coils.turns_density_per_m2[k] * i;
  MagnetostaticSystem fed(mesh, 0.0);
  REQUIRE(fed.solve(imposed, settings).converged);
  CHECK((fed.x() - coupled.x()).norm() < 1e-8 * coupled.x().norm());
  CHECK(report.iterations <= 12);
  INFO(report.factorizations << " factorisations, " << report.cg_iterations << " CG iterations");
  // Plain Newton (a new factor in every iteration, Woodbury on each) lands on the same field;
  // the default run also took steps by CG on an earlier factor with the low-rank term.
  NewtonSettings plain_settings = settings;
  plain_settings.cg_budget = 0;
  MagnetostaticSystem plain(mesh, 0.0);
  REQUIRE(plain.solve(model, plain_settings, &term).converged);
  CHECK((plain.x() - coupled.x()).norm() < 1e-8 * coupled.x().norm());
  CHECK(report.cg_iterations > 0);
}
