#include "postproc/results_file.hpp"

#include <H5Cpp.h>

#include <stdexcept>

namespace gapflux {

struct ResultsFile::State {
  H5::H5File file;
};

namespace {

// Creates the groups on the way to `path`; returns the dataset's own name.
std::string ensure_groups(H5::H5File& file, const std::string& path) {
  std::size_t at = 0;
  while (true) {
    const auto slash = path.find('/', at);
    if (slash == std::string::npos) return path;
    const std::string group = path.substr(0, slash);
    if (!file.nameExists(group)) file.createGroup(group);
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

template <typename T>
void write_dataset(H5::H5File& file, const std::string& path, const std::vector<T>& data,
                   const H5::PredType& type, const std::string& units, std::size_t columns) {
  ensure_groups(file, path);
  if (file.nameExists(path)) file.unlink(path);
  const hsize_t rows = columns ? data.size() / columns : 0;
  const hsize_t dims[2] = {rows, columns};
  H5::DataSpace space(columns > 1 ? 2 : 1, dims);
  H5::DataSet set = file.createDataSet(path, type, space);
  if (!data.empty()) set.write(data.data(), type);
  H5::StrType str(H5::PredType::C_S1, units.size() + 1);
  set.createAttribute("units", str, H5::DataSpace(H5S_SCALAR)).write(str, units.c_str());
}

}  // namespace

ResultsFile::ResultsFile(const std::string& path) : state_(std::make_unique<State>()) {
  try {
    state_->file = H5::H5File(path, H5F_ACC_TRUNC);
  } catch (const H5::Exception& e) {
    throw std::runtime_error("cannot create " + path + ": " + e.getDetailMsg());
  }
}

ResultsFile::~ResultsFile() {
  try {
    state_->file.close();
  } catch (...) {
  }
}

void ResultsFile::write(const std::string& path, const std::vector<double>& data,
                        const std::string& units, std::size_t columns) {
  write_dataset(state_->file, path, data, H5::PredType::NATIVE_DOUBLE, units, columns);
}

void ResultsFile::write(const std::string& path, const std::vector<int>& data,
                        const std::string& units, std::size_t columns) {
  write_dataset(state_->file, path, data, H5::PredType::NATIVE_INT, units, columns);
}

void ResultsFile::write_strings(const std::string& path, const std::vector<std::string>& data) {
  H5::H5File& file = state_->file;
  ensure_groups(file, path);
  if (file.nameExists(path)) file.unlink(path);
  H5::StrType type(H5::PredType::C_S1, H5T_VARIABLE);
  const hsize_t dims[1] = {data.size()};
  H5::DataSet set = file.createDataSet(path, type, H5::DataSpace(1, dims));
  std::vector<const char*> pointers;
  for (const auto& s : data) pointers.push_back(s.c_str());
  if (!data.empty()) set.write(pointers.data(), type);
  H5::StrType str(H5::PredType::C_S1, 2);
  set.createAttribute("units", str, H5::DataSpace(H5S_SCALAR)).write(str, "1");
}

void ResultsFile::attribute(const std::string& object, const std::string& name,
                            const std::string& value) {
  with_object(state_->file, object, [&](H5::H5Object& o) {
    if (o.attrExists(name)) o.removeAttr(name);
    H5::StrType str(H5::PredType::C_S1, value.size() + 1);
    o.createAttribute(name, str, H5::DataSpace(H5S_SCALAR)).write(str, value.c_str());
  });
}

void ResultsFile::attribute(const std::string& object, const std::string& name, double value) {
  with_object(state_->file, object, [&](H5::H5Object& o) {
    if (o.attrExists(name)) o.removeAttr(name);
    o.createAttribute(name, H5::PredType::NATIVE_DOUBLE, H5::DataSpace(H5S_SCALAR))
        .write(H5::PredType::NATIVE_DOUBLE, &value);
  });
}

void ResultsFile::attribute(const std::string& object, const std::string& name, long value) {
  with_object(state_->file, object, [&](H5::H5Object& o) {
    if (o.attrExists(name)) o.removeAttr(name);
    o.createAttribute(name, H5::PredType::NATIVE_LONG, H5::DataSpace(H5S_SCALAR))
        .write(H5::PredType::NATIVE_LONG, &value);
  });
}

void ResultsFile::flush() {
  state_->file.flush(H5F_SCOPE_GLOBAL);
}

}  // namespace gapflux
