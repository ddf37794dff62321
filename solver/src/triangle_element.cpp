#include "solver/triangle_element.hpp"

#include <cmath>

namespace gapflux {

const std::vector<QuadraturePoint>& quadrature(int order) {
  // Edge-midpoint rule, degree 2.
  static const std::vector<QuadraturePoint> degree2 = {
      {0.5, 0.0, 1.0 / 6}, {0.5, 0.5, 1.0 / 6}, {0.0, 0.5, 1.0 / 6}};
  // Dunavant (1985) 6-point rule, degree 4; weights scaled to the reference area ½.
  static const std::vector<QuadraturePoint> degree4 = [] {
    const double a1 = 0.445948490915965, w1 = 0.223381589678011 / 2;
    const double a2 = 0.091576213509771, w2 = 0.109951743655322 / 2;
    return std::vector<QuadraturePoint>{{a1, a1, w1}, {1 - 2 * a1, a1, w1}, {a1, 1 - 2 * a1, w1},
                                        {a2, a2, w2}, {1 - 2 * a2, a2, w2}, {a2, 1 - 2 * a2, w2}};
  }();
  return order == 1 ? degree2 : degree4;
}

void shape_values(int order, double xi, double eta, double* n) {
  const double zeta = 1.0 - xi - eta;
  if (order == 1) {
    n[0] = zeta;
    n[1] = xi;
    n[2] = eta;
    return;
  }
  n[0] = zeta * (2 * zeta - 1);
  n[1] = xi * (2 * xi - 1);
  n[2] = eta * (2 * eta - 1);
  n[3] = 4 * xi * zeta;
  n[4] = 4 * xi * eta;
  n[5] = 4 * eta * zeta;
}

namespace {

// dN/dξ and dN/dη.
void shape_derivatives(int order, double xi, double eta, double* dxi, double* deta) {
  if (order == 1) {
    dxi[0] = -1, dxi[1] = 1, dxi[2] = 0;
    deta[0] = -1, deta[1] = 0, deta[2] = 1;
    return;
  }
  const double zeta = 1.0 - xi - eta;
  dxi[0] = -(4 * zeta - 1), deta[0] = -(4 * zeta - 1);
  dxi[1] = 4 * xi - 1, deta[1] = 0;
  dxi[2] = 0, deta[2] = 4 * eta - 1;
  dxi[3] = 4 * (zeta - xi), deta[3] = -4 * xi;
  dxi[4] = 4 * eta, deta[4] = 4 * xi;
  dxi[5] = -4 * eta, deta[5] = 4 * (zeta - eta);
}

}  // namespace

PointGeometry point_geometry(const ElementNodes& e, double xi, double eta) {
  const int n = e.n_nodes();
  double dxi[max_element_nodes], deta[max_element_nodes], values[max_element_nodes];
  shape_derivatives(e.order, xi, eta, dxi, deta);
  shape_values(e.order, xi, eta, values);
  PointGeometry g;
  g.x = Vec2::Zero();
  Vec2 jx = Vec2::Zero(), je = Vec2::Zero();
  for (int i = 0; i < n; ++i) {
    g.x += values[i] * e.x[i];
    jx += dxi[i] * e.x[i];
    je += deta[i] * e.x[i];
  }
  // J = [∂x/∂ξ ∂x/∂η; ∂y/∂ξ ∂y/∂η]; ∇N = J^{-T} ∇_ξ N.
  g.det_j = jx.x() * je.y() - je.x() * jx.y();
  const double inv = 1.0 / g.det_j;
  for (int i = 0; i < n; ++i)
    g.grad[i] = Vec2((je.y() * dxi[i] - jx.y() * deta[i]) * inv,
                     (-je.x() * dxi[i] + jx.x() * deta[i]) * inv);
  return g;
}

bool locate(const ElementNodes& e, const Vec2& p, double& xi, double& eta) {
  xi = eta = 1.0 / 3.0;
  for (int it = 0; it < 30; ++it) {
    const int n = e.n_nodes();
    double dxi[max_element_nodes], deta[max_element_nodes], values[max_element_nodes];
    shape_derivatives(e.order, xi, eta, dxi, deta);
    shape_values(e.order, xi, eta, values);
    Vec2 x = Vec2::Zero(), jx = Vec2::Zero(), je = Vec2::Zero();
    for (int i = 0; i < n; ++i) {
      x += values[i] * e.x[i];
      jx += dxi[i] * e.x[i];
      je += deta[i] * e.x[i];
    }
    const Vec2 r = p - x;
    const double det = jx.x() * je.y() - je.x() * jx.y();
    const double dx = (je.y() * r.x() - je.x() * r.y()) / det;
    const double de = (-jx.y() * r.x() + jx.x() * r.y()) / det;
    xi += dx;
    eta += de;
    if (std::abs(dx) + std::abs(de) < 1e-14) break;
  }
  const double tol = 1e-10;
  return xi >= -tol && eta >= -tol && xi + eta <= 1.0 + tol;
}

void magnetostatic_element(const ElementNodes& e, const LocalVector& a, const Material& material,
                           const ElementSource& source, bool want_tangent, LocalMatrix& tangent,
                           LocalVector& residual, LocalVector& load) {
  const int n = e.n_nodes();
  residual.setZero();
  load.setZero();
  if (want_tangent) tangent.setZero();
  double values[max_element_nodes];
  for (const QuadraturePoint& q : quadrature(e.order)) {
    const PointGeometry g = point_geometry(e, q.xi, q.eta);
    const double w = q.weight * g.det_j;
    Vec2 grad_a = Vec2::Zero();
    for (int i = 0; i < n; ++i) grad_a += a[i] * g.grad[i];
    double nu = 0.0, dnu_db2 = 0.0;
    material.reluctivity(grad_a.squaredNorm(), nu, dnu_db2);
    const double j = source.at(g.x);
    if (j != 0.0) shape_values(e.order, q.xi, q.eta, values);
    double projection[max_element_nodes];
    for (int i = 0; i < n; ++i) {
      projection[i] = g.grad[i].dot(grad_a);
      const double f = j != 0.0 ? w * j * values[i] : 0.0;
      residual[i] += w * nu * projection[i] - f;
      load[i] += f;
    }
    if (!want_tangent) continue;
    for (int i = 0; i < n; ++i)
      for (int k = 0; k <= i; ++k) {
        const double v =
            w * (nu * g.grad[i].dot(g.grad[k]) + 2.0 * dnu_db2 * projection[i] * projection[k]);
        tangent(i, k) += v;
        if (k != i) tangent(k, i) += v;
      }
  }
}

void eddy_element(const ElementNodes& e, const LocalVector& a_minus_history, double sigma_rate,
                  bool want_tangent, LocalMatrix& tangent, LocalVector& residual) {
  const int n = e.n_nodes();
  double values[max_element_nodes];
  for (const QuadraturePoint& q : quadrature(e.order)) {
    const PointGeometry g = point_geometry(e, q.xi, q.eta);
    const double w = q.weight * g.det_j * sigma_rate;
    shape_values(e.order, q.xi, q.eta, values);
    double rate_of_a = 0.0;
    for (int i = 0; i < n; ++i) rate_of_a += values[i] * a_minus_history[i];
    for (int i = 0; i < n; ++i) {
      residual[i] += w * values[i] * rate_of_a;
      if (!want_tangent) continue;
      for (int k = 0; k < n; ++k) tangent(i, k) += w * values[i] * values[k];
    }
  }
}

LocalVector shape_integrals(const ElementNodes& e) {
  LocalVector out = LocalVector::Zero();
  double values[max_element_nodes];
  for (const QuadraturePoint& q : quadrature(e.order)) {
    const PointGeometry g = point_geometry(e, q.xi, q.eta);
    shape_values(e.order, q.xi, q.eta, values);
    for (int i = 0; i < e.n_nodes(); ++i) out[i] += q.weight * g.det_j * values[i];
  }
  return out;
}

Vec2 flux_density_at(const ElementNodes& e, const LocalVector& a, double xi, double eta) {
  const PointGeometry g = point_geometry(e, xi, eta);
  Vec2 grad_a = Vec2::Zero();
  for (int i = 0; i < e.n_nodes(); ++i) grad_a += a[i] * g.grad[i];
  return {grad_a.y(), -grad_a.x()};
}

}  // namespace gapflux
