#pragma once
// The output folder of one command (`run`, `mesh`): created if missing, locked while the command
// runs so that a second gapflux process cannot write into it at the same time, and never reused
// silently — a folder that holds an earlier run's outputs is refused unless the user asks to
// replace them (then exactly those outputs are removed first) or to resume the run.
#include <cstdint>
#include <string>
#include <vector>

namespace gapflux {

enum class FolderUse {
  fresh,    // refuse a folder holding outputs of this command
  replace,  // remove those outputs first
  resume,   // keep them (a time-stepping run continues); nothing to resume → fresh
  keep,     // keep whatever is there, only lock (a sweep's folder: the sweep decides what stays)
};

class RunFolder {
 public:
  // `outputs`: the files and folders the command writes directly in `dir` (results.h5,
  // fields/, …). Throws InputError (the path is a file; outputs present and `fresh`) or
  // std::runtime_error (another process holds the lock; the folder cannot be made).
  RunFolder(std::string dir, std::vector<std::string> outputs, FolderUse use);
  ~RunFolder();  // releases the lock
  RunFolder(const RunFolder&) = delete;
  RunFolder& operator=(const RunFolder&) = delete;

  const std::string& dir() const { return dir_; }
  std::string path(const std::string& name) const;
  // `resume` asked and there was something to resume.
  bool resuming() const { return resuming_; }

  // Throws OutputError when the folder's filesystem has fewer than `bytes` free; `what` says what
  // was about to be written ("step 12 (about 3.2 MB)").
  void ensure_room(std::uint64_t bytes, const std::string& what) const;

  // Removes whole-file writes that did not finish ("*.partial").
  void discard_partial_files() const;

  // What a `run` writes (the names `--replace` clears).
  static std::vector<std::string> run_outputs();

 private:
  std::string dir_;
  int lock_fd_ = -1;
  bool resuming_ = false;
};

}  // namespace gapflux
