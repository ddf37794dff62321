#pragma once
// Hand-built laminations for the closed-form checks: concentric rings meshed by the same Gmsh
// adapter as the machines.
#include <Eigen/Dense>
#include <cmath>
#include <numbers>

#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "materials/bh_curve.hpp"
#include "materials/library.hpp"

namespace gapflux::test {

struct Ring {
  RegionKind kind;
  double r_inner_m, r_outer_m;
};

// A sector lamination of concentric rings (inside out); the last ring's outer circle carries
// A = 0. Band radii: the band sits between rings `band_after` and `band_after + 1` when ≥ 0.
inline Lamination ring_lamination(const std::vector<Ring>& rings, int sectors, bool antiperiodic,
                                  int band_after = -1) {
  Lamination lam;
  lam.symmetry.sectors = sectors;
  lam.symmetry.sector_angle_rad = 2.0 * std::numbers::pi / sectors;
  lam.symmetry.antiperiodic = antiperiodic;
  lam.stator_outer_radius_m = rings.back().r_outer_m;
  for (std::size_t i = 0; i < rings.size(); ++i) {
    Piece p;
    p.tag.kind = rings[i].kind;
    p.tag.index = rings[i].kind == RegionKind::coil_side ? 0 : -1;
    p.priority = 10;
    p.outer = sectors > 1 ? annular_sector(rings[i].r_inner_m, rings[i].r_outer_m, 0.0,
                                           lam.symmetry.sector_angle_rad)
                          : circle(Vec2::Zero(), rings[i].r_outer_m);
    if (sectors == 1 && rings[i].r_inner_m > 0)
      p.holes.push_back(circle(Vec2::Zero(), rings[i].r_inner_m));
    lam.pieces.push_back(p);
  }
  if (band_after >= 0) {
    lam.band_inner_radius_m = rings[band_after].r_outer_m;
    lam.band_outer_radius_m = rings[band_after + 1].r_inner_m;
    lam.rotor_outer_radius_m = rings[band_after].r_inner_m;
    lam.bore_radius_m = rings[band_after + 1].r_outer_m;
  } else {
    lam.band_inner_radius_m = lam.band_outer_radius_m = -1.0;  // no band circles
    lam.rotor_outer_radius_m = 0.0;
    lam.bore_radius_m = rings.back().r_outer_m;
  }
  return lam;
}

inline Material linear_material(double mu_r) {
  Material m;
  m.name = "linear";
  m.relative_permeability = mu_r;
  return m;
}

inline MeshSettings uniform_settings(int order, double size_m, int band_nodes = 0) {
  MeshSettings s;
  s.order = order;
  s.airgap_size_m = size_m;
  s.iron_size_m = size_m;
  s.growth_rate = 0.2;
  s.band_nodes = band_nodes > 0 ? band_nodes : 12;
  return s;
}

// Closed form of a slotless gap between linear iron cylinders (μr) with a current layer
// R_1 < r < R_s carrying J0·cos(pθ) (derivation in the slotless test's comment): in each
// region A = f(r)·cos(pθ) with f = C r^p + D r^−p, plus K r² (K(4 − p²) = −μ0 J0) in the layer;
// A and (1/μ)∂A/∂r continuous at R_r, R_1, R_s; f regular at 0 and zero at R_o.
// Returns (C1, D1): f in the air between the rotor iron (r < R_r) and the layer.
inline std::pair<double, double> slotless_air_coefficients(int p, double mu_r, double j0,
                                                           double R_r, double R_1, double R_s,
                                                           double R_o) {
  const double K = -mu0 * j0 / (4.0 - p * p);
  Eigen::Matrix<double, 7, 7> M = Eigen::Matrix<double, 7, 7>::Zero();
  Eigen::Matrix<double, 7, 1> rhs = Eigen::Matrix<double, 7, 1>::Zero();
  const auto rp = [&](double r) { return std::pow(r, p); };
  const auto rm = [&](double r) { return std::pow(r, -p); };
  const auto drp = [&](double r) { return p * std::pow(r, p - 1); };
  const auto drm = [&](double r) { return -p * std::pow(r, -p - 1); };
  // unknowns: C0, C1, D1, C2, D2, C3, D3
  M(0, 0) = rp(R_r), M(0, 1) = -rp(R_r), M(0, 2) = -rm(R_r);
  M(1, 0) = drp(R_r) / mu_r, M(1, 1) = -drp(R_r), M(1, 2) = -drm(R_r);
  M(2, 1) = rp(R_1), M(2, 2) = rm(R_1), M(2, 3) = -rp(R_1), M(2, 4) = -rm(R_1),
       rhs(2) = K * R_1 * R_1;
  M(3, 1) = drp(R_1), M(3, 2) = drm(R_1), M(3, 3) = -drp(R_1), M(3, 4) = -drm(R_1),
       rhs(3) = 2 * K * R_1;
  M(4, 3) = rp(R_s), M(4, 4) = rm(R_s), M(4, 5) = -rp(R_s), M(4, 6) = -rm(R_s),
       rhs(4) = -K * R_s * R_s;
  M(5, 3) = drp(R_s), M(5, 4) = drm(R_s), M(5, 5) = -drp(R_s) / mu_r, M(5, 6) = -drm(R_s) / mu_r,
       rhs(5) = -2 * K * R_s;
  M(6, 5) = rp(R_o), M(6, 6) = rm(R_o);
  const Eigen::Matrix<double, 7, 1> u = M.fullPivLu().solve(rhs);
  return {u(1), u(2)};
}

}  // namespace gapflux::test
