#include "postproc/saturation.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <numbers>

#include "geometry/mesh.hpp"

namespace gapflux {
namespace {

// The phase whose magnetic axis (a line: its field peaks there with either sign) lies nearest
// to the electrical angle.
std::string nearest_phase(double angle_el_rad, const WindingLayout& w) {
  const char* names[3] = {"a", "b", "c"};
  int best = 0;
  double best_d = 1e9;
  for (int k = 0; k < 3; ++k) {
    const double d =
        std::abs(std::remainder(angle_el_rad - w.phase_axis_el_rad[k], std::numbers::pi));
    if (d < best_d) best_d = d, best = k;
  }
  return names[best];
}

}  // namespace

double area_percentile(std::vector<std::pair<double, double>> value_area, double q) {
  if (value_area.empty()) return 0.0;
  std::sort(value_area.begin(), value_area.end());
  double total = 0.0;
  for (const auto& [v, a] : value_area) total += a;
  double below = 0.0;
  for (const auto& [v, a] : value_area) {
    below += a;
    if (below >= q * total) return v;
  }
  return value_area.back().first;
}

SaturationMap saturation_map(const Mesh& mesh, const Lamination& lam,
                             const std::vector<double>& b_abs_rows, int steps, double dt_s,
                             const std::vector<double>& threshold_tesla) {
  const std::size_t nt = mesh.n_triangles();
  SaturationMap s;
  s.peak_tesla.assign(nt, 0.0);
  s.time_over_s.assign(nt, 0.0);
  s.zone.assign(nt, -1);
  for (int n = 0; n < steps; ++n)
    for (std::size_t t = 0; t < nt; ++t) {
      const double b = b_abs_rows[static_cast<std::size_t>(n) * nt + t];
      s.peak_tesla[t] = std::max(s.peak_tesla[t], b);
      if (threshold_tesla[t] > 0 && b > threshold_tesla[t]) s.time_over_s[t] += dt_s;
    }

  // Zones by radius: tips within the tip depth of the bore, tooth bodies down to the slot
  // bottom, yoke beyond; rotor bridges/tips above the bars' outermost point, teeth down to
  // their innermost, yoke below.
  const double tip_r = lam.bore_radius_m + lam.slot.tip_depth_m;
  const double slot_bottom_r = lam.stator_outer_radius_m - lam.slot.yoke_height_m;
  std::map<std::string, int> index;
  const auto zone_of = [&](const std::string& name, int tooth) {
    auto it = index.find(name);
    if (it != index.end()) return it->second;
    SaturationZone z;
    z.name = name;
    z.tooth = tooth;
    if (tooth >= 0) {
      const double angle = 2.0 * std::numbers::pi * tooth / lam.slots;  // tooth k at k·2π/Q
      z.angle_deg = angle * 180.0 / std::numbers::pi;
      z.nearest_phase = nearest_phase(angle * lam.winding.pole_pairs, lam.winding);
    }
    s.zones.push_back(z);
    return index[name] = static_cast<int>(s.zones.size()) - 1;
  };
  const int per = mesh.nodes_per_triangle();
  for (std::size_t t = 0; t < nt; ++t) {
    const RegionKind kind = mesh.regions[mesh.triangle_region[t]].tag.kind;
    if (kind != RegionKind::stator_iron && kind != RegionKind::rotor_iron) continue;
    const Vec2 c = (mesh.nodes[mesh.triangles[t * per]] + mesh.nodes[mesh.triangles[t * per + 1]] +
                    mesh.nodes[mesh.triangles[t * per + 2]]) /
                   3.0;
    const double r = c.norm();
    int z = -1;
    if (kind == RegionKind::stator_iron) {
      const int k = mesh.tooth_index[t];
      if (r < tip_r)
        z = zone_of(fmt::format("stator tooth tip {}", k), k);
      else if (r < slot_bottom_r)
        z = zone_of(fmt::format("stator tooth {}", k), k);
      else
        z = zone_of(fmt::format("stator yoke behind tooth {}", k), k);
    } else if (lam.bars > 0) {
      if (r > lam.bar.bar_top_radius_m)
        z = zone_of("rotor bridges and tips", -1);
      else if (r >= lam.bar.bar_bottom_radius_m)
        z = zone_of("rotor teeth", -1);
      else
        z = zone_of("rotor yoke", -1);
    } else {
      z = zone_of("rotor iron", -1);
    }
    s.zone[t] = z;
    SaturationZone& zone = s.zones[z];
    const double area = std::abs(triangle_area(mesh, t));
    zone.area_m2 += area;
    zone.peak_tesla = std::max(zone.peak_tesla, s.peak_tesla[t]);
    zone.threshold_tesla = threshold_tesla[t];
    if (threshold_tesla[t] > 0 && s.peak_tesla[t] > threshold_tesla[t])
      zone.area_fraction_over += area;
    s.peak_tesla_overall = std::max(s.peak_tesla_overall, s.peak_tesla[t]);
  }
  for (SaturationZone& z : s.zones)
    if (z.area_m2 > 0) z.area_fraction_over /= z.area_m2;
  // Area-weighted percentiles of the per-triangle peaks: the peak itself often sits in one
  // small triangle at a sharp corner, where the field of a corner grows as the mesh refines.
  std::vector<std::vector<std::pair<double, double>>> by_zone(s.zones.size());
  for (std::size_t t = 0; t < nt; ++t)
    if (s.zone[t] >= 0)
      by_zone[s.zone[t]].emplace_back(s.peak_tesla[t], std::abs(triangle_area(mesh, t)));
  for (std::size_t z = 0; z < s.zones.size(); ++z) {
    s.zones[z].median_tesla = area_percentile(by_zone[z], 0.5);
    s.zones[z].p95_tesla = area_percentile(by_zone[z], 0.95);
  }
  // Stator zones by tooth, then the rotor's; the triangles' zone indices follow.
  std::vector<int> by_tooth(s.zones.size());
  for (std::size_t i = 0; i < by_tooth.size(); ++i) by_tooth[i] = static_cast<int>(i);
  const auto key = [&](int i) { return s.zones[i].tooth < 0 ? 1 << 20 : s.zones[i].tooth; };
  std::stable_sort(by_tooth.begin(), by_tooth.end(), [&](int a, int b) { return key(a) < key(b); });
  std::vector<int> new_index(s.zones.size());
  std::vector<SaturationZone> sorted;
  for (std::size_t i = 0; i < by_tooth.size(); ++i) {
    new_index[by_tooth[i]] = static_cast<int>(i);
    sorted.push_back(s.zones[by_tooth[i]]);
  }
  s.zones = std::move(sorted);
  for (int& z : s.zone)
    if (z >= 0) z = new_index[z];
  return s;
}

}  // namespace gapflux
