#include "studies/run_folder.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/file.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>

#include "cases/input_error.hpp"
#include "postproc/output_file.hpp"

namespace gapflux {
namespace {

namespace fs = std::filesystem;

constexpr const char* lock_name = ".gapflux.lock";

std::string read_lock_owner(const std::string& path) {
  std::ifstream in(path);
  std::string owner;
  std::getline(in, owner);
  return owner.empty() ? "another gapflux process" : owner;
}

}  // namespace

std::vector<std::string> RunFolder::run_outputs() {
  return {"results.h5", "summary.json",   "fields.pvd",  "fields.xdmf",
          "fields",     "saturation.vtu", "report.html", "baseline"};
}

RunFolder::RunFolder(std::string dir, std::vector<std::string> outputs, FolderUse use)
    : dir_(std::move(dir)) {
  std::error_code ec;
  if (fs::exists(dir_, ec) && !fs::is_directory(dir_, ec))
    throw InputError(dir_, {}, "--out", "is a file, not a folder; name a folder for the outputs");
  fs::create_directories(dir_, ec);
  if (ec)
    throw std::runtime_error(fmt::format("cannot create the folder {}: {}", dir_, ec.message()));

  // The lock: flock on a file of its own, released by the kernel when the process ends however
  // it ends (a killed run never leaves a stale lock).
  const std::string lock_path = path(lock_name);
  lock_fd_ = ::open(lock_path.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644);
  if (lock_fd_ < 0) throw OutputError(lock_path, std::strerror(errno) + disk_full_hint(dir_));
  if (::flock(lock_fd_, LOCK_EX | LOCK_NB) != 0) {
    const std::string owner = read_lock_owner(lock_path);
    ::close(lock_fd_);
    lock_fd_ = -1;
    throw std::runtime_error(fmt::format(
        "{} is in use by {}: two runs into one folder would corrupt its results; wait for it to "
        "end or choose another --out",
        dir_, owner));
  }
  const std::string owner = fmt::format("gapflux process {}\n", ::getpid());
  if (::ftruncate(lock_fd_, 0) != 0 || ::write(lock_fd_, owner.data(), owner.size()) < 0) {
    // The lock holds without its note; the note only improves the refusal's message.
  }

  if (use == FolderUse::keep) return;
  std::vector<std::string> present;
  for (const std::string& name : outputs)
    if (fs::exists(path(name), ec)) present.push_back(name);
  const bool has_results = fs::exists(path("results.h5"), ec);
  if (use == FolderUse::resume && !has_results) {
    fmt::print(stderr, "nothing to resume in {} (no results.h5): starting afresh\n", dir_);
    use = FolderUse::replace;  // what an unfinished start left behind goes
  }
  resuming_ = use == FolderUse::resume;
  if (use == FolderUse::fresh && !present.empty())
    throw InputError(dir_, {}, "--out",
                     fmt::format("already holds the outputs of an earlier run ({}); give "
                                 "--replace to overwrite them, --resume to continue that run, or "
                                 "another folder",
                                 fmt::join(present, ", ")));
  if (use == FolderUse::replace)
    for (const std::string& name : present) {
      fs::remove_all(path(name), ec);
      if (ec)
        throw std::runtime_error(fmt::format("cannot remove {}: {}", path(name), ec.message()));
    }
  discard_partial_files();  // what a killed process left half written
}

void RunFolder::discard_partial_files() const {
  std::error_code ec;
  for (const auto& entry : fs::recursive_directory_iterator(dir_, ec))
    if (entry.path().extension() == ".partial") fs::remove(entry.path(), ec);
}

RunFolder::~RunFolder() {
  if (lock_fd_ >= 0) ::close(lock_fd_);  // closing releases the flock
}

std::string RunFolder::path(const std::string& name) const {
  return (fs::path(dir_) / name).string();
}

void RunFolder::ensure_room(std::uint64_t bytes, const std::string& what) const {
  const std::uint64_t free = free_bytes_at(dir_);
  if (free >= bytes) return;
  throw OutputError(
      dir_, fmt::format("the disk is (nearly) full: {:.1f} MB free, {} needs about "
                        "{:.1f} MB; stopped before writing it",
                        static_cast<double>(free) / 1e6, what, static_cast<double>(bytes) / 1e6));
}

}  // namespace gapflux
