#include "postproc/output_file.hpp"

#include <fmt/format.h>
#include <sys/statvfs.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <limits>

namespace gapflux {

namespace fs = std::filesystem;

OutputError::OutputError(const std::string& path, const std::string& what)
    : std::runtime_error(fmt::format("cannot write {}: {}", path, what)), path_(path) {}

std::uint64_t free_bytes_at(const std::string& path) {
  fs::path p = fs::absolute(path);
  std::error_code ec;
  while (!p.empty() && !fs::exists(p, ec) && p.has_parent_path() && p.parent_path() != p)
    p = p.parent_path();
  struct statvfs st {};
  if (statvfs(p.c_str(), &st) != 0) return std::numeric_limits<std::uint64_t>::max();
  return static_cast<std::uint64_t>(st.f_bavail) * st.f_frsize;
}

std::string disk_full_hint(const std::string& path) {
  const std::uint64_t free = free_bytes_at(path);
  // A few blocks' slack: a write fails when the next block cannot be had.
  if (free > (std::uint64_t{1} << 20)) return "";
  return fmt::format(" (disk full: {:.1f} MB free)", static_cast<double>(free) / 1e6);
}

void write_file_whole(const std::string& path, std::string_view bytes) {
  const std::string partial = path + ".partial";
  std::FILE* f = std::fopen(partial.c_str(), "wb");
  if (!f) throw OutputError(path, std::strerror(errno) + disk_full_hint(path));
  const std::size_t written = bytes.empty() ? 0 : std::fwrite(bytes.data(), 1, bytes.size(), f);
  const int write_errno = written == bytes.size() ? 0 : errno;
  const bool flushed = std::fflush(f) == 0;
  const int flush_errno = flushed ? 0 : errno;
  const bool closed = std::fclose(f) == 0;
  if (written != bytes.size() || !flushed || !closed) {
    const int e = write_errno ? write_errno : flush_errno ? flush_errno : errno;
    std::remove(partial.c_str());
    throw OutputError(path, std::string(std::strerror(e)) + disk_full_hint(path));
  }
  std::error_code ec;
  fs::rename(partial, path, ec);
  if (ec) {
    std::remove(partial.c_str());
    throw OutputError(path, ec.message());
  }
}

}  // namespace gapflux
