#include "geometry/mesh_forecast.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <numbers>
#include <span>

#include "geometry/mesher.hpp"

namespace gapflux {
namespace {

constexpr double mm = 1e-3;

struct Feature {
  std::string what, key;
  double width_m = 0.0;
  double distance_m = 0.0;  // from the middle of the airgap
};

std::vector<Feature> thin_features(const Case& c, const Lamination& lam) {
  const auto& s = c.stator.slot;
  const double half_gap = 0.5 * lam.airgap_m();
  std::vector<Feature> out;
  const char* tooth_key = s.shape == SlotShape::open_radial          ? "stator.slot.slot_angle_deg"
                          : s.body == SlotBody::constant_tooth_width ? "stator.slot.tooth_width_mm"
                                                                     : "stator.slot.slot_width_mm";
  if (s.shape != SlotShape::open_radial || s.slot_angle_rad > 0.0)
    out.push_back({"narrowest stator tooth", tooth_key, lam.slot.tooth_width_min_m,
                   half_gap + lam.slot.tip_depth_m});
  if (s.shape == SlotShape::semi_closed) {
    out.push_back({"tooth tip", "stator.slot.tip_height_mm", s.tip_height_m, half_gap});
    out.push_back({"slot opening", "stator.slot.opening_width_mm", s.opening_width_m, half_gap});
  }
  out.push_back({"stator yoke", "stator.slot.slot_depth_mm", lam.slot.yoke_height_m,
                 half_gap + s.slot_depth_m});
  const double r_rotor = lam.rotor_outer_radius_m;
  if (c.rotor.kind == RotorKind::cage && lam.bars > 0) {
    const auto& b = c.rotor.bar;
    if (b.closure == BarClosure::closed)
      out.push_back(
          {"bar bridge", "rotor.bar.bridge_thickness_mm", b.bridge_thickness_m, half_gap});
    else
      out.push_back({"bar slit", "rotor.bar.opening_width_mm", b.opening_width_m, half_gap});
    const char* bar_key = b.shape == BarShape::round      ? "rotor.bar.diameter_mm"
                          : b.shape == BarShape::teardrop ? "rotor.bar.top_radius_mm"
                                                          : "rotor.bar.width_mm";
    out.push_back({"narrowest rotor tooth", bar_key, lam.bar.rotor_tooth_width_min_m,
                   half_gap + r_rotor - lam.bar.bar_top_radius_m});
    if (lam.shaft_radius_m > 0.0)
      out.push_back({"rotor yoke", "rotor.shaft_diameter_mm",
                     lam.bar.bar_bottom_radius_m - lam.shaft_radius_m,
                     half_gap + r_rotor - lam.bar.bar_bottom_radius_m});
  } else if (lam.shaft_radius_m > 0.0) {
    out.push_back(
        {"rotor yoke", "rotor.shaft_diameter_mm", r_rotor - lam.shaft_radius_m, half_gap});
  }
  return out;
}

// The convergence study of the demo pump motor (bench/mesh_convergence.py, run 2026-12-03;
// docs/performance.md): per order, each measured scale with the largest difference from the
// converged mesh over it and every finer scale (so the figures never fall with a coarser mesh).
struct MeasuredScale {
  double scale, worst_pct;
};
constexpr std::array<MeasuredScale, 4> first_order_study{
    {{0.35, 1.028}, {0.5, 1.028}, {0.7, 1.028}, {1.0, 1.028}}};
constexpr std::array<MeasuredScale, 6> second_order_study{
    {{0.35, 0.029}, {0.5, 0.034}, {0.7, 0.110}, {1.0, 0.249}, {1.4, 0.249}, {2.0, 0.551}}};

}  // namespace

double base_airgap_size_m(const Lamination& lam) {
  return 0.5 * lam.airgap_m();
}

double base_iron_size_m(const Lamination& lam) {
  return lam.slot.slot_pitch_at_bore_m / 3.0;
}

double mesh_scale(const Lamination& lam, const MeshSettings& s) {
  const double band_pitch_m =
      s.band_nodes > 0 ? 2.0 * std::numbers::pi * lam.band_mid_radius_m() / s.band_nodes : 0.0;
  const double sizes =
      std::max({s.airgap_size_m / base_airgap_size_m(lam), s.iron_size_m / base_iron_size_m(lam),
                band_pitch_m / base_airgap_size_m(lam)});
  // Faster growth makes the elements away from the gap larger by up to its ratio; slower growth
  // is not credited (the study kept the base rate).
  return sizes * std::max(1.0, s.growth_rate / base_growth_rate);
}

MeshAccuracy estimate_mesh_accuracy(const Lamination& lam, const MeshSettings& s) {
  MeshAccuracy a;
  a.scale = mesh_scale(lam, s);
  const std::span<const MeasuredScale> study =
      s.order == 1 ? std::span<const MeasuredScale>(first_order_study)
                   : std::span<const MeasuredScale>(second_order_study);
  const double slack = 1.02;  // a scale a rounding away from a measured one is that one
  if (a.scale > study.back().scale * slack) {
    a.basis = MeshAccuracy::Basis::coarser_than_measured;
    a.worst_pct = study.back().worst_pct;
    return a;
  }
  if (a.scale * slack < study.front().scale) a.basis = MeshAccuracy::Basis::finer_than_measured;
  // The next coarser measured scale bounds the figure.
  for (const MeasuredScale& m : study)
    if (m.scale * slack >= a.scale) {
      a.worst_pct = m.worst_pct;
      break;
    }
  return a;
}

double local_mesh_size_m(const Lamination& lam, const MeshSettings& s, double distance_m) {
  const double from_edge = std::max(0.0, distance_m - 0.5 * lam.airgap_m());
  return std::min(s.iron_size_m, s.airgap_size_m + s.growth_rate * from_edge);
}

MeshForecast forecast_mesh(const Case& c, const Lamination& lam, const MeshSettings& s) {
  MeshForecast f;
  for (const Feature& feature : thin_features(c, lam)) {
    if (feature.width_m < min_feature_m)
      throw c.sources.error(
          feature.key,
          fmt::format("makes the {} {:.3g} mm wide: below {} mm, thinner than any punched "
                      "lamination carries, and no mesh resolves it sensibly",
                      feature.what, feature.width_m / mm, min_feature_m / mm));
    const double h = local_mesh_size_m(lam, s, feature.distance_m);
    if (h > 5.0 * feature.width_m)
      f.warnings.push_back(fmt::format(
          "{}: the {} is {:.3g} mm wide where the elements are about {:.3g} mm: they will be "
          "stretched across it (aspect about {:.0f}); a mesh size near {:.3g} mm there "
          "(mesh.airgap_size_mm, mesh.growth_rate, mesh.iron_size_mm) resolves it",
          feature.key, feature.what, feature.width_m / mm, h / mm, h / feature.width_m,
          feature.width_m / mm));
  }

  // Triangles: the area of each thin ring about the machine centre over the local element
  // area (equilateral triangles of the local size), over the modelled sector. Small arcs get
  // finer elements than this: the factor 1.3 is what the example cases' meshes have over the
  // plain integral (1.15–1.45); the estimate is for the order of magnitude.
  const double r_in = lam.shaft_radius_m, r_out = lam.stator_outer_radius_m;
  const double r_mid = lam.band_mid_radius_m();
  const int rings = 4000;
  double triangles = 0.0;
  for (int k = 0; k < rings; ++k) {
    const double r = r_in + (k + 0.5) * (r_out - r_in) / rings;
    const double h = local_mesh_size_m(lam, s, std::abs(r - r_mid));
    triangles += 2.0 * std::numbers::pi * r * (r_out - r_in) / rings / (0.433 * h * h);
  }
  f.triangles = 1.3 * triangles / std::max(1, lam.symmetry.sectors);
  f.accuracy = estimate_mesh_accuracy(lam, s);
  const double order_factor = s.order == 2 ? 2.0 : 0.5;  // DOFs per triangle, roughly
  if (order_factor * f.triangles > unknowns_refused)
    throw c.sources.error(
        c.mesh.iron_size_m > 0.0 ? "mesh.iron_size_mm" : "mesh.airgap_size_mm",
        fmt::format("the mesh would have about {:.2g} million triangles ({:.2g} million unknowns), "
                    "beyond what a run can solve in this program's memory and time; use larger "
                    "elements (mesh.iron_size_mm {:.3g} mm, mesh.airgap_size_mm {:.3g} mm now)",
                    f.triangles / 1e6, order_factor * f.triangles / 1e6, s.iron_size_m / mm,
                    s.airgap_size_m / mm));
  if (order_factor * f.triangles > unknowns_warned)
    f.warnings.push_back(fmt::format(
        "mesh: about {:.0f} thousand triangles ({:.2g} million unknowns): meshing takes minutes "
        "and each solve much longer than the demo's; larger mesh.iron_size_mm or "
        "mesh.airgap_size_mm make it smaller",
        f.triangles / 1e3, order_factor * f.triangles / 1e6));
  return f;
}

}  // namespace gapflux
