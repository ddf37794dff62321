#pragma once
// Output files that are either whole or absent. A file written in one piece goes to
// "<path>.partial" first and is renamed over <path> only after every byte and the close
// succeeded, so a full disk or a killed run never leaves a truncated file under the real name.
// Failures throw OutputError, which names the file and, when the disk is full, says so.
#include <cstdint>
#include <stdexcept>
#include <string>
#include <string_view>

namespace gapflux {

// A write that failed (disk full, permissions, the folder gone). The CLI maps it to exit 1.
class OutputError : public std::runtime_error {
 public:
  OutputError(const std::string& path, const std::string& what);
  const std::string& path() const { return path_; }

 private:
  std::string path_;
};

// Bytes free to this process on the filesystem that holds `path` (or its nearest existing
// parent folder); UINT64_MAX when the filesystem does not say.
std::uint64_t free_bytes_at(const std::string& path);

// "(disk full: 0.3 MB free)" when the filesystem at `path` is (nearly) full, else "".
std::string disk_full_hint(const std::string& path);

// Writes `bytes` to `path` as described above; throws OutputError.
void write_file_whole(const std::string& path, std::string_view bytes);

}  // namespace gapflux
