#include "geometry/moving_band.hpp"

#include <cmath>

namespace gapflux {
namespace {

// Rotor-ring lookups with sector wrap-around.
class RotorRing {
 public:
  RotorRing(const Mesh& mesh, double angle)
      : mesh_(mesh),
        ring_(mesh.rotor_ring),
        rotation_(angle),
        sector_(mesh.symmetry.sectors > 1),
        n_(static_cast<int>(sector_ ? ring_.vertices.size() - 1 : ring_.vertices.size())),
        flip_(mesh.symmetry.antiperiodic ? -1.0 : 1.0) {}

  int intervals() const { return n_; }

  BandNodeRef vertex(int j) const {
    if (sector_ && j >= 0 && j <= n_) return at(ring_.vertices[j], 0);
    return wrapped(j, ring_.vertices);
  }
  BandNodeRef midpoint(int j) const {
    if (j >= 0 && j < n_) return at(ring_.midpoints[j], 0);
    return wrapped(j, ring_.midpoints);
  }

 private:
  BandNodeRef wrapped(int j, const std::vector<int>& nodes) const {
    const int wraps = static_cast<int>(std::floor(double(j) / n_));
    const int local = j - wraps * n_;
    return at(nodes[local], wraps);
  }
  // A rotor node turned by the rotor angle and by `wraps` sector angles.
  BandNodeRef at(int node, int wraps) const {
    BandNodeRef r;
    r.node = node;
    r.sign = sector_ && (wraps % 2 != 0) ? flip_ : 1.0;
    const double turn = rotation_ + (sector_ ? wraps * mesh_.symmetry.sector_angle_rad : 0.0);
    r.position_m = Eigen::Rotation2Dd(turn) * mesh_.nodes[node];
    return r;
  }

  const Mesh& mesh_;
  const BandRing& ring_;
  double rotation_;
  bool sector_;
  int n_;
  double flip_;
};

BandNodeRef stator_node(const Mesh& mesh, int node) {
  return {node, 1.0, mesh.nodes[node]};
}

}  // namespace

BandMesh build_moving_band(const Mesh& mesh, double rotor_angle_rad) {
  BandMesh band;
  band.rotor_angle_rad = rotor_angle_rad;
  if (mesh.stator_ring.vertices.size() < 2 || mesh.rotor_ring.vertices.size() < 2) return band;
  const RotorRing rotor(mesh, rotor_angle_rad);
  const BandRing& stator = mesh.stator_ring;
  const int n = rotor.intervals();
  const bool sector = mesh.symmetry.sectors > 1;
  const double pitch = stator.pitch_rad;

  // Rotor vertex j sits at j·pitch + angle = (j + k + f)·pitch.
  double shift = rotor_angle_rad / pitch;
  double k = std::floor(shift);
  if (shift - k > 1.0 - 1e-9) k += 1.0;
  const int k_int = static_cast<int>(k);
  band.shift = k_int;

  const auto stator_vertex = [&](int i) {
    return stator_node(mesh, stator.vertices[sector ? i : i % n]);
  };
  const int base = static_cast<int>(mesh.nodes.size());
  // Band-owned mid-edge node of cross edge e (2i: side edge at stator vertex i, 2i+1: diagonal).
  const auto extra = [&](int e, const BandNodeRef& a, const BandNodeRef& b) {
    const int wraps = static_cast<int>(std::floor(double(e) / (2 * n)));
    const int local = e - wraps * 2 * n;
    BandNodeRef r;
    r.node = base + local;
    r.sign = sector && mesh.symmetry.antiperiodic && (wraps % 2 != 0) ? -1.0 : 1.0;
    r.position_m = 0.5 * (a.position_m + b.position_m);
    return r;
  };

  for (int i = 0; i < n; ++i) {
    const int j = i - k_int;
    const BandNodeRef s0 = stator_vertex(i), s1 = stator_vertex(i + 1);
    const BandNodeRef r0 = rotor.vertex(j), r1 = rotor.vertex(j + 1);
    BandElement lower, upper;
    // (r0, s0, s1) and (r0, s1, r1): counter-clockwise, since the rings run counter-clockwise
    // and the stator ring lies outside the rotor ring.
    lower.corners = {r0, s0, s1};
    upper.corners = {r0, s1, r1};
    if (mesh.order == 2) {
      const BandNodeRef diagonal = extra(2 * i + 1, r0, s1);
      const BandNodeRef side_here = extra(2 * i, s0, r0);
      const BandNodeRef side_next = extra(2 * (i + 1), s1, r1);
      lower.corners[3] = side_here;
      lower.corners[4] = stator_node(mesh, stator.midpoints[i]);
      lower.corners[5] = diagonal;
      upper.corners[3] = diagonal;
      upper.corners[4] = side_next;
      upper.corners[5] = rotor.midpoint(j);
    }
    band.elements.push_back(lower);
    band.elements.push_back(upper);
  }
  band.n_extra_nodes = mesh.order == 2 ? 2 * n : 0;
  return band;
}

}  // namespace gapflux
