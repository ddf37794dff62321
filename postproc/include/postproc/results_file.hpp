#pragma once
// results.h5 (the only file that sees HDF5 is results_file.cpp). Every dataset carries a
// `units` attribute; the file is flushed after each write so that what is written stays
// readable if the run is killed. Layout: docs/results.md.
#include <memory>
#include <string>
#include <vector>

namespace gapflux {

class ResultsFile {
 public:
  explicit ResultsFile(const std::string& path);  // creates (truncates) the file
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
  void flush();

 private:
  struct State;
  std::unique_ptr<State> state_;
};

}  // namespace gapflux
