// case_text_with: a case file's text with some keys set to new values (the sweep's cases). Like
// table_reader.cpp, one of the few places that see TOML++.
#include <fmt/format.h>

#include <toml++/toml.h>
#include <charconv>
#include <filesystem>
#include <sstream>

#include "cases/sweep_file.hpp"

namespace gapflux {
namespace {

struct KeyPart {
  std::string name;
  int index = -1;  // name[index]: an element of an array of tables
};

std::vector<KeyPart> split_key(const std::string& key, const std::string& file) {
  std::vector<KeyPart> parts;
  std::size_t start = 0;
  while (start <= key.size()) {
    const std::size_t dot = key.find('.', start);
    std::string word =
        key.substr(start, dot == std::string::npos ? std::string::npos : dot - start);
    KeyPart p;
    if (const std::size_t open = word.find('['); open != std::string::npos) {
      const std::size_t close = word.find(']', open);
      int index = -1;
      const char* first = word.data() + open + 1;
      const char* last = word.data() + (close == std::string::npos ? word.size() : close);
      const auto [end, ec] = std::from_chars(first, last, index);
      if (close != word.size() - 1 || ec != std::errc() || end != last || index < 0)
        throw InputError(
            file, {}, key,
            fmt::format("{} is not name[index] with a whole index ≥ 0", quote_text(word)));
      p.index = index;
      word.resize(open);
    }
    if (word.empty()) throw InputError(file, {}, key, "has an empty part between dots");
    p.name = word;
    parts.push_back(p);
    if (dot == std::string::npos) break;
    start = dot + 1;
  }
  return parts;
}

void assign(toml::table& t, const std::string& name, const SweepValue& v) {
  switch (v.kind) {
    case SweepValue::Kind::number:
      t.insert_or_assign(name, v.number);
      break;
    case SweepValue::Kind::integer:
      t.insert_or_assign(name, static_cast<int64_t>(v.integer));
      break;
    case SweepValue::Kind::text:
      t.insert_or_assign(name, v.text);
      break;
    case SweepValue::Kind::flag:
      t.insert_or_assign(name, v.flag);
      break;
  }
}

}  // namespace

std::string case_text_with(std::string_view base_text, const std::string& base_file,
                           const std::vector<std::pair<std::string, SweepValue>>& settings,
                           const std::string& case_dir) {
  toml::table root;
  try {
    root = toml::parse(base_text, std::string_view(base_file));
  } catch (const toml::parse_error& e) {
    throw InputError(
        base_file,
        {static_cast<int>(e.source().begin.line), static_cast<int>(e.source().begin.column)}, "",
        fmt::format("not valid TOML: {}", e.description()));
  }
  for (const auto& [key, value] : settings) {
    const std::vector<KeyPart> parts = split_key(key, base_file);
    toml::table* t = &root;
    std::string walked;
    for (std::size_t i = 0; i + 1 < parts.size(); ++i) {
      const KeyPart& p = parts[i];
      walked += (walked.empty() ? "" : ".") + p.name;
      toml::node* n = t->get(p.name);
      if (p.index >= 0) {
        toml::array* a = n ? n->as_array() : nullptr;
        toml::table* element =
            a && p.index < static_cast<int>(a->size()) ? (*a)[p.index].as_table() : nullptr;
        if (!element)
          throw InputError(base_file, {}, key,
                           fmt::format("the base case has no table {}[{}] ([[{}]] number {})",
                                       walked, p.index, walked, p.index + 1));
        t = element;
        walked += fmt::format("[{}]", p.index);
        continue;
      }
      if (!n) {
        t->insert(p.name, toml::table{});
        n = t->get(p.name);
      }
      if (!n->is_table())
        throw InputError(base_file, {}, key,
                         fmt::format("{} is a value in the base case, not a table that could "
                                     "hold {}",
                                     walked, parts[i + 1].name));
      t = n->as_table();
    }
    if (parts.back().index >= 0)
      throw InputError(base_file, {}, key, "the varied key must name a value, not an element");
    if (toml::node* n = t->get(parts.back().name); n && (n->is_table() || n->is_array_of_tables()))
      throw InputError(base_file, {}, key,
                       "names a table in the base case; vary one of its values instead");
    assign(*t, parts.back().name, value);
  }
  // A measured supply table named relative to the base case must still be found from the
  // generated case's folder.
  if (toml::table* waveform = root["supply"]["waveform"].as_table())
    if (auto file = (*waveform)["file"].value<std::string>()) {
      const std::filesystem::path given(*file);
      if (given.is_relative()) {
        const std::filesystem::path absolute =
            std::filesystem::absolute(std::filesystem::path(base_file).parent_path() / given);
        const std::filesystem::path rel =
            absolute.lexically_relative(std::filesystem::absolute(case_dir));
        waveform->insert_or_assign("file", rel.empty() ? absolute.string() : rel.string());
      }
    }
  std::ostringstream out;
  out << root << "\n";
  return out.str();
}

}  // namespace gapflux
