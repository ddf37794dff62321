#pragma once
// Running one case: the static or time-stepping study its file asks for, into an output folder,
// and what its summary.json holds. The CLI's `run`, the sweep runner's workers and the tests all
// come through here.
#include <string>

#include "cases/case.hpp"
#include "postproc/summary.hpp"
#include "studies/run_folder.hpp"

namespace gapflux {

// What a time-stepping run keeps on disk.
enum class OutputDetail {
  full,  // every step's nodal potential and element B, field snapshots
  lean,  // what the summary and the analysis need: per-step element B for the last period only,
         // no nodal potentials or snapshots (a sweep's default)
};

inline const char* to_string(OutputDetail d) {
  return d == OutputDetail::lean ? "lean" : "full";
}

struct StudyOptions {
  FolderUse folder_use = FolderUse::fresh;
  OutputDetail detail = OutputDetail::full;
  // Time stepping: also run the case on a balanced, harmonic-free supply of its positive-sequence
  // fundamental into OUT/baseline, and add the comparison to the summary.
  bool baseline = false;
};

// `c` is the case as read from `case_path` (the path names it in messages; its text is the run's
// fingerprint for --resume). Throws InputError, NumericalError (after writing what was computed),
// OutputError (a write failed; finished steps are kept) and Interrupted (SIGINT/SIGTERM while
// stepping, after the step in hand was written).
RunSummary run_study(const std::string& case_path, const Case& c, const std::string& out_dir,
                     const StudyOptions& options);

}  // namespace gapflux
