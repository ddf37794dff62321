#include "table_reader.hpp"

#include <fmt/format.h>

#include <toml++/toml.h>
#include <algorithm>
#include <sstream>

namespace gapflux {

struct TableReader::Document {
  toml::table root;
  SourceMap* sources = nullptr;
  std::string file;
};

namespace {

SourcePos to_pos(const toml::source_region& region) {
  return {static_cast<int>(region.begin.line), static_cast<int>(region.begin.column)};
}

const char* type_name(const toml::node& n) {
  switch (n.type()) {
    case toml::node_type::table:
      return "a table";
    case toml::node_type::array:
      return "an array";
    case toml::node_type::string:
      return "a string";
    case toml::node_type::integer:
      return "an integer";
    case toml::node_type::floating_point:
      return "a number";
    case toml::node_type::boolean:
      return "a boolean";
    default:
      return "a date or time";
  }
}

}  // namespace

TableReader TableReader::parse_root(std::string_view text, const std::string& file,
                                    SourceMap& sources) {
  auto doc = std::make_shared<Document>();
  doc->sources = &sources;
  doc->file = file;
  try {
    doc->root = toml::parse(text, std::string_view(file));
  } catch (const toml::parse_error& e) {
    throw InputError(file, to_pos(e.source()), "",
                     fmt::format("not valid TOML: {}", e.description()));
  }
  const void* root = &doc->root;
  return TableReader(std::move(doc), root, "", SourcePos{1, 1});
}

TableReader::TableReader(std::shared_ptr<const Document> doc, const void* table, std::string path,
                         SourcePos pos)
    : doc_(std::move(doc)), table_(table), path_(std::move(path)), pos_(pos) {
  if (!path_.empty()) doc_->sources->record(path_, pos_);
}

std::string TableReader::key_path(const std::string& key) const {
  return path_.empty() ? key : path_ + "." + key;
}

const void* TableReader::node(const std::string& key) const {
  return static_cast<const toml::table*>(table_)->get(key);
}

bool TableReader::has(const std::string& key) const {
  return node(key) != nullptr;
}

SourcePos TableReader::pos() const {
  return pos_;
}

SourcePos TableReader::pos_of(const std::string& key) const {
  const auto* n = static_cast<const toml::node*>(node(key));
  return n ? to_pos(n->source()) : pos_;
}

void TableReader::mark(const std::string& key) {
  known_.push_back(key);
  if (has(key)) doc_->sources->record(key_path(key), pos_of(key));
}

InputError TableReader::error(const std::string& key, const std::string& message) const {
  return InputError(doc_->file, pos_of(key), key_path(key), message);
}

InputError TableReader::missing(const std::string& key, const std::string& what,
                                bool key_is_table) const {
  // A required key that is absent is most often misspelt: point at the misspelling instead.
  for (const auto& [k, v] : *static_cast<const toml::table*>(table_)) {
    const std::string present(k.str());
    if (std::find(known_.begin(), known_.end(), present) != known_.end()) continue;
    if (v.is_table() != key_is_table) continue;  // [stator.slot] is no misspelt `slots`
    if (nearest_of(present, {key}) == key)
      return error(present, fmt::format("unknown key; did you mean '{}'?", key));
  }
  const std::string table = path_.empty() ? "the top level" : fmt::format("table [{}]", path_);
  return InputError(doc_->file, pos_, key_path(key),
                    fmt::format("required key is missing from {}; give {}", table, what));
}

std::optional<double> TableReader::number(const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  if (auto v = n->value_exact<double>()) return *v;
  if (auto v = n->value_exact<int64_t>()) return static_cast<double>(*v);
  throw error(key, fmt::format("expected a number, found {}", type_name(*n)));
}

std::optional<long long> TableReader::integer(const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  if (auto v = n->value_exact<int64_t>()) return *v;
  throw error(key, fmt::format("expected an integer, found {}", type_name(*n)));
}

std::optional<std::string> TableReader::string(const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  if (auto v = n->value_exact<std::string>()) return *v;
  throw error(key, fmt::format("expected a string, found {}", type_name(*n)));
}

std::optional<bool> TableReader::boolean(const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  if (auto v = n->value_exact<bool>()) return *v;
  throw error(key, fmt::format("expected true or false, found {}", type_name(*n)));
}

std::optional<std::vector<double>> TableReader::number_array(const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  const auto* array = n->as_array();
  if (!array)
    throw error(key, fmt::format("expected an array of numbers, found {}", type_name(*n)));
  std::vector<double> out;
  for (const auto& item : *array) {
    if (auto v = item.value_exact<double>())
      out.push_back(*v);
    else if (auto i = item.value_exact<int64_t>())
      out.push_back(static_cast<double>(*i));
    else
      throw InputError(doc_->file, to_pos(item.source()), key_path(key),
                       fmt::format("expected numbers only, found {}", type_name(item)));
  }
  return out;
}

std::optional<std::vector<std::string>> TableReader::string_array(const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  const auto* array = n->as_array();
  if (!array)
    throw error(key, fmt::format("expected an array of strings, found {}", type_name(*n)));
  std::vector<std::string> out;
  for (const auto& item : *array) {
    const auto v = item.value_exact<std::string>();
    if (!v)
      throw InputError(doc_->file, to_pos(item.source()), key_path(key),
                       fmt::format("expected strings only, found {}", type_name(item)));
    out.push_back(*v);
  }
  return out;
}

std::optional<std::vector<std::pair<SweepValue, SourcePos>>> TableReader::scalar_array(
    const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  const auto* array = n->as_array();
  if (!array) throw error(key, fmt::format("expected an array of values, found {}", type_name(*n)));
  std::vector<std::pair<SweepValue, SourcePos>> out;
  for (const auto& item : *array) {
    SweepValue v;
    if (auto d = item.value_exact<double>()) {
      v.kind = SweepValue::Kind::number;
      v.number = *d;
    } else if (auto i = item.value_exact<int64_t>()) {
      v.kind = SweepValue::Kind::integer;
      v.integer = *i;
      v.number = static_cast<double>(*i);
    } else if (auto t = item.value_exact<std::string>()) {
      v.kind = SweepValue::Kind::text;
      v.text = *t;
    } else if (auto b = item.value_exact<bool>()) {
      v.kind = SweepValue::Kind::flag;
      v.flag = *b;
    } else {
      throw InputError(
          doc_->file, to_pos(item.source()), key_path(key),
          fmt::format("expected numbers, strings or booleans, found {}", type_name(item)));
    }
    const bool numeric = v.kind == SweepValue::Kind::number || v.kind == SweepValue::Kind::integer;
    if (!out.empty()) {
      const SweepValue& first = out.front().first;
      const bool first_numeric =
          first.kind == SweepValue::Kind::number || first.kind == SweepValue::Kind::integer;
      if (numeric != first_numeric || (!numeric && v.kind != first.kind))
        throw InputError(doc_->file, to_pos(item.source()), key_path(key),
                         "the values of one key must all be of one kind (numbers, strings or "
                         "booleans)");
    }
    out.emplace_back(v, to_pos(item.source()));
  }
  return out;
}

std::vector<std::string> TableReader::keys() const {
  std::vector<std::string> out;
  for (const auto& [k, v] : *static_cast<const toml::table*>(table_)) out.emplace_back(k.str());
  return out;
}

std::optional<TableReader> TableReader::table(const std::string& key) {
  mark(key);
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return std::nullopt;
  if (const auto* t = n->as_table())
    return TableReader(doc_, t, key_path(key), to_pos(t->source()));
  throw error(key, fmt::format("expected a table, found {}", type_name(*n)));
}

std::vector<TableReader> TableReader::table_array(const std::string& key) {
  mark(key);
  std::vector<TableReader> out;
  const auto* n = static_cast<const toml::node*>(node(key));
  if (!n) return out;
  const auto* array = n->as_array();
  if (!array)
    throw error(key, fmt::format("expected an array of tables ([[{}]]), found {}", key_path(key),
                                 type_name(*n)));
  for (std::size_t i = 0; i < array->size(); ++i) {
    const auto* t = (*array)[i].as_table();
    if (!t)
      throw InputError(doc_->file, to_pos((*array)[i].source()), key_path(key),
                       fmt::format("expected tables only, found {}", type_name((*array)[i])));
    out.push_back(
        TableReader(doc_, t, fmt::format("{}[{}]", key_path(key), i), to_pos(t->source())));
  }
  return out;
}

void TableReader::finish(
    const std::vector<std::pair<std::string, std::string>>& not_applicable) const {
  for (const auto& [k, v] : *static_cast<const toml::table*>(table_)) {
    const std::string key(k.str());
    if (std::find(known_.begin(), known_.end(), key) != known_.end()) continue;
    for (const auto& [name, reason] : not_applicable)
      if (name == key) throw error(key, fmt::format("does not apply here: {}", reason));
    std::vector<std::string> candidates = known_;
    for (const auto& [name, reason] : not_applicable) candidates.push_back(name);
    const std::string guess = nearest_of(key, candidates);
    const std::string table = path_.empty() ? "at the top level" : fmt::format("in [{}]", path_);
    std::string msg = fmt::format("unknown key {}", table);
    if (!guess.empty()) msg += fmt::format("; did you mean '{}'?", guess);
    std::vector<std::string> sorted = known_;
    std::sort(sorted.begin(), sorted.end());
    sorted.erase(std::unique(sorted.begin(), sorted.end()), sorted.end());
    msg += fmt::format(" (known keys: {})", fmt::join(sorted, ", "));
    throw error(key, msg);
  }
}

std::size_t edit_distance(std::string_view a, std::string_view b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t above = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diagonal = above;
    }
  }
  return row[b.size()];
}

std::string nearest_of(std::string_view word, const std::vector<std::string>& candidates) {
  std::string best;
  std::size_t best_distance = std::max<std::size_t>(3, word.size() / 3) + 1;
  for (const auto& c : candidates) {
    const std::size_t d = edit_distance(word, c);
    if (d < best_distance) {
      best_distance = d;
      best = c;
    }
  }
  return best;
}

}  // namespace gapflux

namespace gapflux {
namespace {

void flatten_into(const toml::node& n, const std::string& path, std::vector<std::string>& out) {
  if (const auto* t = n.as_table()) {
    for (const auto& [k, v] : *t)
      flatten_into(v, path.empty() ? std::string(k.str()) : path + "." + std::string(k.str()), out);
    return;
  }
  if (const auto* a = n.as_array(); a && a->is_array_of_tables()) {
    for (std::size_t i = 0; i < a->size(); ++i)
      flatten_into((*a)[i], fmt::format("{}[{}]", path, i), out);
    return;
  }
  if (const auto v = n.value_exact<double>()) {
    out.push_back(fmt::format("{} = {}", path, *v));  // shortest form that reads back exactly
    return;
  }
  std::ostringstream value;
  value << toml::toml_formatter(n);
  out.push_back(path + " = " + value.str());
}

}  // namespace

std::vector<std::string> flatten_toml(std::string_view text, const std::string& file) {
  toml::table root;
  try {
    root = toml::parse(text, std::string_view(file));
  } catch (const toml::parse_error& e) {
    throw InputError(file, to_pos(e.source()), "",
                     fmt::format("not valid TOML: {}", e.description()));
  }
  std::vector<std::string> out;
  flatten_into(root, "", out);
  std::sort(out.begin(), out.end());
  return out;
}

}  // namespace gapflux
