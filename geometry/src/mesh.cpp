#include "geometry/mesh.hpp"

#include <cmath>
#include <numbers>

namespace gapflux {

std::array<int, 6> Mesh::triangle(std::size_t t) const {
  std::array<int, 6> out{-1, -1, -1, -1, -1, -1};
  const int n = nodes_per_triangle();
  for (int i = 0; i < n; ++i) out[i] = triangles[t * n + i];
  return out;
}

int Mesh::region_index(const std::string& name) const {
  for (std::size_t i = 0; i < regions.size(); ++i)
    if (regions[i].name == name) return static_cast<int>(i);
  return -1;
}

double triangle_area(const Mesh& mesh, std::size_t t) {
  const auto tri = mesh.triangle(t);
  const Vec2& a = mesh.nodes[tri[0]];
  const Vec2& b = mesh.nodes[tri[1]];
  const Vec2& c = mesh.nodes[tri[2]];
  if (mesh.order == 1) return 0.5 * ((b - a).x() * (c - a).y() - (b - a).y() * (c - a).x());
  // Quadratic map x(ξ, η) = Σ N_i(ξ, η) x_i; det J is a polynomial of degree 2, so the
  // three-point rule at the edge midpoints (weights 1/6) integrates it exactly.
  const Vec2* x[6];
  for (int i = 0; i < 6; ++i) x[i] = &mesh.nodes[tri[i]];
  const double points[3][2] = {{0.5, 0.0}, {0.5, 0.5}, {0.0, 0.5}};
  double area = 0.0;
  for (const auto& p : points) {
    const double xi = p[0], eta = p[1], zeta = 1.0 - xi - eta;
    // dN/dξ and dN/dη of the six quadratic shape functions (vertex 0 at ξ = η = 0).
    const double dxi[6] = {-(4 * zeta - 1), 4 * xi - 1, 0, 4 * (zeta - xi), 4 * eta, -4 * eta};
    const double deta[6] = {-(4 * zeta - 1), 0, 4 * eta - 1, -4 * xi, 4 * xi, 4 * (zeta - eta)};
    Vec2 jx = Vec2::Zero(), je = Vec2::Zero();
    for (int i = 0; i < 6; ++i) {
      jx += dxi[i] * *x[i];
      je += deta[i] * *x[i];
    }
    area += (jx.x() * je.y() - jx.y() * je.x()) / 6.0;
  }
  return area;
}

MeshQuality mesh_quality(const Mesh& mesh) {
  MeshQuality q;
  q.nodes = mesh.nodes.size();
  q.triangles = mesh.n_triangles();
  q.triangles_per_region.assign(mesh.regions.size(), 0);
  q.area_per_region_m2.assign(mesh.regions.size(), 0.0);
  std::vector<char> is_vertex(mesh.nodes.size(), 0);
  q.min_angle_deg = 180.0;
  for (std::size_t t = 0; t < mesh.n_triangles(); ++t) {
    const auto tri = mesh.triangle(t);
    for (int i = 0; i < 3; ++i) is_vertex[tri[i]] = 1;
    const Vec2& a = mesh.nodes[tri[0]];
    const Vec2& b = mesh.nodes[tri[1]];
    const Vec2& c = mesh.nodes[tri[2]];
    const double la = (b - c).norm(), lb = (c - a).norm(), lc = (a - b).norm();
    const double cross = std::abs((b - a).x() * (c - a).y() - (b - a).y() * (c - a).x());
    const double angles[3] = {
        std::acos(std::clamp((lb * lb + lc * lc - la * la) / (2 * lb * lc), -1.0, 1.0)),
        std::acos(std::clamp((la * la + lc * lc - lb * lb) / (2 * la * lc), -1.0, 1.0)),
        std::acos(std::clamp((la * la + lb * lb - lc * lc) / (2 * la * lb), -1.0, 1.0))};
    for (double angle : angles)
      q.min_angle_deg = std::min(q.min_angle_deg, angle * 180.0 / std::numbers::pi);
    const double area = 0.5 * cross;
    const double s = 0.5 * (la + lb + lc);
    const double inradius = area / s;
    const double circumradius = la * lb * lc / (4.0 * area);
    q.max_aspect_ratio = std::max(q.max_aspect_ratio, circumradius / (2.0 * inradius));
    const double curved_area = triangle_area(mesh, t);
    q.total_area_m2 += curved_area;
    q.triangles_per_region[mesh.triangle_region[t]] += 1;
    q.area_per_region_m2[mesh.triangle_region[t]] += curved_area;
  }
  for (char v : is_vertex) q.vertices += v;
  return q;
}

}  // namespace gapflux
