// The mesh cache: a cached mesh equals a fresh one, a changed dimension is another entry, a
// damaged entry is found and rebuilt, the folder can be listed and cleared.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh_cache.hpp"
#include "geometry/mesher.hpp"
#include "test_support.hpp"

using namespace gapflux;

namespace {

struct Prepared {
  Lamination lam;
  MeshSettings settings;
};

// The reference lamination, first order (quick to mesh), its bore changed to `bore_mm`.
Prepared reference(const std::string& bore_mm = "120.0") {
  std::string text = test::read_text(test::example("reference_radial_4p24s.toml"));
  text.replace(text.find("[supply]"), 8, "[mesh]\norder = 1\n\n[supply]");
  const std::string bore = "bore_diameter_mm = 120.0";
  text.replace(text.find(bore), bore.size(), "bore_diameter_mm = " + bore_mm);
  const Case c = read_case_text(text, "reference_radial_4p24s.toml");
  Prepared p;
  p.lam = build_lamination(c);
  p.settings = resolve_mesh_settings(c, p.lam);
  return p;
}

std::string fresh_cache(const std::string& name) {
  const auto dir = test::temp_dir("mesh_cache") / name;
  std::filesystem::remove_all(dir);
  return dir.string();
}

void require_same_mesh(const Mesh& a, const Mesh& b) {
  REQUIRE(a.order == b.order);
  REQUIRE(a.nodes.size() == b.nodes.size());
  for (std::size_t i = 0; i < a.nodes.size(); ++i) {
    REQUIRE(a.nodes[i].x() == b.nodes[i].x());  // bit for bit: the cache stores the doubles
    REQUIRE(a.nodes[i].y() == b.nodes[i].y());
  }
  REQUIRE(a.triangles == b.triangles);
  REQUIRE(a.triangle_region == b.triangle_region);
  REQUIRE(a.tooth_index == b.tooth_index);
  REQUIRE(a.node_on_rotor == b.node_on_rotor);
  REQUIRE(a.outer_nodes == b.outer_nodes);
  REQUIRE(a.periodic_pairs == b.periodic_pairs);
  REQUIRE(a.origin_node == b.origin_node);
  REQUIRE(a.stator_ring.vertices == b.stator_ring.vertices);
  REQUIRE(a.rotor_ring.midpoints == b.rotor_ring.midpoints);
  REQUIRE(a.regions.size() == b.regions.size());
  for (std::size_t i = 0; i < a.regions.size(); ++i) {
    REQUIRE(a.regions[i].name == b.regions[i].name);
    REQUIRE(a.regions[i].exact_area_m2 == b.regions[i].exact_area_m2);
  }
  REQUIRE(a.symmetry.sectors == b.symmetry.sectors);
}

}  // namespace

TEST_CASE("mesh cache: the second run reads the mesh it stored, equal to a fresh mesh",
          "[geometry][mesh_cache]") {
  const std::string cache = fresh_cache("roundtrip");
  const Prepared p = reference();
  const CachedMesh first = mesh_lamination_cached(p.lam, p.settings, cache);
  CHECK_FALSE(first.from_cache);
  CHECK(first.note.find("stored in the cache") != std::string::npos);
  const CachedMesh second = mesh_lamination_cached(p.lam, p.settings, cache);
  CHECK(second.from_cache);
  require_same_mesh(first.mesh, second.mesh);
  require_same_mesh(mesh_lamination(p.lam, p.settings), second.mesh);
  CHECK(mesh_cache_contents(cache).entries == 1);
}

TEST_CASE("mesh cache: a changed dimension is another key and another mesh",
          "[geometry][mesh_cache]") {
  const std::string cache = fresh_cache("changed");
  const Prepared a = reference("120.0");
  const Prepared b = reference("121.0");
  CHECK(mesh_cache_key(a.lam, a.settings) != mesh_cache_key(b.lam, b.settings));
  CHECK(mesh_cache_key(a.lam, a.settings) == mesh_cache_key(reference("120.0").lam, a.settings));
  MeshSettings finer = a.settings;
  finer.airgap_size_m *= 0.9;
  CHECK(mesh_cache_key(a.lam, a.settings) != mesh_cache_key(a.lam, finer));

  const CachedMesh ma = mesh_lamination_cached(a.lam, a.settings, cache);
  const CachedMesh mb = mesh_lamination_cached(b.lam, b.settings, cache);
  CHECK_FALSE(mb.from_cache);  // not the first lamination's entry
  CHECK(mesh_cache_contents(cache).entries == 2);
  // The wider bore moves the bore's nodes: the largest stator-side radius at the bore differs.
  CHECK(ma.mesh.nodes.size() != mb.mesh.nodes.size());
}

TEST_CASE("mesh cache: a damaged entry is found, meshed again and replaced",
          "[geometry][mesh_cache]") {
  const std::string cache = fresh_cache("damaged");
  const Prepared p = reference();
  const CachedMesh first = mesh_lamination_cached(p.lam, p.settings, cache);
  const auto entry = std::filesystem::path(cache) / (mesh_cache_key(p.lam, p.settings) + ".mesh");
  REQUIRE(std::filesystem::exists(entry));

  SECTION("one byte flipped in the middle") {
    std::fstream f(entry, std::ios::in | std::ios::out | std::ios::binary);
    const auto middle = static_cast<std::streamoff>(std::filesystem::file_size(entry) / 2);
    f.seekg(middle);
    char c = 0;
    f.get(c);
    f.seekp(middle);
    f.put(static_cast<char>(c ^ 0x5a));
  }
  SECTION("cut short, as by a full disk") {
    std::filesystem::resize_file(entry, std::filesystem::file_size(entry) / 3);
  }
  const CachedMesh again = mesh_lamination_cached(p.lam, p.settings, cache);
  CHECK_FALSE(again.from_cache);
  CHECK(again.note.find("damaged") != std::string::npos);
  require_same_mesh(first.mesh, again.mesh);
  const CachedMesh third = mesh_lamination_cached(p.lam, p.settings, cache);
  CHECK(third.from_cache);
  require_same_mesh(first.mesh, third.mesh);
}

TEST_CASE("mesh cache: listed, cleared, turned off", "[geometry][mesh_cache]") {
  const std::string cache = fresh_cache("clear");
  const Prepared p = reference();
  mesh_lamination_cached(p.lam, p.settings, cache);
  std::ofstream(std::filesystem::path(cache) / "0000000000000000.mesh.tmp.12345") << "half";
  const CacheContents before = mesh_cache_contents(cache);
  CHECK(before.entries == 1);
  CHECK(before.bytes > 1000);
  const CacheContents removed = clear_mesh_cache(cache);
  CHECK(removed.entries == 1);
  CHECK(std::filesystem::is_empty(cache));
  // An empty folder name: no cache at all, nothing written.
  const CachedMesh none = mesh_lamination_cached(p.lam, p.settings, "");
  CHECK_FALSE(none.from_cache);
  CHECK(none.note.empty());
}
