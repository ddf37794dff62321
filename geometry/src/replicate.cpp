#include "geometry/replicate.hpp"

#include <cmath>
#include <map>
#include <numbers>

namespace gapflux {

Mesh replicate_to_full(const Mesh& sector) {
  const SectorSymmetry& sym = sector.symmetry;
  const int n = sym.sectors;
  if (n == 1) return sector;
  const std::size_t n_nodes = sector.nodes.size();
  std::vector<int> master_of(n_nodes, -1);
  for (const auto& [slave, master] : sector.periodic_pairs) master_of[slave] = master;

  Mesh full;
  full.order = sector.order;
  full.symmetry = sym;
  full.symmetry.sectors = 1;
  full.symmetry.sector_angle_rad = 2.0 * std::numbers::pi;
  full.symmetry.antiperiodic = false;
  full.symmetry.slots_in_sector = sym.slots_in_sector * n;
  full.symmetry.bars_in_sector = sym.bars_in_sector * n;

  // Non-slave nodes of every copy first; slaves are then the masters of the next copy.
  std::vector<std::vector<int>> index(n, std::vector<int>(n_nodes, -1));
  for (int k = 0; k < n; ++k) {
    const Eigen::Rotation2Dd turn(k * sym.sector_angle_rad);
    for (std::size_t i = 0; i < n_nodes; ++i) {
      if (master_of[i] >= 0) continue;
      if (static_cast<int>(i) == sector.origin_node && k > 0) {
        index[k][i] = index[0][i];
        continue;
      }
      index[k][i] = static_cast<int>(full.nodes.size());
      full.nodes.push_back(turn * sector.nodes[i]);
      full.node_on_rotor.push_back(sector.node_on_rotor[i]);
    }
  }
  for (int k = 0; k < n; ++k)
    for (std::size_t i = 0; i < n_nodes; ++i)
      if (master_of[i] >= 0) index[k][i] = index[(k + 1) % n][master_of[i]];
  if (sector.origin_node >= 0) full.origin_node = index[0][sector.origin_node];

  // Regions: one per tag, indices shifted by the copy.
  std::map<std::tuple<int, int, int>, int> region_of;
  std::vector<std::vector<int>> region_map(n, std::vector<int>(sector.regions.size()));
  for (int k = 0; k < n; ++k)
    for (std::size_t r = 0; r < sector.regions.size(); ++r) {
      RegionTag tag = sector.regions[r].tag;
      if (tag.index >= 0)
        tag.index += k * (tag.kind == RegionKind::bar || tag.kind == RegionKind::bar_opening
                              ? sym.bars_in_sector
                              : sym.slots_in_sector);
      const auto key = std::make_tuple(static_cast<int>(tag.kind), tag.index, tag.layer);
      auto it = region_of.find(key);
      if (it == region_of.end()) {
        const int id = static_cast<int>(full.regions.size());
        full.regions.push_back({id + 1, region_name(tag), tag, 0.0});
        it = region_of.emplace(key, id).first;
      }
      full.regions[it->second].exact_area_m2 += sector.regions[r].exact_area_m2;
      region_map[k][r] = it->second;
    }

  const int per = sector.nodes_per_triangle();
  const int slots = sym.slots_in_sector * n;
  for (int k = 0; k < n; ++k)
    for (std::size_t t = 0; t < sector.n_triangles(); ++t) {
      for (int i = 0; i < per; ++i)
        full.triangles.push_back(index[k][sector.triangles[t * per + i]]);
      full.triangle_region.push_back(region_map[k][sector.triangle_region[t]]);
      const int tooth = sector.tooth_index[t];
      full.tooth_index.push_back(tooth < 0 ? -1 : (tooth + k * sym.slots_in_sector) % slots);
    }

  for (int node : sector.outer_nodes)
    for (int k = 0; k < n; ++k) full.outer_nodes.push_back(index[k][node]);
  std::sort(full.outer_nodes.begin(), full.outer_nodes.end());
  full.outer_nodes.erase(std::unique(full.outer_nodes.begin(), full.outer_nodes.end()),
                         full.outer_nodes.end());

  const auto ring = [&](const BandRing& s, BandRing& f) {
    f.radius_m = s.radius_m;
    f.pitch_rad = s.pitch_rad;
    const std::size_t intervals = s.vertices.size() - 1;
    for (int k = 0; k < n; ++k)
      for (std::size_t i = 0; i < intervals; ++i) {
        f.vertices.push_back(index[k][s.vertices[i]]);
        if (!s.midpoints.empty()) f.midpoints.push_back(index[k][s.midpoints[i]]);
      }
  };
  ring(sector.stator_ring, full.stator_ring);
  ring(sector.rotor_ring, full.rotor_ring);
  return full;
}

}  // namespace gapflux
