#include "solver/cage_circuit.hpp"

#include <Eigen/Cholesky>
#include <stdexcept>

#include "solver/triangle_element.hpp"

namespace gapflux {

int bar_of_element(const ElementRecord& rec, const std::vector<int>& bar_of_region) {
  return rec.region >= 0 && rec.region < static_cast<int>(bar_of_region.size())
             ? bar_of_region[rec.region]
             : -1;
}

Eigen::MatrixXd bar_coupling(const Assembler& assembler, const std::vector<int>& bar_of_region,
                             int bars, std::vector<double>& bar_area_m2) {
  Eigen::MatrixXd c = Eigen::MatrixXd::Zero(assembler.n_dofs(), bars);
  bar_area_m2.assign(bars, 0.0);
  for (const ElementRecord& rec : assembler.elements()) {
    const int k = bar_of_element(rec, bar_of_region);
    if (k < 0) continue;
    const LocalVector integrals = shape_integrals(rec.nodes);
    for (int i = 0; i < rec.nodes.n_nodes(); ++i) {
      bar_area_m2[k] += integrals[i];  // the shape functions sum to one
      if (rec.dof[i] >= 0) c(rec.dof[i], k) += rec.sign[i] * integrals[i];
    }
  }
  return c;
}

CageCircuit::CageCircuit(const CageParameters& cage, Eigen::MatrixXd coupling,
                         std::vector<double> bar_area_m2, TimeScheme scheme)
    : cage_(cage), c_(std::move(coupling)), area_m2_(std::move(bar_area_m2)), scheme_(scheme) {
  if (cage_.bars < 1 || c_.cols() != cage_.bars || static_cast<int>(area_m2_.size()) != cage_.bars)
    throw std::invalid_argument("a cage needs its bars' coupling and areas");
  if (!(cage_.conductivity_s_per_m > 0.0) || !(cage_.stack_length_m > 0.0))
    throw std::invalid_argument("a cage needs a conductivity and a stack length");
}

void CageCircuit::set_history(const std::vector<Eigen::VectorXd>& x_newest_first,
                              const std::vector<Eigen::VectorXd>& ring_newest_first) {
  x_history_.assign(x_newest_first.begin(),
                    x_newest_first.begin() + std::min<std::size_t>(2, x_newest_first.size()));
  ring_history_.assign(
      ring_newest_first.begin(),
      ring_newest_first.begin() + std::min<std::size_t>(2, ring_newest_first.size()));
  while (ring_history_.size() < x_history_.size())
    ring_history_.push_back(Eigen::VectorXd::Zero(cage_.bars));
}

bool CageCircuit::second_order_next() const {
  return scheme_ == TimeScheme::bdf2 && x_history_.size() >= 2 && ring_history_.size() >= 2;
}

double CageCircuit::rate(double dt_s) const {
  return (second_order_next() ? 1.5 : 1.0) / dt_s;
}

void CageCircuit::prepare(double) {
  if (x_history_.empty()) throw std::logic_error("the cage has no history to step from");
  // x_h = h/a0: backward Euler h = x_{n−1}; BDF2 h = 2·x_{n−1} − ½·x_{n−2}, a0 = 3/2.
  x_h_ = second_order_next() ? Eigen::VectorXd((2.0 * x_history_[0] - 0.5 * x_history_[1]) / 1.5)
                             : x_history_[0];
}

Eigen::MatrixXd CageCircuit::incidence() const {
  return cage_incidence(cage_);
}

Eigen::MatrixXd cage_incidence(const CageParameters& cage) {
  // (D·i_r)_k = i_r,k − i_r,k−1; the segment before bar 0 is the sector's last one, signed.
  const int n = cage.bars;
  Eigen::MatrixXd d = Eigen::MatrixXd::Identity(n, n);
  for (int k = 1; k < n; ++k) d(k, k - 1) -= 1.0;
  d(0, n - 1) -= cage.antiperiodic ? -1.0 : 1.0;
  return d;
}

void CageCircuit::loop_matrices(double dt_s, Eigen::MatrixXd& p, Eigen::VectorXd& q) const {
  const int n = cage_.bars;
  const double a0 = second_order_next() ? 1.5 : 1.0;
  const double r = cage_.ring_segment_resistance_ohm, l = cage_.ring_segment_inductance_h;
  const double z = r + a0 * l / dt_s;
  const Eigen::MatrixXd d = incidence();
  Eigen::VectorXd g(n);
  for (int k = 0; k < n; ++k)
    g[k] = cage_.conductivity_s_per_m * area_m2_[k] / cage_.stack_length_m;
  p = Eigen::MatrixXd(g.asDiagonal()) + d * d.transpose() / (2.0 * z);
  // The ring inductance's history: L·(a0·i_r − h_ir)/Δt.
  Eigen::VectorXd h_ir = Eigen::VectorXd::Zero(n);
  if (!ring_history_.empty())
    h_ir = second_order_next() ? Eigen::VectorXd(2.0 * ring_history_[0] - 0.5 * ring_history_[1])
                               : ring_history_[0];
  q = d * (l * h_ir / (z * dt_s));
}

LowRankTerm CageCircuit::step_term(double, double dt_s) const {
  if (x_h_.size() != c_.rows()) throw std::logic_error("prepare() the cage before its step term");
  const double sigma = cage_.conductivity_s_per_m, ell = cage_.stack_length_m;
  const double rho = rate(dt_s);
  Eigen::MatrixXd p;
  Eigen::VectorXd q;
  loop_matrices(dt_s, p, q);
  const Eigen::LLT<Eigen::MatrixXd> pf(p);
  LowRankTerm term;
  term.b = c_;
  term.m = -(sigma * sigma * rho / ell) * pf.solve(Eigen::MatrixXd::Identity(p.rows(), p.cols()));
  term.m = 0.5 * (term.m + term.m.transpose());
  term.m_inverse = -(ell / (sigma * sigma * rho)) * p;
  term.w = (sigma / ell) * pf.solve(q - sigma * rho * (c_.transpose() * x_h_));
  return term;
}

void CageCircuit::finish_step(const LowRankTerm& term, const Eigen::VectorXd& x, double dt_s) {
  const double sigma = cage_.conductivity_s_per_m, ell = cage_.stack_length_m;
  const double rho = rate(dt_s);
  const double a0 = second_order_next() ? 1.5 : 1.0;
  const double r = cage_.ring_segment_resistance_ohm, l = cage_.ring_segment_inductance_h;
  const double z = r + a0 * l / dt_s;
  const Eigen::VectorXd u = (ell / sigma) * term.currents(x);
  Eigen::VectorXd h_ir = Eigen::VectorXd::Zero(cage_.bars);
  if (!ring_history_.empty())
    h_ir = second_order_next() ? Eigen::VectorXd(2.0 * ring_history_[0] - 0.5 * ring_history_[1])
                               : ring_history_[0];
  last_.bar_voltage_v = u;
  last_.bar_current_a = Eigen::VectorXd(cage_.bars);
  for (int k = 0; k < cage_.bars; ++k)
    last_.bar_current_a[k] =
        sigma * area_m2_[k] / ell * u[k] - sigma * rho * c_.col(k).dot(x - x_h_);
  last_.ring_current_a = (2.0 * l * h_ir / dt_s - incidence().transpose() * u) / (2.0 * z);
  last_x_h_ = x_h_;
  last_rate_ = rho;
  x_history_.insert(x_history_.begin(), x);
  ring_history_.insert(ring_history_.begin(), last_.ring_current_a);
  if (x_history_.size() > 2) x_history_.pop_back();
  if (ring_history_.size() > 2) ring_history_.pop_back();
}

BarFieldResult bar_field(const Assembler& assembler, const std::vector<int>& bar_of_region,
                         const Eigen::VectorXd& x, const CageCircuit& cage) {
  const CageParameters& p = cage.parameters();
  const double sigma = p.conductivity_s_per_m, ell = p.stack_length_m, rho = cage.last_rate();
  const Eigen::VectorXd& u = cage.last().bar_voltage_v;
  BarFieldResult out;
  out.current_density_a_per_m2.assign(assembler.elements().size(), 0.0);
  double values[max_element_nodes];
  for (std::size_t e = 0; e < assembler.elements().size(); ++e) {
    const ElementRecord& rec = assembler.elements()[e];
    const int k = bar_of_element(rec, bar_of_region);
    if (k < 0) continue;
    const LocalVector a =
        assembler.local_values(e, x) - assembler.local_values(e, cage.last_history());
    const auto density = [&](double xi, double eta) {
      shape_values(rec.nodes.order, xi, eta, values);
      double da = 0.0;
      for (int i = 0; i < rec.nodes.n_nodes(); ++i) da += values[i] * a[i];
      return sigma * (u[k] / ell - rho * da);
    };
    for (const QuadraturePoint& q : quadrature(rec.nodes.order)) {
      const double j = density(q.xi, q.eta);
      out.loss_w += q.weight * point_geometry(rec.nodes, q.xi, q.eta).det_j * j * j / sigma;
    }
    out.current_density_a_per_m2[e] = density(1.0 / 3.0, 1.0 / 3.0);
  }
  out.loss_w *= ell;
  return out;
}

}  // namespace gapflux
