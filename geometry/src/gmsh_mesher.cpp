// The Gmsh adapter: lamination pieces → OpenCASCADE faces → conformal fragments → tagged mesh.
// Inside Gmsh lengths are in millimetres (its tolerances suit that scale); out here, metres.
#include <fmt/format.h>
#include <gmsh.h>
#include <omp.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <numbers>
#include <numeric>
#include <stdexcept>
#include <unordered_map>

#include "geometry/mesher.hpp"

namespace gapflux {
namespace {

constexpr double to_gmsh = 1e3;
constexpr double from_gmsh = 1e-3;
constexpr double two_pi = 2.0 * std::numbers::pi;

// Gmsh keeps global state: one session per meshing call.
// Gmsh resets OpenMP's thread count to one when it meshes; the session puts back the count the
// program had, so the solver after it runs on the threads asked for.
class GmshSession {
 public:
  GmshSession() : threads_(omp_get_max_threads()) {
    gmsh::initialize(0, nullptr, false);
    gmsh::option::setNumber("General.Terminal", 0);
    gmsh::model::add("gapflux");
  }
  ~GmshSession() {
    gmsh::finalize();
    omp_set_num_threads(threads_);
  }
  GmshSession(const GmshSession&) = delete;
  GmshSession& operator=(const GmshSession&) = delete;

 private:
  int threads_;
};

}  // namespace

const char* gmsh_library_version() {
  return GMSH_API_VERSION;
}

namespace {

std::runtime_error gmsh_failure(const std::string& what) {
  std::string last;
  try {
    gmsh::logger::getLastError(last);
  } catch (...) {
  }
  return std::runtime_error(
      fmt::format("mesh generation failed while {}{}{}", what, last.empty() ? "" : ": ", last));
}

int add_point(const Vec2& p) {
  return gmsh::model::occ::addPoint(p.x() * to_gmsh, p.y() * to_gmsh, 0.0);
}

// One closed outline as an OCC curve loop; consecutive segments share their end points.
int add_loop(const Outline& outline) {
  std::vector<int> curves;
  const int first = add_point(outline.front().start);
  int start = first;
  for (std::size_t i = 0; i < outline.size(); ++i) {
    const Segment& s = outline[i];
    const int end = i + 1 == outline.size() ? first : add_point(s.end);
    if (s.kind == Segment::Kind::line) {
      curves.push_back(gmsh::model::occ::addLine(start, end));
    } else {
      const int center = add_point(s.center);
      curves.push_back(gmsh::model::occ::addCircleArc(start, center, end));
    }
    start = end;
  }
  return gmsh::model::occ::addCurveLoop(curves);
}

int add_surface(const Piece& piece) {
  std::vector<int> loops = {add_loop(piece.outer)};
  for (const Outline& hole : piece.holes) loops.push_back(add_loop(hole));
  return gmsh::model::occ::addPlaneSurface(loops);
}

// Three points along a curve (start, middle, end), in metres.
struct CurveSamples {
  Vec2 p[3];
};

CurveSamples sample_curve(int tag) {
  std::vector<double> lo, hi;
  gmsh::model::getParametrizationBounds(1, tag, lo, hi);
  CurveSamples s;
  const double params[3] = {lo[0], 0.5 * (lo[0] + hi[0]), hi[0]};
  for (int i = 0; i < 3; ++i) {
    std::vector<double> xyz;
    gmsh::model::getValue(1, tag, {params[i]}, xyz);
    s.p[i] = Vec2(xyz[0], xyz[1]) * from_gmsh;
  }
  return s;
}

bool on_circle(const CurveSamples& s, double radius) {
  const double tol = 1e-9 + 1e-7 * radius;
  return std::all_of(std::begin(s.p), std::end(s.p),
                     [&](const Vec2& p) { return std::abs(p.norm() - radius) < tol; });
}

// On the ray from the origin at angle θ.
bool on_ray(const CurveSamples& s, double theta, double scale) {
  const Vec2 dir{std::cos(theta), std::sin(theta)};
  const double tol = 1e-9 * scale;
  return std::all_of(std::begin(s.p), std::end(s.p), [&](const Vec2& p) {
    return std::abs(dir.x() * p.y() - dir.y() * p.x()) < tol && p.dot(dir) > -tol;
  });
}

double angular_span(const CurveSamples& s) {
  const auto angle_between = [](const Vec2& a, const Vec2& b) {
    return std::abs(std::atan2(a.x() * b.y() - a.y() * b.x(), a.dot(b)));
  };
  return angle_between(s.p[0], s.p[1]) + angle_between(s.p[1], s.p[2]);
}

// Radius of the circle through a curve's three samples; infinite for a straight curve.
double sample_radius(const CurveSamples& s) {
  const Vec2 a = s.p[1] - s.p[0], b = s.p[2] - s.p[0];
  const double twice_area = std::abs(a.x() * b.y() - a.y() * b.x());
  if (twice_area < 1e-14 * a.squaredNorm()) return std::numeric_limits<double>::infinity();
  return a.norm() * b.norm() * (a - b).norm() / (2.0 * twice_area);
}

// Size = min over: the airgap field (gap size in the gap, growing linearly away from it), and
// for each small arc radius r (slot bottoms, bar ends) a field of size 2πr/16 on those arcs,
// growing at the same rate, so curved P2 edges follow them closely (the quadratic arc error is
// ∝ φ⁵ per edge of half-angle φ) without abrupt size jumps into the iron.
void set_size_field(const Lamination& lam, const MeshSettings& settings,
                    const std::map<int, CurveSamples>& samples) {
  using namespace gmsh::model::mesh;
  const double gap_mm = settings.airgap_size_m * to_gmsh;
  const double iron_mm = settings.iron_size_m * to_gmsh;
  const auto threshold = [&](int distance_field, double size_min_mm, double dist_min_mm) {
    const int f = field::add("Threshold");
    field::setNumber(f, "IField", distance_field);
    field::setNumber(f, "LcMin", size_min_mm);
    field::setNumber(f, "LcMax", iron_mm);
    field::setNumber(f, "DistMin", dist_min_mm);
    field::setNumber(f, "DistMax",
                     dist_min_mm + std::max(0.0, iron_mm - size_min_mm) / settings.growth_rate);
    return f;
  };
  std::vector<double> fields;
  const int gap_distance = field::add("MathEval");
  field::setString(gap_distance, "F",
                   fmt::format("Fabs(Sqrt(x*x+y*y) - ({:.12g}))",
                               std::max(0.0, lam.band_mid_radius_m()) * to_gmsh));
  fields.push_back(threshold(gap_distance, gap_mm, 0.5 * lam.airgap_m() * to_gmsh));

  const double elements_per_turn = settings.elements_per_turn;
  std::map<long, std::vector<double>> arcs_by_radius;  // radius in µm → curves
  for (const auto& [tag, s] : samples) {
    const double r = sample_radius(s);
    if (!std::isfinite(r)) continue;
    const double size = two_pi * r * to_gmsh / elements_per_turn;
    if (size >= iron_mm) continue;
    arcs_by_radius[std::lround(r * 1e6)].push_back(tag);
  }
  for (const auto& [radius_um, tags] : arcs_by_radius) {
    const int distance = field::add("Distance");
    field::setNumbers(distance, "CurvesList", tags);
    field::setNumber(distance, "NumPointsPerCurve", 40);
    const double size = std::max(gap_mm, two_pi * radius_um * 1e-3 / elements_per_turn);
    fields.push_back(threshold(distance, size, 0.0));
  }
  const int combined = field::add("Min");
  field::setNumbers(combined, "FieldsList", fields);
  field::setAsBackgroundMesh(combined);
  gmsh::option::setNumber("Mesh.MeshSizeFromPoints", 0);
  gmsh::option::setNumber("Mesh.MeshSizeFromCurvature", 0);
  gmsh::option::setNumber("Mesh.MeshSizeExtendFromBoundary", 0);
}

struct Classified {
  std::map<int, std::size_t> surface_piece;  // fragment surface tag → lamination piece
};

Classified fragment_and_classify(const Lamination& lam) {
  gmsh::vectorpair inputs;
  for (const Piece& piece : lam.pieces) inputs.emplace_back(2, add_surface(piece));
  gmsh::vectorpair out;
  std::vector<gmsh::vectorpair> out_map;
  gmsh::model::occ::fragment(inputs, {}, out, out_map);
  gmsh::model::occ::synchronize();
  Classified c;
  for (std::size_t i = 0; i < out_map.size() && i < lam.pieces.size(); ++i) {
    for (const auto& [dim, tag] : out_map[i]) {
      if (dim != 2) continue;
      auto it = c.surface_piece.find(tag);
      if (it == c.surface_piece.end() || lam.pieces[i].priority > lam.pieces[it->second].priority)
        c.surface_piece[tag] = i;
    }
  }
  return c;
}

}  // namespace

MeshSettings resolve_mesh_settings(const Case& c, const Lamination& lam) {
  MeshSettings s;
  s.order = c.mesh.order;
  s.growth_rate = c.mesh.growth_rate;
  s.airgap_size_m = c.mesh.airgap_size_m > 0.0 ? c.mesh.airgap_size_m
                                               : default_mesh_scale * base_airgap_size_m(lam);
  s.iron_size_m =
      c.mesh.iron_size_m > 0.0 ? c.mesh.iron_size_m : default_mesh_scale * base_iron_size_m(lam);
  s.iron_size_m = std::max(s.iron_size_m, s.airgap_size_m);
  // The band circles carry the same uniform nodes; each sector edge of each circle is split
  // into arcs of at most a quarter turn, each of which must hold a whole number of intervals.
  const int arcs = std::max(
      1,
      static_cast<int>(std::ceil(lam.symmetry.sector_angle_rad / (std::numbers::pi / 2) - 1e-9)));
  const int multiple = lam.symmetry.sectors * arcs;
  if (c.mesh.band_nodes > 0) {
    if (c.mesh.band_nodes % multiple != 0)
      throw c.sources.error(
          "mesh.band_nodes",
          fmt::format("must be a multiple of {} for this model ({} sector(s) of "
                      "{} arc(s) each); {} or {} would do",
                      multiple, lam.symmetry.sectors, arcs, c.mesh.band_nodes / multiple * multiple,
                      (c.mesh.band_nodes / multiple + 1) * multiple));
    s.band_nodes = c.mesh.band_nodes;
  } else {
    const double circumference = two_pi * lam.band_mid_radius_m();
    const int wanted = static_cast<int>(std::ceil(circumference / s.airgap_size_m));
    s.band_nodes = (wanted + multiple - 1) / multiple * multiple;
  }
  s.forecast = forecast_mesh(c, lam, s);
  return s;
}

Mesh mesh_lamination(const Lamination& lam, const MeshSettings& settings) {
  GmshSession session;
  Classified classified;
  try {
    classified = fragment_and_classify(lam);
  } catch (...) {
    throw gmsh_failure("joining the lamination pieces");
  }
  const SectorSymmetry& sym = lam.symmetry;
  const double band_pitch = two_pi / settings.band_nodes;
  const double scale = lam.stator_outer_radius_m;

  // Curves: band circles (uniform nodes), the outer surface, the sector edges (periodic).
  gmsh::vectorpair curves;
  gmsh::model::getEntities(curves, 1);
  std::vector<int> stator_band, rotor_band, outer, master, slave;
  std::map<int, CurveSamples> samples;
  for (const auto& [dim, tag] : curves) {
    const CurveSamples s = sample_curve(tag);
    samples[tag] = s;
    if (on_circle(s, lam.band_outer_radius_m))
      stator_band.push_back(tag);
    else if (on_circle(s, lam.band_inner_radius_m))
      rotor_band.push_back(tag);
    else if (on_circle(s, lam.stator_outer_radius_m))
      outer.push_back(tag);
    if (sym.sectors > 1) {
      if (on_ray(s, 0.0, scale))
        master.push_back(tag);
      else if (on_ray(s, sym.sector_angle_rad, scale))
        slave.push_back(tag);
    }
  }
  for (int tag : stator_band) {
    const int intervals = static_cast<int>(std::lround(angular_span(samples[tag]) / band_pitch));
    gmsh::model::mesh::setTransfiniteCurve(tag, intervals + 1);
  }
  for (int tag : rotor_band) {
    const int intervals = static_cast<int>(std::lround(angular_span(samples[tag]) / band_pitch));
    gmsh::model::mesh::setTransfiniteCurve(tag, intervals + 1);
  }
  if (master.size() != slave.size())
    throw std::runtime_error(
        fmt::format("sector edges do not match: {} curves on θ = 0, {} on "
                    "θ = {:.6f} rad",
                    master.size(), slave.size(), sym.sector_angle_rad));
  const double c = std::cos(sym.sector_angle_rad), s = std::sin(sym.sector_angle_rad);
  const std::vector<double> rotation = {c, -s, 0, 0, s, c, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1};
  for (int tag : slave) {
    const CurveSamples& ss = samples[tag];
    int match = -1;
    for (int m : master) {
      const CurveSamples& ms = samples[m];
      const Vec2 a = Eigen::Rotation2Dd(sym.sector_angle_rad) * ms.p[0];
      const Vec2 b = Eigen::Rotation2Dd(sym.sector_angle_rad) * ms.p[2];
      const double tol = 1e-9 * scale;
      if (((a - ss.p[0]).norm() < tol && (b - ss.p[2]).norm() < tol) ||
          ((a - ss.p[2]).norm() < tol && (b - ss.p[0]).norm() < tol)) {
        match = m;
        break;
      }
    }
    if (match < 0) throw std::runtime_error("a sector-edge curve has no periodic partner");
    gmsh::model::mesh::setPeriodic(1, {tag}, {match}, rotation);
  }

  try {
    set_size_field(lam, settings, samples);
    gmsh::model::mesh::generate(2);
    if (settings.order == 2) {
      gmsh::option::setNumber("Mesh.SecondOrderLinear", 0);
      gmsh::model::mesh::setOrder(2);
    }
  } catch (...) {
    throw gmsh_failure("generating the mesh");
  }

  Mesh mesh;
  mesh.order = settings.order;
  mesh.symmetry = sym;

  // Nodes, compacted.
  std::vector<std::size_t> node_tags;
  std::vector<double> coords, params;
  gmsh::model::mesh::getNodes(node_tags, coords, params, -1, -1, false, false);
  std::unordered_map<std::size_t, int> index_of;
  index_of.reserve(node_tags.size());
  for (std::size_t i = 0; i < node_tags.size(); ++i) {
    index_of[node_tags[i]] = static_cast<int>(i);
    mesh.nodes.emplace_back(coords[3 * i] * from_gmsh, coords[3 * i + 1] * from_gmsh);
  }

  // Regions in the order the lamination lists its pieces; the band is added last.
  std::map<std::pair<int, std::pair<int, int>>, int> region_of_tag;
  const auto region_for = [&](const RegionTag& tag) {
    const auto key =
        std::make_pair(static_cast<int>(tag.kind), std::make_pair(tag.index, tag.layer));
    auto it = region_of_tag.find(key);
    if (it != region_of_tag.end()) return it->second;
    const int index = static_cast<int>(mesh.regions.size());
    mesh.regions.push_back({index + 1, region_name(tag), tag, 0.0});
    region_of_tag[key] = index;
    return index;
  };
  for (const Piece& piece : lam.pieces) region_for(piece.tag);

  // Triangles per fragment surface.
  const int wanted_type = settings.order == 1 ? 2 : 9;
  const int per = settings.order == 1 ? 3 : 6;
  mesh.node_on_rotor.assign(mesh.nodes.size(), 0);
  for (const auto& [surface, piece_index] : classified.surface_piece) {
    const RegionTag& tag = lam.pieces[piece_index].tag;
    const int region = region_for(tag);
    double mass = 0.0;
    gmsh::model::occ::getMass(2, surface, mass);
    mesh.regions[region].exact_area_m2 += mass * from_gmsh * from_gmsh;
    std::vector<int> types;
    std::vector<std::vector<std::size_t>> element_tags, element_nodes;
    gmsh::model::mesh::getElements(types, element_tags, element_nodes, 2, surface);
    for (std::size_t k = 0; k < types.size(); ++k) {
      if (types[k] != wanted_type)
        throw std::runtime_error(fmt::format("unexpected element type {} in the mesh", types[k]));
      const auto& nodes = element_nodes[k];
      for (std::size_t e = 0; e * per < nodes.size(); ++e) {
        int tri[6];
        for (int i = 0; i < per; ++i) tri[i] = index_of.at(nodes[e * per + i]);
        const Vec2 &a = mesh.nodes[tri[0]], &b = mesh.nodes[tri[1]], &cc = mesh.nodes[tri[2]];
        if ((b - a).x() * (cc - a).y() - (b - a).y() * (cc - a).x() < 0.0) {
          std::swap(tri[1], tri[2]);
          if (per == 6) std::swap(tri[3], tri[5]);
        }
        mesh.triangles.insert(mesh.triangles.end(), tri, tri + per);
        mesh.triangle_region.push_back(region);
        int tooth = -1;
        if (tag.kind == RegionKind::stator_iron && lam.slots > 0) {
          const Vec2 centroid = (a + b + cc) / 3.0;
          tooth = stator_tooth_at(std::atan2(centroid.y(), centroid.x()), lam.slots);
        }
        mesh.tooth_index.push_back(tooth);
        if (is_rotor_side(tag.kind))
          for (int i = 0; i < per; ++i) mesh.node_on_rotor[tri[i]] = 1;
      }
    }
  }
  region_for({RegionKind::moving_band});
  const MeshRegion& band_region = mesh.regions.back();
  mesh.regions.back().exact_area_m2 =
      0.5 * sym.sector_angle_rad *
      (std::pow(lam.band_outer_radius_m, 2) - std::pow(lam.band_inner_radius_m, 2));
  (void)band_region;

  // Keep only nodes that triangles use: Gmsh also meshes construction points (arc centres).
  {
    std::vector<int> new_index(mesh.nodes.size(), -1);
    std::vector<Vec2> kept;
    std::vector<char> kept_rotor;
    for (int& n : mesh.triangles) {
      if (new_index[n] < 0) {
        new_index[n] = static_cast<int>(kept.size());
        kept.push_back(mesh.nodes[n]);
        kept_rotor.push_back(mesh.node_on_rotor[n]);
      }
      n = new_index[n];
    }
    mesh.nodes = std::move(kept);
    mesh.node_on_rotor = std::move(kept_rotor);
    for (auto& [tag, index] : index_of) index = index >= 0 ? new_index[index] : -1;
  }

  // Band rings: vertices at multiples of the pitch, mid-edge nodes halfway.
  const auto collect_ring = [&](const std::vector<int>& ring_curves, double radius,
                                BandRing& ring) {
    ring.radius_m = radius;
    ring.pitch_rad = band_pitch;
    std::map<long, int> vertices, midpoints;
    for (int tag : ring_curves) {
      std::vector<std::size_t> tags;
      std::vector<double> xyz, uv;
      gmsh::model::mesh::getNodes(tags, xyz, uv, 1, tag, true, false);
      for (std::size_t i = 0; i < tags.size(); ++i) {
        const int node = index_of.at(tags[i]);
        double angle = std::atan2(mesh.nodes[node].y(), mesh.nodes[node].x());
        if (angle < -1e-9) angle += two_pi;
        const long half_steps = std::lround(2.0 * angle / band_pitch);
        if (sym.sectors == 1 && half_steps == 2L * settings.band_nodes) continue;
        (half_steps % 2 == 0 ? vertices : midpoints)[half_steps / 2] = node;
      }
    }
    for (const auto& [k, node] : vertices) ring.vertices.push_back(node);
    for (const auto& [k, node] : midpoints) ring.midpoints.push_back(node);
  };
  collect_ring(stator_band, lam.band_outer_radius_m, mesh.stator_ring);
  collect_ring(rotor_band, lam.band_inner_radius_m, mesh.rotor_ring);

  // Outer surface nodes, sector-edge pairs, the centre node.
  const double tol = 1e-9 * scale;
  std::vector<char> seen(mesh.nodes.size(), 0);
  for (int tag : outer) {
    std::vector<std::size_t> tags;
    std::vector<double> xyz, uv;
    gmsh::model::mesh::getNodes(tags, xyz, uv, 1, tag, true, false);
    for (std::size_t t : tags) {
      const int node = index_of.at(t);
      if (!seen[node]) mesh.outer_nodes.push_back(node);
      seen[node] = 1;
    }
  }
  std::sort(mesh.outer_nodes.begin(), mesh.outer_nodes.end());
  if (sym.sectors > 1) {
    const Vec2 dir1{std::cos(sym.sector_angle_rad), std::sin(sym.sector_angle_rad)};
    std::vector<std::pair<double, int>> on_first, on_second;
    for (std::size_t i = 0; i < mesh.nodes.size(); ++i) {
      const Vec2& p = mesh.nodes[i];
      if (p.norm() < tol) {
        mesh.origin_node = static_cast<int>(i);
        continue;
      }
      if (std::abs(p.y()) < tol && p.x() > 0.0)
        on_first.emplace_back(p.norm(), static_cast<int>(i));
      else if (std::abs(dir1.x() * p.y() - dir1.y() * p.x()) < tol && p.dot(dir1) > 0.0)
        on_second.emplace_back(p.norm(), static_cast<int>(i));
    }
    std::sort(on_first.begin(), on_first.end());
    std::sort(on_second.begin(), on_second.end());
    if (on_first.size() != on_second.size())
      throw std::runtime_error(
          fmt::format("sector edges carry {} and {} nodes; the mesh is not "
                      "periodic",
                      on_first.size(), on_second.size()));
    for (std::size_t i = 0; i < on_first.size(); ++i) {
      if (std::abs(on_first[i].first - on_second[i].first) > tol)
        throw std::runtime_error("sector-edge nodes do not pair up at equal radii");
      mesh.periodic_pairs.emplace_back(on_second[i].second, on_first[i].second);
    }
  }
  return mesh;
}

}  // namespace gapflux
