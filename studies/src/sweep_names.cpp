#include "sweep_names.hpp"

#include <utility>

namespace gapflux {

std::vector<std::string> sweep_outputs() {
  return {"manifest.json", "manifest.csv", "cases",      "runs", "logs",
          "sweep.csv",     "sweep.h5",     "sweep.html", "slurm"};
}

std::string unit_of_key(const std::string& key) {
  // Longest suffixes first, so that "_mm" is not read as "_m".
  static const std::vector<std::pair<std::string, std::string>> suffixes{
      {"_tesla", "T"},  {"_rpm", "rpm"}, {"_pct", "%"},  {"_deg", "deg"}, {"_ohm", "ohm"},
      {"_mm2", "mm^2"}, {"_mm", "mm"},   {"_nm", "N*m"}, {"_hz", "Hz"},   {"_wb", "Wb"},
      {"_kw", "kW"},    {"_w", "W"},     {"_a", "A"},    {"_v", "V"},     {"_s", "s"},
      {"_m", "m"},      {"_h", "H"},     {"_j", "J"},    {"_c", "degC"},  {"_t", "T"}};
  const std::string last = key.substr(key.rfind('.') == std::string::npos ? 0 : key.rfind('.') + 1);
  for (const auto& [suffix, unit] : suffixes)
    if (last.size() > suffix.size() && last.ends_with(suffix)) return unit;
  for (const char* ratio : {"factor", "ratio", "slip", "amplification", "sectors", "steps",
                            "iterations", "poles", "slots", "bars", "turns", "order"})
    if (last.find(ratio) != std::string::npos) return "1";
  return "";
}

std::string column_title(const std::string& key, const std::string& unit) {
  return unit.empty() ? key : key + " [" + unit + "]";
}

std::string csv_cell(const std::string& text) {
  if (text.find_first_of(",\"\n\r") == std::string::npos) return text;
  std::string out = "\"";
  for (char ch : text) {
    if (ch == '"') out += '"';
    out += ch;
  }
  return out + "\"";
}

}  // namespace gapflux
