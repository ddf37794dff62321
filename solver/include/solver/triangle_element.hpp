#pragma once
// Lagrange triangles of order 1 and 2 on (for order 2, curved) geometry: shape functions,
// quadrature, and the magnetostatic element kernel. Pure functions of one element's data:
// node coordinates and values in, local arrays out; no global indices.
// Node order: vertices 0, 1, 2, then mid-edge nodes of edges 0–1, 1–2, 2–0.
#include <Eigen/Core>
#include <array>

#include "geometry/outline.hpp"
#include "materials/library.hpp"

namespace gapflux {

constexpr int max_element_nodes = 6;
using LocalVector = Eigen::Matrix<double, max_element_nodes, 1>;
using LocalMatrix = Eigen::Matrix<double, max_element_nodes, max_element_nodes>;

struct ElementNodes {
  int order = 1;
  std::array<Vec2, max_element_nodes> x;
  int n_nodes() const { return order == 1 ? 3 : 6; }
};

struct QuadraturePoint {
  double xi, eta, weight;  // weights sum to ½, the reference triangle's area
};

// Degree 2 (3 points) for order 1; degree 4 (6 points, Dunavant 1985) for order 2: exact for
// ∇N·∇N on straight P2 elements and for the mass-type terms of both orders.
const std::vector<QuadraturePoint>& quadrature(int order);

// Values N_i at (ξ, η).
void shape_values(int order, double xi, double eta, double* n);
// Physical point, gradients ∇N_i and det J at (ξ, η).
struct PointGeometry {
  Vec2 x;
  std::array<Vec2, max_element_nodes> grad;
  double det_j = 0.0;
};
PointGeometry point_geometry(const ElementNodes& e, double xi, double eta);

// Reference coordinates of physical point p (Newton on the element map); false if p is not
// inside the element (with a small tolerance).
bool locate(const ElementNodes& e, const Vec2& p, double& xi, double& eta);

// Magnetostatics, one element: −∇·(ν(|B|²)∇A) = J. With local values a:
//   residual_i = ∫ ν ∇N_i·∇A dS − ∫ J N_i dS,
//   tangent_ij = ∫ ν ∇N_i·∇N_j + 2 (dν/dB²)(∇N_i·∇A)(∇N_j·∇A) dS   (exact Newton Jacobian).
// |B| = |∇A| in 2-D. `source_at` gives J (A/m²) at a physical point; may be null (J = 0).
struct ElementSource {
  double constant_a_per_m2 = 0.0;
  double (*function)(const Vec2&, const void*) = nullptr;  // overrides the constant if set
  const void* context = nullptr;
  double at(const Vec2& x) const { return function ? function(x, context) : constant_a_per_m2; }
};

// `load` receives ∫ J N_i dS alone (the residual's source part with the sign flipped).
void magnetostatic_element(const ElementNodes& e, const LocalVector& a, const Material& material,
                           const ElementSource& source, bool want_tangent, LocalMatrix& tangent,
                           LocalVector& residual, LocalVector& load);

// Eddy currents in a solid conductor, one element: the term ∫ σ·∂A/∂t·N_i dS of the field
// equation with ∂A/∂t ≈ rate·(A − A_h), the time scheme's difference formula (rate = a0/Δt,
// A_h its history term over a0). `a_minus_history` holds A − A_h at the element's nodes;
// `sigma_rate` is σ·rate (S/(m·s)). Adds σ·rate·M_e·(a − a_h) to `residual` and σ·rate·M_e to
// `tangent` (M_e the element's mass matrix ∫ N_i N_j dS).
void eddy_element(const ElementNodes& e, const LocalVector& a_minus_history, double sigma_rate,
                  bool want_tangent, LocalMatrix& tangent, LocalVector& residual);

// ∫ N_i dS over the element.
LocalVector shape_integrals(const ElementNodes& e);

// Flux density at the element's reference centroid (T), B = (∂A/∂y, −∂A/∂x).
Vec2 flux_density_at(const ElementNodes& e, const LocalVector& a, double xi, double eta);

}  // namespace gapflux
