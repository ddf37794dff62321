#include "postproc/results_file.hpp"

#include <H5Cpp.h>
#include <fmt/format.h>

#include <algorithm>
#include <stdexcept>

#include "postproc/output_file.hpp"

namespace gapflux {

struct ResultsFile::State {
  H5::H5File file;
  std::string path;
};

namespace {

// Runs one HDF5 operation; HDF5's C++ exceptions do not derive from std::exception, so each
// becomes an OutputError naming the file, what was being done and, if so, the full disk.
template <typename F>
auto guarded(const std::string& file, const std::string& what, F f) {
  try {
    return f();
  } catch (const H5::Exception& e) {
    throw OutputError(file, fmt::format("{}: {}{}", what, e.getDetailMsg(), disk_full_hint(file)));
  }
}

// Whether every component of `path` exists (H5Lexists fails on a missing intermediate group).
bool path_exists(H5::H5File& file, const std::string& path) {
  std::size_t at = 0;
  while (true) {
    const auto slash = path.find('/', at);
    const std::string prefix = slash == std::string::npos ? path : path.substr(0, slash);
    if (!prefix.empty() && !file.nameExists(prefix)) return false;
    if (slash == std::string::npos) return true;
    at = slash + 1;
  }
}

// Creates the groups on the way to `path`; returns the dataset's own name.
std::string ensure_groups(H5::H5File& file, const std::string& path) {
  std::size_t at = 0;
  while (true) {
    const auto slash = path.find('/', at);
    if (slash == std::string::npos) return path;
    const std::string group = path.substr(0, slash);
    if (!path_exists(file, group)) file.createGroup(group);
    at = slash + 1;
  }
}

// Calls f with the group or dataset at `object` ("" or "/" for the root group).
template <typename F>
void with_object(H5::H5File& file, const std::string& object, F f) {
  if (object.empty() || object == "/") {
    H5::Group root = file.openGroup("/");
    f(root);
    return;
  }
  H5O_info_t info;
  H5Oget_info_by_name(file.getId(), object.c_str(), &info, H5P_DEFAULT);
  if (info.type == H5O_TYPE_GROUP) {
    H5::Group g = file.openGroup(object);
    f(g);
  } else {
    H5::DataSet d = file.openDataSet(object);
    f(d);
  }
}

// Level 4: most of deflate's gain on floating-point fields at a fraction of level 9's time.
constexpr int deflate_level = 4;
constexpr std::size_t compress_from_values = 4096;

template <typename T>
void write_dataset(H5::H5File& file, const std::string& path, const std::vector<T>& data,
                   const H5::PredType& type, const std::string& units, std::size_t columns) {
  ensure_groups(file, path);
  if (path_exists(file, path)) file.unlink(path);
  const hsize_t rows = columns ? data.size() / columns : 0;
  const hsize_t dims[2] = {rows, columns};
  const int rank = columns > 1 ? 2 : 1;
  H5::DataSpace space(rank, dims);
  H5::DSetCreatPropList props;
  if (data.size() >= compress_from_values) {
    // Chunks of about 64 k values, shuffled and deflated (field data shrinks by a third or
    // more; the short tables stay contiguous, where chunk headers would cost more).
    const hsize_t chunk[2] = {std::clamp<hsize_t>(65536 / std::max<hsize_t>(columns, 1), 1, rows),
                              columns};
    props.setChunk(rank, chunk);
    props.setShuffle();
    props.setDeflate(deflate_level);
  }
  H5::DataSet set = file.createDataSet(path, type, space, props);
  if (!data.empty()) set.write(data.data(), type);
  H5::StrType str(H5::PredType::C_S1, units.size() + 1);
  set.createAttribute("units", str, H5::DataSpace(H5S_SCALAR)).write(str, units.c_str());
  set.close();  // a failure to write back surfaces here, not in a destructor that ignores it
}

}  // namespace

ResultsFile::ResultsFile(const std::string& path) : state_(std::make_unique<State>()) {
  H5::Exception::dontPrint();  // errors become exceptions with their own message
  state_->path = path;
  guarded(path, "create", [&] { state_->file = H5::H5File(path, H5F_ACC_TRUNC); });
}

ResultsFile::~ResultsFile() {
  try {
    state_->file.close();
  } catch (...) {
  }
}

void ResultsFile::write(const std::string& path, const std::vector<double>& data,
                        const std::string& units, std::size_t columns) {
  guarded(state_->path, "write " + path, [&] {
    write_dataset(state_->file, path, data, H5::PredType::NATIVE_DOUBLE, units, columns);
  });
}

void ResultsFile::write(const std::string& path, const std::vector<int>& data,
                        const std::string& units, std::size_t columns) {
  guarded(state_->path, "write " + path, [&] {
    write_dataset(state_->file, path, data, H5::PredType::NATIVE_INT, units, columns);
  });
}

void ResultsFile::write_strings(const std::string& path, const std::vector<std::string>& data) {
  guarded(state_->path, "write " + path, [&] { write_strings_unguarded(path, data); });
}

void ResultsFile::write_strings_unguarded(const std::string& path,
                                          const std::vector<std::string>& data) {
  H5::H5File& file = state_->file;
  ensure_groups(file, path);
  if (path_exists(file, path)) file.unlink(path);
  H5::StrType type(H5::PredType::C_S1, H5T_VARIABLE);
  const hsize_t dims[1] = {data.size()};
  H5::DataSet set = file.createDataSet(path, type, H5::DataSpace(1, dims));
  std::vector<const char*> pointers;
  for (const auto& s : data) pointers.push_back(s.c_str());
  if (!data.empty()) set.write(pointers.data(), type);
  H5::StrType str(H5::PredType::C_S1, 2);
  set.createAttribute("units", str, H5::DataSpace(H5S_SCALAR)).write(str, "1");
  set.close();
}

void ResultsFile::attribute(const std::string& object, const std::string& name,
                            const std::string& value) {
  guarded(state_->path, "write attribute " + name, [&] {
    with_object(state_->file, object, [&](H5::H5Object& o) {
      if (o.attrExists(name)) o.removeAttr(name);
      H5::StrType str(H5::PredType::C_S1, value.size() + 1);
      o.createAttribute(name, str, H5::DataSpace(H5S_SCALAR)).write(str, value.c_str());
    });
  });
}

void ResultsFile::attribute(const std::string& object, const std::string& name, double value) {
  guarded(state_->path, "write attribute " + name, [&] {
    with_object(state_->file, object, [&](H5::H5Object& o) {
      if (o.attrExists(name)) o.removeAttr(name);
      o.createAttribute(name, H5::PredType::NATIVE_DOUBLE, H5::DataSpace(H5S_SCALAR))
          .write(H5::PredType::NATIVE_DOUBLE, &value);
    });
  });
}

void ResultsFile::attribute(const std::string& object, const std::string& name, long value) {
  guarded(state_->path, "write attribute " + name, [&] {
    with_object(state_->file, object, [&](H5::H5Object& o) {
      if (o.attrExists(name)) o.removeAttr(name);
      o.createAttribute(name, H5::PredType::NATIVE_LONG, H5::DataSpace(H5S_SCALAR))
          .write(H5::PredType::NATIVE_LONG, &value);
    });
  });
}

std::unique_ptr<ResultsFile> ResultsFile::open_existing(const std::string& path) {
  std::unique_ptr<ResultsFile> f(new ResultsFile());
  f->state_ = std::make_unique<State>();
  f->state_->path = path;
  H5::Exception::dontPrint();
  try {
    f->state_->file = H5::H5File(path, H5F_ACC_RDWR);
  } catch (const H5::Exception& e) {
    throw OutputError(path, "cannot open it to resume: " + e.getDetailMsg());
  }
  return f;
}

bool ResultsFile::exists(const std::string& path) const {
  return guarded(state_->path, "read " + path, [&] { return path_exists(state_->file, path); });
}

std::vector<std::string> ResultsFile::members(const std::string& group) const {
  return guarded(state_->path, "read " + group, [&] {
    std::vector<std::string> out;
    if (!path_exists(state_->file, group)) return out;
    H5::Group g = state_->file.openGroup(group);
    for (hsize_t i = 0; i < g.getNumObjs(); ++i) out.push_back(g.getObjnameByIdx(i));
    return out;
  });
}

void ResultsFile::append_row(const std::string& path, const std::vector<double>& row,
                             const std::string& units) {
  guarded(state_->path, "append a row to " + path, [&] { append_row_unguarded(path, row, units); });
}

void ResultsFile::append_row_unguarded(const std::string& path, const std::vector<double>& row,
                                       const std::string& units) {
  H5::H5File& file = state_->file;
  const hsize_t width = row.size();
  if (!path_exists(file, path)) {
    ensure_groups(file, path);
    const hsize_t dims[2] = {0, width}, max_dims[2] = {H5S_UNLIMITED, width};
    H5::DataSpace space(2, dims, max_dims);
    H5::DSetCreatPropList props;
    // A wide row (a field over the mesh or the air gap) is its own chunk, compressed; narrow
    // rows (time, torque, currents) share chunks of about 512 values.
    const hsize_t chunk_rows =
        width >= 64 ? 1 : std::max<hsize_t>(1, 512 / std::max<hsize_t>(width, 1));
    const hsize_t chunk[2] = {chunk_rows, std::max<hsize_t>(1, width)};
    props.setChunk(2, chunk);
    if (width >= 64) {
      props.setShuffle();
      props.setDeflate(deflate_level);
    }
    H5::DataSet set = file.createDataSet(path, H5::PredType::NATIVE_DOUBLE, space, props);
    H5::StrType str(H5::PredType::C_S1, units.size() + 1);
    set.createAttribute("units", str, H5::DataSpace(H5S_SCALAR)).write(str, units.c_str());
  }
  H5::DataSet set = file.openDataSet(path);
  hsize_t dims[2];
  set.getSpace().getSimpleExtentDims(dims);
  if (dims[1] != width) throw std::runtime_error("row of the wrong length for " + path);
  const hsize_t grown[2] = {dims[0] + 1, width};
  set.extend(grown);
  H5::DataSpace space = set.getSpace();
  const hsize_t start[2] = {dims[0], 0}, count[2] = {1, width};
  space.selectHyperslab(H5S_SELECT_SET, count, start);
  H5::DataSpace memory(2, count);
  set.write(row.data(), H5::PredType::NATIVE_DOUBLE, memory, space);
  set.close();  // writes the chunk back now, so a full disk is reported for this row
}

std::size_t ResultsFile::rows(const std::string& path) const {
  return guarded(state_->path, "read " + path, [&]() -> std::size_t {
    if (!path_exists(state_->file, path)) return 0;
    hsize_t dims[2] = {0, 0};
    state_->file.openDataSet(path).getSpace().getSimpleExtentDims(dims);
    return dims[0];
  });
}

void ResultsFile::truncate_rows(const std::string& path, std::size_t rows) {
  guarded(state_->path, "truncate " + path, [&] {
    if (!path_exists(state_->file, path)) return;
    H5::DataSet set = state_->file.openDataSet(path);
    hsize_t dims[2];
    set.getSpace().getSimpleExtentDims(dims);
    if (dims[0] <= rows) return;
    const hsize_t kept[2] = {rows, dims[1]};
    set.extend(kept);
    set.close();
  });
}

std::vector<double> ResultsFile::read(const std::string& path) const {
  return guarded(state_->path, "read " + path, [&] {
    H5::DataSet set = state_->file.openDataSet(path);
    const hssize_t n = set.getSpace().getSimpleExtentNpoints();
    std::vector<double> out(static_cast<std::size_t>(n));
    if (n > 0) set.read(out.data(), H5::PredType::NATIVE_DOUBLE);
    return out;
  });
}

std::vector<std::string> ResultsFile::read_strings(const std::string& path) const {
  return guarded(state_->path, "read " + path, [&] {
    H5::DataSet set = state_->file.openDataSet(path);
    const hssize_t n = set.getSpace().getSimpleExtentNpoints();
    H5::StrType type(H5::PredType::C_S1, H5T_VARIABLE);
    std::vector<char*> pointers(static_cast<std::size_t>(n), nullptr);
    if (n > 0) set.read(pointers.data(), type);
    std::vector<std::string> out;
    for (char* p : pointers) {
      out.emplace_back(p ? p : "");
      std::free(p);  // HDF5 allocates variable-length strings with malloc
    }
    return out;
  });
}

long ResultsFile::read_long_attribute(const std::string& object, const std::string& name) const {
  long value = 0;
  guarded(state_->path, "read attribute " + name, [&] {
    with_object(state_->file, object, [&](H5::H5Object& o) {
      o.openAttribute(name).read(H5::PredType::NATIVE_LONG, &value);
    });
  });
  return value;
}

bool ResultsFile::has_attribute(const std::string& object, const std::string& name) const {
  bool found = false;
  guarded(state_->path, "look for attribute " + name, [&] {
    with_object(state_->file, object, [&](H5::H5Object& o) { found = o.attrExists(name); });
  });
  return found;
}

std::string ResultsFile::read_string_attribute(const std::string& object,
                                               const std::string& name) const {
  std::string value;
  guarded(state_->path, "read attribute " + name, [&] {
    with_object(state_->file, object, [&](H5::H5Object& o) {
      if (!o.attrExists(name)) return;
      H5::Attribute a = o.openAttribute(name);
      a.read(a.getStrType(), value);
    });
  });
  return value;
}

void ResultsFile::flush() {
  guarded(state_->path, "flush", [&] { state_->file.flush(H5F_SCOPE_GLOBAL); });
}

}  // namespace gapflux
