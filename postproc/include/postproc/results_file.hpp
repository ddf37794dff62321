#pragma once
// results.h5 (the only file that sees HDF5 is results_file.cpp). Every dataset carries a
// `units` attribute; the file is flushed after each write so that what is written stays
// readable if the run is killed. Layout: docs/results.md. Every operation that fails throws
// OutputError (postproc/output_file.hpp) naming the file; nothing is left to a destructor.
#include <memory>
#include <string>
#include <vector>

namespace gapflux {

class ResultsFile {
 public:
  explicit ResultsFile(const std::string& path);  // creates (truncates) the file
  // Opens an existing file for appending (resuming a run); throws if it cannot.
  static std::unique_ptr<ResultsFile> open_existing(const std::string& path);
  ~ResultsFile();
  ResultsFile(const ResultsFile&) = delete;
  ResultsFile& operator=(const ResultsFile&) = delete;

  // `path` like "field/B_tesla"; groups are created as needed. `columns` > 1 makes a 2-D
  // dataset of rows × columns (row-major data).
  void write(const std::string& path, const std::vector<double>& data, const std::string& units,
             std::size_t columns = 1);
  void write(const std::string& path, const std::vector<int>& data, const std::string& units,
             std::size_t columns = 1);
  void write_strings(const std::string& path, const std::vector<std::string>& data);
  void attribute(const std::string& object, const std::string& name, const std::string& value);
  void attribute(const std::string& object, const std::string& name, double value);
  void attribute(const std::string& object, const std::string& name, long value);
  // Per-step rows: a 2-D dataset (rows × row size) that grows by one row per call.
  void append_row(const std::string& path, const std::vector<double>& row,
                  const std::string& units);
  // Rows kept so far; 0 if the dataset does not exist.
  std::size_t rows(const std::string& path) const;
  // Drops rows past `rows` (a run killed between its appends and its `steps_done` update).
  void truncate_rows(const std::string& path, std::size_t rows);
  std::vector<double> read(const std::string& path) const;
  std::vector<std::string> read_strings(const std::string& path) const;
  long read_long_attribute(const std::string& object, const std::string& name) const;
  bool has_attribute(const std::string& object, const std::string& name) const;
  // "" when the attribute is absent.
  std::string read_string_attribute(const std::string& object, const std::string& name) const;
  bool exists(const std::string& path) const;
  // Names of the objects in a group (empty if the group does not exist).
  std::vector<std::string> members(const std::string& group) const;
  void flush();

 private:
  ResultsFile() = default;
  void append_row_unguarded(const std::string& path, const std::vector<double>& row,
                            const std::string& units);
  void write_strings_unguarded(const std::string& path, const std::vector<std::string>& data);
  struct State;
  std::unique_ptr<State> state_;
};

}  // namespace gapflux
