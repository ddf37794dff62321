#include "cases/input_error.hpp"

#include <fmt/format.h>

namespace gapflux {

std::string quote_text(std::string_view text) {
  std::string out = "\"";
  for (unsigned char ch : text) {
    switch (ch) {
      case '"':
        out += "\\\"";
        break;
      case '\\':
        out += "\\\\";
        break;
      case '\n':
        out += "\\n";
        break;
      case '\t':
        out += "\\t";
        break;
      case '\r':
        out += "\\r";
        break;
      default:
        if (ch < 0x20 || ch == 0x7f)
          out += fmt::format("\\u{:04X}", static_cast<unsigned>(ch));
        else
          out += static_cast<char>(ch);
    }
  }
  return out + "\"";
}

namespace {

// A key path comes from the user's file too (quoted TOML keys may hold anything).
std::string printable_key(const std::string& key_path) {
  for (unsigned char ch : key_path)
    if (ch < 0x20 || ch == 0x7f) return quote_text(key_path);
  return key_path;
}

std::string format_error(const std::string& file, SourcePos pos, const std::string& key_path,
                         const std::string& message) {
  const std::string where =
      pos.line > 0 ? fmt::format("{}:{}:{}", file, pos.line, pos.column) : fmt::format("{}", file);
  if (key_path.empty()) return fmt::format("{}: error: {}", where, message);
  return fmt::format("{}: error: {}: {}", where, printable_key(key_path), message);
}

}  // namespace

InputError::InputError(std::string file, SourcePos pos, std::string key_path, std::string message)
    : std::runtime_error(format_error(file, pos, key_path, message)),
      file_(std::move(file)),
      pos_(pos),
      key_path_(std::move(key_path)),
      message_(std::move(message)) {}

SourcePos SourceMap::find(const std::string& key_path) const {
  std::string path = key_path;
  while (true) {
    if (auto it = positions_.find(path); it != positions_.end()) return it->second;
    const auto dot = path.find_last_of('.');
    if (dot == std::string::npos) return {};
    path.resize(dot);
  }
}

InputError SourceMap::error(const std::string& key_path, const std::string& message) const {
  return InputError(file_, find(key_path), key_path, message);
}

}  // namespace gapflux
