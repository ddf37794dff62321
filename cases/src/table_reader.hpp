#pragma once
// A checked view of one TOML table: typed getters that record which keys the schema knows and
// where each was written, and a finish() that rejects unknown keys with a "did you mean".
// This and table_reader.cpp are the only places that see TOML++.
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "cases/input_error.hpp"
#include "cases/sweep_file.hpp"

namespace gapflux {

class TableReader {
 public:
  // Parses `text`; a syntax error becomes an InputError with the parser's line and column.
  static TableReader parse_root(std::string_view text, const std::string& file, SourceMap& sources);

  const std::string& path() const { return path_; }
  std::string key_path(const std::string& key) const;
  bool has(const std::string& key) const;
  SourcePos pos() const;
  SourcePos pos_of(const std::string& key) const;

  // Typed getters; absent keys give nullopt, a wrong type is an error. Each marks the key known.
  std::optional<double> number(const std::string& key);
  std::optional<long long> integer(const std::string& key);
  std::optional<std::string> string(const std::string& key);
  std::optional<bool> boolean(const std::string& key);
  std::optional<std::vector<double>> number_array(const std::string& key);
  std::optional<std::vector<std::string>> string_array(const std::string& key);
  // An array of TOML scalars of one kind (numbers and integers mix), each with its position.
  std::optional<std::vector<std::pair<SweepValue, SourcePos>>> scalar_array(const std::string& key);
  std::optional<TableReader> table(const std::string& key);
  // An array of tables ([[key]] in TOML); each element's path is "key[i]". Absent: empty.
  std::vector<TableReader> table_array(const std::string& key);
  std::vector<std::string> keys() const;
  // Marks keys as belonging to the schema without reading them (for "does not apply" messages).
  void know(const std::string& key) { known_.push_back(key); }

  [[nodiscard]] InputError error(const std::string& key, const std::string& message) const;
  // `key_is_table`: the missing key names a table, so only a misspelt table can stand for it.
  [[nodiscard]] InputError missing(const std::string& key, const std::string& what,
                                   bool key_is_table = false) const;

  // Every key present must have been asked for. `not_applicable` names keys the schema knows
  // but that the chosen variant does not use, with the reason.
  void finish(const std::vector<std::pair<std::string, std::string>>& not_applicable = {}) const;

 private:
  struct Document;
  TableReader(std::shared_ptr<const Document> doc, const void* table, std::string path,
              SourcePos pos);
  const void* node(const std::string& key) const;
  void mark(const std::string& key);

  std::shared_ptr<const Document> doc_;
  const void* table_;  // toml::table inside doc_
  std::string path_;   // dotted path of this table, "" for the root
  SourcePos pos_;
  std::vector<std::string> known_;
};

// Every value of a TOML document as "dotted.key = value" (arrays of tables as key[i]), sorted:
// the same lines for the same settings whatever the comments, spacing and order.
std::vector<std::string> flatten_toml(std::string_view text, const std::string& file);

// Edit distance, for "did you mean".
std::size_t edit_distance(std::string_view a, std::string_view b);
std::string nearest_of(std::string_view word, const std::vector<std::string>& candidates);

}  // namespace gapflux
