// The mesh cache: a key from everything the mesher reads, a binary entry with a checksum, atomic
// writes (temporary name, rename), detection and rebuild of a corrupt entry.
#include "geometry/mesh_cache.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <optional>
#include <sstream>

namespace gapflux {

const char* gmsh_library_version();  // gmsh_mesher.cpp (the only file that sees Gmsh)

namespace fs = std::filesystem;

namespace {

// Bump when mesh_lamination gives another mesh for the same inputs (a changed size field, a new
// region): old entries then stop matching. The program and Gmsh versions are in the key too.
constexpr int mesher_revision = 1;
constexpr char magic[8] = {'G', 'F', 'M', 'E', 'S', 'H', '0', '1'};

// FNV-1a, 64 bit: guards against accidents (a changed input, a damaged file), not attacks.
struct Digest {
  std::uint64_t h = 0xcbf29ce484222325ULL;
  void bytes(const void* data, std::size_t n) {
    const auto* p = static_cast<const unsigned char*>(data);
    for (std::size_t i = 0; i < n; ++i) {
      h ^= p[i];
      h *= 0x100000001b3ULL;
    }
  }
  template <typename T>
  void value(const T& v) {
    bytes(&v, sizeof v);
  }
  void text(const std::string& s) {
    value(s.size());
    bytes(s.data(), s.size());
  }
};

// A flat byte buffer with typed appends and reads.
struct Writer {
  std::string out;
  template <typename T>
  void value(const T& v) {
    out.append(reinterpret_cast<const char*>(&v), sizeof v);
  }
  template <typename T>
  void vector(const std::vector<T>& v) {
    value(static_cast<std::uint64_t>(v.size()));
    if (!v.empty()) out.append(reinterpret_cast<const char*>(v.data()), v.size() * sizeof(T));
  }
  void text(const std::string& s) {
    value(static_cast<std::uint64_t>(s.size()));
    out.append(s);
  }
};

struct Reader {
  const std::string& in;
  std::size_t at = 0;
  bool ok = true;
  template <typename T>
  T value() {
    T v{};
    if (at + sizeof v > in.size()) {
      ok = false;
      return v;
    }
    std::memcpy(&v, in.data() + at, sizeof v);
    at += sizeof v;
    return v;
  }
  template <typename T>
  std::vector<T> vector() {
    const auto n = value<std::uint64_t>();
    if (!ok || n > (in.size() - at) / std::max<std::size_t>(sizeof(T), 1)) {
      ok = false;
      return {};
    }
    std::vector<T> v(n);
    if (n > 0) std::memcpy(v.data(), in.data() + at, n * sizeof(T));  // an empty v has no data()
    at += n * sizeof(T);
    return v;
  }
  std::string text() {
    const auto n = value<std::uint64_t>();
    if (!ok || n > in.size() - at) {
      ok = false;
      return {};
    }
    std::string s = in.substr(at, n);
    at += n;
    return s;
  }
};

void write_ring(Writer& w, const BandRing& r) {
  w.value(r.radius_m);
  w.value(r.pitch_rad);
  w.vector(r.vertices);
  w.vector(r.midpoints);
}

BandRing read_ring(Reader& r) {
  BandRing ring;
  ring.radius_m = r.value<double>();
  ring.pitch_rad = r.value<double>();
  ring.vertices = r.vector<int>();
  ring.midpoints = r.vector<int>();
  return ring;
}

std::string serialise(const Mesh& m, const std::string& key) {
  Writer w;
  w.out.append(magic, sizeof magic);
  w.text(key);
  w.value(m.order);
  std::vector<double> xy;
  xy.reserve(2 * m.nodes.size());
  for (const Vec2& p : m.nodes) xy.insert(xy.end(), {p.x(), p.y()});
  w.vector(xy);
  w.vector(m.triangles);
  w.vector(m.triangle_region);
  w.vector(m.tooth_index);
  w.value(static_cast<std::uint64_t>(m.regions.size()));
  for (const MeshRegion& r : m.regions) {
    w.value(r.id);
    w.text(r.name);
    w.value(static_cast<int>(r.tag.kind));
    w.value(r.tag.index);
    w.value(r.tag.layer);
    w.value(r.exact_area_m2);
  }
  w.vector(m.node_on_rotor);
  w.vector(m.outer_nodes);
  std::vector<int> pairs;
  for (const auto& [a, b] : m.periodic_pairs) pairs.insert(pairs.end(), {a, b});
  w.vector(pairs);
  w.value(m.origin_node);
  write_ring(w, m.stator_ring);
  write_ring(w, m.rotor_ring);
  w.value(m.symmetry.sectors);
  w.value(m.symmetry.sector_angle_rad);
  w.value(static_cast<char>(m.symmetry.antiperiodic));
  w.value(m.symmetry.slots_in_sector);
  w.value(m.symmetry.bars_in_sector);
  Digest d;
  d.bytes(w.out.data(), w.out.size());
  w.value(d.h);
  return w.out;
}

// The mesh in `bytes`, or nothing when they are not a whole entry for `key`.
std::optional<Mesh> deserialise(const std::string& bytes, const std::string& key) {
  if (bytes.size() < sizeof magic + 8 || std::memcmp(bytes.data(), magic, sizeof magic) != 0)
    return std::nullopt;
  Digest d;
  d.bytes(bytes.data(), bytes.size() - 8);
  std::uint64_t stored = 0;
  std::memcpy(&stored, bytes.data() + bytes.size() - 8, 8);
  if (stored != d.h) return std::nullopt;
  Reader r{bytes, sizeof magic};
  if (r.text() != key) return std::nullopt;
  Mesh m;
  m.order = r.value<int>();
  const std::vector<double> xy = r.vector<double>();
  for (std::size_t i = 0; i + 1 < xy.size(); i += 2) m.nodes.emplace_back(xy[i], xy[i + 1]);
  m.triangles = r.vector<int>();
  m.triangle_region = r.vector<int>();
  m.tooth_index = r.vector<int>();
  const auto regions = r.value<std::uint64_t>();
  for (std::uint64_t i = 0; r.ok && i < regions; ++i) {
    MeshRegion region;
    region.id = r.value<int>();
    region.name = r.text();
    region.tag.kind = static_cast<RegionKind>(r.value<int>());
    region.tag.index = r.value<int>();
    region.tag.layer = r.value<int>();
    region.exact_area_m2 = r.value<double>();
    m.regions.push_back(region);
  }
  m.node_on_rotor = r.vector<char>();
  m.outer_nodes = r.vector<int>();
  const std::vector<int> pairs = r.vector<int>();
  for (std::size_t i = 0; i + 1 < pairs.size(); i += 2)
    m.periodic_pairs.emplace_back(pairs[i], pairs[i + 1]);
  m.origin_node = r.value<int>();
  m.stator_ring = read_ring(r);
  m.rotor_ring = read_ring(r);
  m.symmetry.sectors = r.value<int>();
  m.symmetry.sector_angle_rad = r.value<double>();
  m.symmetry.antiperiodic = r.value<char>() != 0;
  m.symmetry.slots_in_sector = r.value<int>();
  m.symmetry.bars_in_sector = r.value<int>();
  if (!r.ok || r.at != bytes.size() - 8) return std::nullopt;
  return m;
}

std::string read_file(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

}  // namespace

std::string mesh_cache_dir() {
  if (const char* v = std::getenv("GAPFLUX_MESH_CACHE")) {
    const std::string dir = v;
    return dir == "off" ? "" : dir;
  }
  if (const char* xdg = std::getenv("XDG_CACHE_HOME"); xdg && *xdg)
    return (fs::path(xdg) / "gapflux" / "meshes").string();
  if (const char* home = std::getenv("HOME"); home && *home)
    return (fs::path(home) / ".cache" / "gapflux" / "meshes").string();
  return "";
}

std::string mesh_cache_key(const Lamination& lam, const MeshSettings& s) {
  // Every input mesh_lamination reads; when it reads something new, add it here.
  Digest d;
  d.value(mesher_revision);
  d.text(GAPFLUX_VERSION);
  d.text(gmsh_library_version());
  d.value(s.order);
  d.value(s.airgap_size_m);
  d.value(s.iron_size_m);
  d.value(s.growth_rate);
  d.value(s.band_nodes);
  d.value(s.elements_per_turn);
  for (double v : {lam.stator_outer_radius_m, lam.bore_radius_m, lam.band_outer_radius_m,
                   lam.band_inner_radius_m, lam.rotor_outer_radius_m, lam.shaft_radius_m,
                   lam.slot.slot_pitch_at_bore_m, lam.symmetry.sector_angle_rad})
    d.value(v);
  for (int v : {lam.slots, lam.bars, lam.poles, lam.layers, lam.symmetry.sectors,
                static_cast<int>(lam.symmetry.antiperiodic), lam.symmetry.slots_in_sector,
                lam.symmetry.bars_in_sector})
    d.value(v);
  const auto outline = [&](const Outline& o) {
    d.value(o.size());
    for (const Segment& seg : o) {
      d.value(static_cast<int>(seg.kind));
      for (const Vec2* p : {&seg.start, &seg.end, &seg.center}) {
        d.value(p->x());
        d.value(p->y());
      }
    }
  };
  d.value(lam.pieces.size());
  for (const Piece& p : lam.pieces) {
    d.value(static_cast<int>(p.tag.kind));
    d.value(p.tag.index);
    d.value(p.tag.layer);
    d.value(p.priority);
    outline(p.outer);
    d.value(p.holes.size());
    for (const Outline& h : p.holes) outline(h);
  }
  return fmt::format("{:016x}", d.h);
}

CachedMesh mesh_lamination_cached(const Lamination& lam, const MeshSettings& settings,
                                  const std::string& cache_dir) {
  CachedMesh out;
  if (cache_dir.empty()) {
    out.mesh = mesh_lamination(lam, settings);
    return out;
  }
  const std::string key = mesh_cache_key(lam, settings);
  const fs::path entry = fs::path(cache_dir) / (key + ".mesh");
  std::error_code ec;
  if (fs::exists(entry, ec)) {
    if (auto m = deserialise(read_file(entry), key)) {
      out.mesh = std::move(*m);
      out.from_cache = true;
      out.note = fmt::format("mesh from the cache ({})", entry.string());
      return out;
    }
    out.note =
        fmt::format("the cached mesh {} is damaged: meshed again and replaced; ", entry.string());
  }
  out.mesh = mesh_lamination(lam, settings);
  // Stored under a name of this process's own, then renamed: readers see a whole entry or none,
  // and two runs storing the same mesh at once both store a whole one.
  const std::string bytes = serialise(out.mesh, key);
  const fs::path temporary =
      fs::path(cache_dir) / fmt::format("{}.mesh.tmp.{}", key, static_cast<long>(::getpid()));
  fs::create_directories(cache_dir, ec);
  bool stored = false;
  if (!ec) {
    std::ofstream file(temporary, std::ios::binary | std::ios::trunc);
    file.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
    file.close();
    if (file) {
      fs::rename(temporary, entry, ec);
      stored = !ec;
    }
    if (!stored) fs::remove(temporary, ec);
  }
  out.note += stored ? fmt::format("mesh stored in the cache ({})", entry.string())
                     : fmt::format(
                           "the mesh cache {} cannot be written (the next run meshes "
                           "again)",
                           cache_dir);
  return out;
}

CacheContents mesh_cache_contents(const std::string& cache_dir) {
  CacheContents c;
  std::error_code ec;
  for (const auto& e : fs::directory_iterator(cache_dir, ec))
    if (e.path().extension() == ".mesh") {
      ++c.entries;
      c.bytes += e.file_size(ec);
    }
  return c;
}

CacheContents clear_mesh_cache(const std::string& cache_dir) {
  CacheContents c;
  std::error_code ec;
  for (const auto& e : fs::directory_iterator(cache_dir, ec)) {
    const std::string name = e.path().filename().string();
    if (e.path().extension() != ".mesh" && name.find(".mesh.tmp.") == std::string::npos) continue;
    const std::uintmax_t size = e.file_size(ec);
    if (fs::remove(e.path(), ec) && e.path().extension() == ".mesh") {
      ++c.entries;
      c.bytes += size;
    }
  }
  return c;
}

}  // namespace gapflux
