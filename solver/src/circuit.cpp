#include "solver/circuit.hpp"

#include <Eigen/Dense>
#include <cmath>
#include <numbers>
#include <stdexcept>

#include "solver/supply_currents.hpp"

namespace gapflux {
namespace {

using cplx = std::complex<double>;

}  // namespace

Eigen::MatrixXd loop_to_branch(Connection connection) {
  if (connection != Connection::star) return Eigen::MatrixXd::Identity(3, 3);
  Eigen::MatrixXd t(3, 2);
  t << 1, 0, 0, 1, -1, -1;
  return t;
}

// The supply functions evaluate the described set (phases or line-to-line, as given) with the
// same sum of components as a current feed; only the basis conversion is added here.
Triple supply_phase_voltages_v(const SupplySpec& supply, double t_s) {
  const Triple given = supply_values(supply, t_s);  // in the given basis
  if (supply.voltage_basis == VoltageBasis::phase) return given;
  // u_a = (u_ab − u_ca)/3 and cyclically: the phase set without zero sequence.
  return {(given[0] - given[2]) / 3.0, (given[1] - given[0]) / 3.0, (given[2] - given[1]) / 3.0};
}

Triple supply_line_voltages_v(const SupplySpec& supply, double t_s) {
  const Triple given = supply_values(supply, t_s);
  if (supply.voltage_basis == VoltageBasis::line_to_line) return given;
  return {given[0] - given[1], given[1] - given[2], given[2] - given[0]};
}

Triple branch_source_voltages_v(const SupplySpec& supply, double t_s) {
  return supply.connection == Connection::delta ? supply_line_voltages_v(supply, t_s)
                                                : supply_phase_voltages_v(supply, t_s);
}

Triple line_currents_a(Connection connection, const Triple& i) {
  if (connection != Connection::delta) return i;
  return {i[0] - i[2], i[1] - i[0], i[2] - i[1]};
}

Eigen::MatrixXd coil_coupling(const Assembler& assembler, const CoilRegions& coils) {
  Eigen::MatrixXd c = Eigen::MatrixXd::Zero(assembler.n_dofs(), 3);
  const auto& elements = assembler.elements();
  double n[max_element_nodes];
  for (const ElementRecord& rec : elements) {
    const int r = rec.region;
    if (r < 0 || coils.phase[r] < 0) continue;
    const int k = coils.phase[r];
    for (const QuadraturePoint& q : quadrature(rec.nodes.order)) {
      const PointGeometry g = point_geometry(rec.nodes, q.xi, q.eta);
      shape_values(rec.nodes.order, q.xi, q.eta, n);
      for (int i = 0; i < rec.nodes.n_nodes(); ++i)
        if (rec.dof[i] >= 0)
          c(rec.dof[i], k) +=
              rec.sign[i] * q.weight * g.det_j * n[i] * coils.turns_density_per_m2[r];
    }
  }
  return c;
}

WindingCircuit::WindingCircuit(Connection connection, BranchImpedance z, TimeScheme scheme,
                               double linkage_scale, SupplySpec supply)
    : connection_(connection),
      t_(loop_to_branch(connection)),
      z_(z),
      scheme_(scheme),
      scale_(linkage_scale),
      supply_(std::move(supply)) {
  if (!(z.resistance_ohm > 0.0) && !(z.end_inductance_h > 0.0))
    throw std::invalid_argument("a voltage-fed winding needs a resistance or an inductance");
}

void WindingCircuit::set_history(const std::vector<Triple>& newest_first) {
  history_.assign(newest_first.begin(),
                  newest_first.begin() + std::min<std::size_t>(2, newest_first.size()));
}

bool WindingCircuit::second_order_next() const {
  return scheme_ == TimeScheme::bdf2 && history_.size() >= 2;
}

double WindingCircuit::a0() const {
  return second_order_next() ? 1.5 : 1.0;
}

Triple WindingCircuit::history_term() const {
  if (history_.empty()) throw std::logic_error("the circuit has no history to step from");
  Triple h{};
  for (int k = 0; k < 3; ++k)
    h[k] = second_order_next() ? 2.0 * history_[0][k] - 0.5 * history_[1][k] : history_[0][k];
  return h;
}

LowRankTerm WindingCircuit::step_term(const Eigen::MatrixXd& coupling, const Triple& source_v,
                                      double dt_s) const {
  const double a = a0();
  const Triple h = history_term();
  Eigen::Vector3d e, hv;
  for (int k = 0; k < 3; ++k) e[k] = source_v[k], hv[k] = h[k];
  const Eigen::MatrixXd z =
      (z_.resistance_ohm + a * z_.end_inductance_h / dt_s) * (t_.transpose() * t_);
  const Eigen::VectorXd q = t_.transpose() * (e + hv / dt_s);
  const double g = a * scale_ / dt_s;
  LowRankTerm term;
  term.b = coupling * t_;
  const Eigen::LDLT<Eigen::MatrixXd> zf(z);
  term.w = zf.solve(q);
  term.m = g * zf.solve(Eigen::MatrixXd::Identity(z.rows(), z.cols()));
  term.m = 0.5 * (term.m + term.m.transpose());
  term.m_inverse = z / g;
  return term;
}

WindingCircuit::StepResult WindingCircuit::finish_step(const LowRankTerm& term,
                                                       const Eigen::MatrixXd& coupling,
                                                       const Eigen::VectorXd& x, double dt_s) {
  const double a = a0();
  const Triple h = history_term();
  StepResult r;
  const Eigen::VectorXd i = t_ * term.currents(x);
  const Eigen::VectorXd psi = scale_ * (coupling.transpose() * x);
  Triple linkage{};
  for (int k = 0; k < 3; ++k) {
    r.branch_current_a[k] = i[k];
    r.flux_linkage_wb[k] = psi[k];
    linkage[k] = z_.end_inductance_h * i[k] + psi[k];
    r.branch_voltage_v[k] = z_.resistance_ohm * i[k] + (a * linkage[k] - h[k]) / dt_s;
  }
  history_.insert(history_.begin(), linkage);
  if (history_.size() > 2) history_.pop_back();
  return r;
}

LowRankTerm WindingCircuit::step_term(double t_s, double dt_s) const {
  return step_term(coupling_, branch_source_voltages_v(supply_, t_s), dt_s);
}

void WindingCircuit::finish_step(const LowRankTerm& term, const Eigen::VectorXd& x, double dt_s) {
  last_ = finish_step(term, coupling_, x, dt_s);
}

Eigen::Vector3cd positive_sequence_amplitudes(const Triple& x) {
  const double third = 2.0 * std::numbers::pi / 3.0;
  cplx sum = 0;
  for (int k = 0; k < 3; ++k) sum += x[k] * std::polar(1.0, k * third);
  const cplx amplitude = 2.0 / 3.0 * sum;
  Eigen::Vector3cd out;
  for (int k = 0; k < 3; ++k) out[k] = amplitude * std::polar(1.0, -k * third);
  return out;
}

SteadyStateEstimate steady_state_estimate(const SupplySpec& supply, Connection connection,
                                          BranchImpedance z, const LinearWinding& winding,
                                          TimeScheme scheme, double dt_s, double t_start_s,
                                          const std::vector<double>& times_s) {
  // The branch voltages over one period, sampled finely enough for the harmonics a case gives.
  const int samples = 512;
  const double period = 1.0 / supply.frequency_hz, omega = 2.0 * std::numbers::pi / period;
  std::array<std::vector<double>, 3> e;
  for (int n = 0; n < samples; ++n) {
    const Triple v = branch_source_voltages_v(supply, t_start_s + n * period / samples);
    for (int k = 0; k < 3; ++k) e[k].push_back(v[k]);
  }
  const Eigen::MatrixXd t = loop_to_branch(connection);
  const Eigen::Matrix3cd l_total =
      (winding.inductance_h + z.end_inductance_h * Eigen::Matrix3d::Identity()).cast<cplx>();
  SteadyStateEstimate out;
  out.linkage_wb.assign(times_s.size(), Triple{0, 0, 0});
  out.current_a.assign(times_s.size(), Triple{0, 0, 0});
  double largest = 0.0;
  for (const auto& series : e)
    for (double v : series) largest = std::max(largest, std::abs(v));
  for (int h = 1; h < samples / 2; ++h) {
    // Complex amplitude referred to t_start: x(t) = Re(X·e^{jhω(t − t_start)}).
    Eigen::Vector3cd eh;
    for (int k = 0; k < 3; ++k) {
      cplx sum = 0;
      for (int n = 0; n < samples; ++n)
        sum += e[k][n] * std::polar(1.0, -2.0 * std::numbers::pi * h * n / samples);
      eh[k] = 2.0 * sum / double(samples);
    }
    const Eigen::Vector3cd rotor =
        h == 1 ? winding.rotor_linkage_wb : Eigen::Vector3cd(Eigen::Vector3cd::Zero());
    if (eh.cwiseAbs().maxCoeff() < 1e-9 * largest && rotor.cwiseAbs().maxCoeff() == 0.0) continue;
    // The difference formula's own response to e^{jhωt} in place of jhω, so that a linear
    // field starts on the discrete periodic solution (no start-up transient at all).
    const cplx z1 = std::polar(1.0, -h * omega * dt_s);
    const cplx jw =
        scheme == TimeScheme::bdf2 ? (1.5 - 2.0 * z1 + 0.5 * z1 * z1) / dt_s : (1.0 - z1) / dt_s;
    // At most 3 × 3: a bounded type keeps the LU on the stack (and apart from the dynamic
    // decompositions libgmsh exports).
    using LoopMatrix = Eigen::Matrix<cplx, Eigen::Dynamic, Eigen::Dynamic, 0, 3, 3>;
    const LoopMatrix zl = t.transpose().cast<cplx>() *
                          (z.resistance_ohm * Eigen::Matrix3cd::Identity() + jw * l_total) *
                          t.cast<cplx>();
    const Eigen::VectorXcd il =
        zl.partialPivLu().solve(t.transpose().cast<cplx>() * (eh - jw * rotor));
    const Eigen::Vector3cd iw = t.cast<cplx>() * il;
    const Eigen::Vector3cd lambda = l_total * iw + rotor;
    for (std::size_t s = 0; s < times_s.size(); ++s) {
      const cplx turn = std::polar(1.0, h * omega * (times_s[s] - t_start_s));
      for (int k = 0; k < 3; ++k) {
        out.linkage_wb[s][k] += std::real(lambda[k] * turn);
        out.current_a[s][k] += std::real(iw[k] * turn);
      }
    }
  }
  return out;
}

}  // namespace gapflux
