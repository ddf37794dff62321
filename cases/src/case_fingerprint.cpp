#include "cases/case_fingerprint.hpp"

#include <fmt/format.h>

#include <cstdint>
#include <cstring>
#include <fstream>
#include <map>
#include <sstream>

#include "table_reader.hpp"

namespace gapflux {
namespace {

// FNV-1a: a stable, dependency-free digest; it guards against mistakes, not against attacks.
std::uint64_t fnv1a(std::string_view bytes, std::uint64_t h = 0xcbf29ce484222325ULL) {
  for (unsigned char ch : bytes) {
    h ^= ch;
    h *= 0x100000001b3ULL;
  }
  return h;
}

std::uint64_t digest_of(const std::vector<double>& values, std::uint64_t h) {
  for (double v : values) {
    char raw[sizeof v];
    std::memcpy(raw, &v, sizeof v);
    h = fnv1a(std::string_view(raw, sizeof v), h);
  }
  return h;
}

}  // namespace

CaseFingerprint case_fingerprint(const std::string& case_path, const Case& c,
                                 std::string_view program_version) {
  std::ifstream in(case_path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  CaseFingerprint f;
  f.lines = flatten_toml(text.str(), case_path);
  if (c.supply.form == SupplyForm::waveform) {
    std::uint64_t h = digest_of(c.supply.waveform.time_s, fnv1a(""));
    for (const auto& column : c.supply.waveform.values) h = digest_of(column, h);
    f.lines.push_back(fmt::format("supply.waveform.file (contents) = {} rows, digest {:016x}",
                                  c.supply.waveform.time_s.size(), h));
  }
  f.lines.push_back(fmt::format("gapflux version = {}", program_version));
  f.digest = lines_digest(f.lines);
  return f;
}

std::string lines_digest(const std::vector<std::string>& lines) {
  std::uint64_t h = fnv1a("");
  for (const std::string& line : lines) h = fnv1a(line + "\n", h);
  return fmt::format("{:016x}", h);
}

std::vector<std::string> fingerprint_changes(const std::vector<std::string>& before,
                                             const std::vector<std::string>& after) {
  const auto split = [](const std::vector<std::string>& lines) {
    std::map<std::string, std::string> m;
    for (const std::string& line : lines) {
      const auto eq = line.find(" = ");
      if (eq == std::string::npos)
        m[line] = "";
      else
        m[line.substr(0, eq)] = line.substr(eq + 3);
    }
    return m;
  };
  const auto a = split(before), b = split(after);
  std::vector<std::string> out;
  for (const auto& [key, value] : a) {
    const auto it = b.find(key);
    if (it == b.end())
      out.push_back(fmt::format("{} removed (was {})", key, value));
    else if (it->second != value)
      out.push_back(fmt::format("{}: {} → {}", key, value, it->second));
  }
  for (const auto& [key, value] : b)
    if (!a.count(key)) out.push_back(fmt::format("{} added: {}", key, value));
  return out;
}

}  // namespace gapflux
