#pragma once
// Typed, range-checked reads of one key, shared by the table parsers. Each error names the key,
// the file and the line through TableReader.
#include <fmt/format.h>

#include <numbers>
#include <optional>
#include <string>
#include <vector>

#include "table_reader.hpp"

namespace gapflux::value_checks {

constexpr double mm = 1e-3;
constexpr double deg = std::numbers::pi / 180.0;
constexpr double max_length_mm = 10000.0;  // nothing we model is larger than 10 m

// A length in millimetres, strictly positive, returned in metres.
inline double length_mm(TableReader& t, const std::string& key, std::optional<double> default_mm,
                        const std::string& what) {
  const auto v = t.number(key);
  if (!v && !default_mm) throw t.missing(key, what + " in mm (a number > 0)");
  const double value = v ? *v : *default_mm;
  if (!(value > 0.0) || value > max_length_mm)
    throw t.error(key,
                  fmt::format("must be a length in mm in (0, {}] (got {})", max_length_mm, value));
  return value * mm;
}

// A length in millimetres that may be zero.
inline double length_or_zero_mm(TableReader& t, const std::string& key, double default_mm) {
  const double value = t.number(key).value_or(default_mm);
  if (!(value >= 0.0) || value > max_length_mm)
    throw t.error(key,
                  fmt::format("must be a length in mm in [0, {}] (got {})", max_length_mm, value));
  return value * mm;
}

inline double number_in(TableReader& t, const std::string& key, std::optional<double> dflt,
                        double lo, double hi, const std::string& unit) {
  const auto v = t.number(key);
  if (!v && !dflt) throw t.missing(key, fmt::format("a number in [{}, {}] {}", lo, hi, unit));
  const double value = v ? *v : *dflt;
  if (!(value >= lo && value <= hi))
    throw t.error(key, fmt::format("must be in [{}, {}] {} (got {})", lo, hi, unit, value));
  return value;
}

inline int integer_in(TableReader& t, const std::string& key, std::optional<long long> dflt,
                      long long lo, long long hi) {
  const auto v = t.integer(key);
  if (!v && !dflt) throw t.missing(key, fmt::format("an integer in [{}, {}]", lo, hi));
  const long long value = v ? *v : *dflt;
  if (value < lo || value > hi)
    throw t.error(key, fmt::format("must be an integer in [{}, {}] (got {})", lo, hi, value));
  return static_cast<int>(value);
}

// One of a fixed set of words; returns its index.
inline std::size_t choice(TableReader& t, const std::string& key,
                          const std::vector<std::string>& options,
                          std::optional<std::size_t> dflt) {
  const auto v = t.string(key);
  if (!v) {
    if (dflt) return *dflt;
    throw t.missing(key, fmt::format("one of: {}", fmt::join(options, ", ")));
  }
  for (std::size_t i = 0; i < options.size(); ++i)
    if (options[i] == *v) return i;
  std::string msg =
      fmt::format("must be one of: {} (got {})", fmt::join(options, ", "), quote_text(*v));
  if (auto guess = nearest_of(*v, options); !guess.empty())
    msg += fmt::format("; did you mean \"{}\"?", guess);
  throw t.error(key, msg);
}

inline TableReader required_table(TableReader& parent, const std::string& key,
                                  const std::string& what) {
  if (auto t = parent.table(key)) return *t;
  throw parent.missing(key, fmt::format("a table [{}] with {}", parent.key_path(key), what), true);
}

}  // namespace gapflux::value_checks
