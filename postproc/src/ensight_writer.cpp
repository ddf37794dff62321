#include "postproc/ensight_writer.hpp"

#include <fmt/format.h>

#include <cstdint>
#include <cstring>
#include <filesystem>

#include "postproc/output_file.hpp"

namespace gapflux {
namespace {

namespace fs = std::filesystem;

// EnSight Gold C Binary: 80-byte text records, 32-bit integers and floats, native byte order.
class BinaryRecord {
 public:
  void text(const std::string& s) {
    char line[80] = {};
    std::memcpy(line, s.data(), std::min<std::size_t>(s.size(), 79));
    bytes_.append(line, 80);
  }
  void integer(std::int32_t v) { bytes_.append(reinterpret_cast<const char*>(&v), sizeof v); }
  void real(double v) {
    const float f = static_cast<float>(v);
    bytes_.append(reinterpret_cast<const char*>(&f), sizeof f);
  }
  const std::string& bytes() const { return bytes_; }

 private:
  std::string bytes_;
};

std::string element_word(int order) {
  return order == 1 ? "tria3" : "tria6";
}

std::string file_of(const std::string& dir, const std::string& name, int step) {
  return (fs::path(dir) / "fields" / "ensight" / fmt::format("{}.{:05d}", name, step)).string();
}

// One per-element scalar (or a vector's components) for the single part.
void write_element_variable(const std::string& path, const std::string& description, int order,
                            const std::vector<std::vector<double>>& components) {
  BinaryRecord r;
  r.text(description);
  r.text("part");
  r.integer(1);
  r.text(element_word(order));
  for (const auto& c : components)
    for (double v : c) r.real(v);
  write_file_whole(path, r.bytes());
}

}  // namespace

void write_ensight_step(const std::string& dir, int step, const FieldSnapshot& s) {
  fs::create_directories(fs::path(dir) / "fields" / "ensight");
  const int per = s.order == 1 ? 3 : 6;
  const std::size_t ne = s.nodes.size(), nn = ne * per;
  {
    BinaryRecord r;
    r.text("C Binary");
    r.text("gapflux field snapshot");
    r.text(fmt::format("step {}", step));
    r.text("node id off");
    r.text("element id off");
    r.text("part");
    r.integer(1);
    r.text("lamination and airgap (m)");
    r.text("coordinates");
    r.integer(static_cast<std::int32_t>(nn));
    for (int axis = 0; axis < 3; ++axis)
      for (const ElementNodes& e : s.nodes)
        for (int i = 0; i < per; ++i) r.real(axis < 2 ? e.x[i][axis] : 0.0);
    r.text(element_word(s.order));
    r.integer(static_cast<std::int32_t>(ne));
    // Every element has nodes of its own, as in the .vtu files (the band's are not shared).
    for (std::size_t e = 0; e < ne; ++e)
      for (int i = 0; i < per; ++i) r.integer(static_cast<std::int32_t>(e * per + i + 1));
    write_file_whole(file_of(dir, "geometry", step), r.bytes());
  }
  {
    BinaryRecord r;
    r.text("A (Wb/m)");
    r.text("part");
    r.integer(1);
    r.text("coordinates");
    for (const LocalVector& a : s.corner_values)
      for (int i = 0; i < per; ++i) r.real(a[i]);
    write_file_whole(file_of(dir, "A", step), r.bytes());
  }
  std::vector<double> bx, by, bz(ne, 0.0), region(s.region_id.begin(), s.region_id.end()),
      side(s.side.begin(), s.side.end());
  for (const Vec2& b : s.b_tesla) bx.push_back(b.x()), by.push_back(b.y());
  write_element_variable(file_of(dir, "B", step), "B (T)", s.order, {bx, by, bz});
  write_element_variable(file_of(dir, "B_abs", step), "B_abs (T)", s.order, {s.b_abs_tesla});
  write_element_variable(file_of(dir, "mu_r", step), "mu_r (1)", s.order, {s.mu_r});
  write_element_variable(file_of(dir, "region_id", step), "region_id", s.order, {region});
  write_element_variable(file_of(dir, "side", step), "side (0 stator, 1 rotor, 2 band)", s.order,
                         {side});
  if (!s.current_density.empty())
    write_element_variable(file_of(dir, "J", step), "J (A/m2)", s.order, {s.current_density});
}

void write_ensight_case(const std::string& dir, const std::vector<std::pair<double, int>>& steps,
                        bool current_density) {
  const std::string stem = "fields/ensight/";
  std::string text =
      "FORMAT\ntype: ensight gold\n\nGEOMETRY\nmodel: 1 " + stem + "geometry.*****\n";
  text += "\nVARIABLE\n";
  text += "scalar per node: 1 A " + stem + "A.*****\n";
  text += "vector per element: 1 B " + stem + "B.*****\n";
  for (const char* name : {"B_abs", "mu_r", "region_id", "side"})
    text += fmt::format("scalar per element: 1 {} {}{}.*****\n", name, stem, name);
  if (current_density) text += "scalar per element: 1 J " + stem + "J.*****\n";
  text += fmt::format("\nTIME\ntime set: 1\nnumber of steps: {}\nfilename numbers:", steps.size());
  for (std::size_t i = 0; i < steps.size(); ++i)
    text += fmt::format("{}{}", i % 10 == 0 ? "\n" : " ", steps[i].second);
  text += "\ntime values:";
  for (std::size_t i = 0; i < steps.size(); ++i)
    text += fmt::format("{}{:.12g}", i % 5 == 0 ? "\n" : " ", steps[i].first);
  text += "\n";
  write_file_whole((fs::path(dir) / "fields.case").string(), text);
}

}  // namespace gapflux
