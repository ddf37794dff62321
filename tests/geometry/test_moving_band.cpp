// The moving band: valid triangles at any rotor angle, the band's area, sector wrap-around.
#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>
#include <set>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "geometry/moving_band.hpp"
#include "test_support.hpp"

using namespace gapflux;

namespace {

double cross(const Vec2& a, const Vec2& b) {
  return a.x() * b.y() - a.y() * b.x();
}

// Area of a triangle with straight or parabolic edges: the straight triangle plus, per edge,
// the parabolic segment 2/3·base·height (Archimedes), signed outward for a counter-clockwise
// triangle.
double curved_area(const BandElement& e, int order) {
  const Vec2 &a = e.corners[0].position_m, &b = e.corners[1].position_m,
             &c = e.corners[2].position_m;
  double area = 0.5 * cross(b - a, c - a);
  if (order == 2) {
    const Vec2* ends[3][2] = {{&a, &b}, {&b, &c}, {&c, &a}};
    for (int i = 0; i < 3; ++i) {
      const Vec2& p = *ends[i][0];
      const Vec2& q = *ends[i][1];
      const Vec2 bulge = e.corners[3 + i].position_m - 0.5 * (p + q);
      area += (2.0 / 3.0) * cross(bulge, q - p);
    }
  }
  return area;
}

struct Setup {
  Lamination lam;
  Mesh mesh;
};

Setup setup(const std::string& name, const std::string& mesh_table = "") {
  std::string text = test::read_text(test::example(name));
  if (!mesh_table.empty()) text.replace(text.find("[supply]"), 8, mesh_table + "\n[supply]");
  const Case c = read_case_text(text, name);
  Setup s;
  s.lam = build_lamination(c);
  s.mesh = mesh_lamination(s.lam, resolve_mesh_settings(c, s.lam));
  return s;
}

}  // namespace

TEST_CASE("band triangles are valid and fill the band at any rotor angle", "[geometry][band]") {
  for (const char* mesh_table : {"", "[mesh]\norder = 1\n", "[mesh]\nsymmetry = \"full\"\n"}) {
    const Setup s = setup("reference_radial_4p24s.toml", mesh_table);
    const Mesh& mesh = s.mesh;
    const double ts = mesh.symmetry.sector_angle_rad;
    const double exact =
        0.5 * ts *
        (std::pow(s.lam.band_outer_radius_m, 2) - std::pow(s.lam.band_inner_radius_m, 2));
    const double pitch = mesh.stator_ring.pitch_rad;
    for (double angle : {0.0, 0.3 * pitch, 0.5 * pitch, 0.999 * pitch, 7.0 * pitch, 12.25 * pitch,
                         1.7, -0.4, 3.0 * ts + 0.1 * pitch}) {
      INFO("order " << mesh.order << ", sectors " << mesh.symmetry.sectors << ", angle " << angle);
      const BandMesh band = build_moving_band(mesh, angle);
      REQUIRE(band.elements.size() ==
              2 * (mesh.stator_ring.vertices.size() - (mesh.symmetry.sectors > 1 ? 1 : 0)));
      double total = 0.0;
      int inverted = 0;
      for (const BandElement& e : band.elements) {
        const double straight = 0.5 * cross(e.corners[1].position_m - e.corners[0].position_m,
                                            e.corners[2].position_m - e.corners[0].position_m);
        inverted += straight <= 0.0;
        total += curved_area(e, mesh.order);
      }
      CHECK(inverted == 0);
      // Order 2: parabolic arcs approximate the circles to O((h/R)^4); order 1: chords lose
      // about (h/R)²/12 of the band, far above the band's own thickness ratio here.
      if (mesh.order == 2)
        CHECK(total == Approx(exact).epsilon(1e-6));
      else
        CHECK(total == Approx(exact).epsilon(2e-2));
    }
  }
}

TEST_CASE("band corners sit on the rotated rotor ring and carry the sector sign",
          "[geometry][band]") {
  const Setup s = setup("pump_4p36s.toml");
  const Mesh& mesh = s.mesh;
  REQUIRE(mesh.symmetry.antiperiodic);
  const double pitch = mesh.stator_ring.pitch_rad;
  const int n = static_cast<int>(mesh.rotor_ring.vertices.size()) - 1;
  const double angle = 5.25 * pitch;
  const BandMesh band = build_moving_band(mesh, angle);
  std::set<int> rotor_vertices;
  int flipped = 0;
  for (const BandElement& e : band.elements) {
    for (int i = 0; i < 3; ++i) {
      const BandNodeRef& c = e.corners[i];
      if (!mesh.node_on_rotor[c.node]) {
        CHECK(c.sign == 1.0);
        continue;
      }
      rotor_vertices.insert(c.node);
      // A corner past θ = 0 (turned back by the rotor) stands for the node one sector on.
      const Vec2 expected =
          Eigen::Rotation2Dd(angle + (c.sign < 0 ? -mesh.symmetry.sector_angle_rad : 0.0)) *
          mesh.nodes[c.node];
      CHECK((expected - c.position_m).norm() < 1e-12);
      flipped += c.sign < 0;
    }
  }
  // Turned past five pitches: rotor vertices come from across the sector edge (with the sign),
  // and each of the n master vertices is used; the edge's own image vertex n is not.
  CHECK(flipped > 0);
  CHECK(static_cast<int>(rotor_vertices.size()) == n);
  CHECK(rotor_vertices.count(mesh.rotor_ring.vertices.back()) == 0);
}

TEST_CASE("a rotation by whole band pitches reproduces the aligned band", "[geometry][band]") {
  const Setup s = setup("reference_radial_4p24s.toml", "[mesh]\nsymmetry = \"full\"\n");
  const BandMesh aligned = build_moving_band(s.mesh, 0.0);
  const double pitch = s.mesh.stator_ring.pitch_rad;
  const BandMesh turned = build_moving_band(s.mesh, 3.0 * pitch);
  REQUIRE(aligned.elements.size() == turned.elements.size());
  // Same stator corners and the same shapes, the rotor corners three vertices further back.
  for (std::size_t i = 0; i < aligned.elements.size(); ++i)
    for (int k = 0; k < 6; ++k)
      CHECK((aligned.elements[i].corners[k].position_m - turned.elements[i].corners[k].position_m)
                .norm() < 1e-12);
}
