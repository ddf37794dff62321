#pragma once
// Errors in user input (case files, tables, CSV): always carry file, line, column and key path,
// and say what would be valid. The CLI turns them into exit code 2.
#include <map>
#include <stdexcept>
#include <string>
#include <string_view>

namespace gapflux {

struct SourcePos {
  int line = 0;    // 1-based; 0 when unknown
  int column = 0;  // 1-based; 0 when unknown
};

// A user's text as it may be echoed in a message or a printout: in double quotes, with
// quotes, backslashes and control characters (newlines, escape sequences) escaped as TOML
// writes them, so that a value can never break a message's line or a terminal's state.
std::string quote_text(std::string_view text);

class InputError : public std::runtime_error {
 public:
  InputError(std::string file, SourcePos pos, std::string key_path, std::string message);

  const std::string& file() const { return file_; }
  SourcePos pos() const { return pos_; }
  const std::string& key_path() const { return key_path_; }
  const std::string& message() const { return message_; }

 private:
  std::string file_;
  SourcePos pos_;
  std::string key_path_;
  std::string message_;
};

// Where each key of a case file was written, so that checks made long after parsing
// (geometry, materials, supply) can still point at the line.
class SourceMap {
 public:
  SourceMap() = default;
  explicit SourceMap(std::string file) : file_(std::move(file)) {}

  void record(const std::string& key_path, SourcePos pos) { positions_[key_path] = pos; }
  // Position of the key, else of its nearest enclosing table that was written, else 0:0.
  SourcePos find(const std::string& key_path) const;
  const std::string& file() const { return file_; }

  // The error a later check raises about `key_path`.
  [[nodiscard]] InputError error(const std::string& key_path, const std::string& message) const;

 private:
  std::string file_;
  std::map<std::string, SourcePos> positions_;
};

}  // namespace gapflux
