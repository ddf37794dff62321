#pragma once
// Hand-built laminations for the closed-form checks: concentric rings meshed by the same Gmsh
// adapter as the machines.
#include <numbers>

#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"

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

inline MeshSettings uniform_settings(int order, double size_m, int band_nodes = 0) {
  MeshSettings s;
  s.order = order;
  s.airgap_size_m = size_m;
  s.iron_size_m = size_m;
  s.growth_rate = 0.2;
  s.band_nodes = band_nodes > 0 ? band_nodes : 12;
  return s;
}

}  // namespace gapflux::test
