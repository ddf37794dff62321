#pragma once
// The CLI's commands; each returns the process exit code (0 ok, 2 bad input, 3 numerical
// failure, 1 other) after printing what it did.
#include <string>

namespace gapflux {

struct CommonOptions {
  int threads = 0;        // 0: as many as the machine has
  bool resume = false;    // run: continue a killed time-stepping run
  bool replace = false;   // run, mesh: overwrite the outputs of an earlier run in the folder
  bool baseline = false;  // run: also run the balanced, harmonic-free baseline and compare
  bool lean = false;      // run: keep only what the summary and the analysis need
};

int command_check(const std::string& case_path, const CommonOptions& options);
int command_mesh(const std::string& case_path, const std::string& out_dir,
                 const CommonOptions& options);
int command_run(const std::string& case_path, const std::string& out_dir,
                const CommonOptions& options);

struct SweepOptions {
  int workers = 0;       // 0: the sweep file's, else cores / threads per case
  bool replace = false;  // remove an earlier sweep's outputs from DIR first
  bool slurm = false;    // as a Slurm job array instead of local workers
  bool submit = true;    // with slurm: submit (else only write the scripts)
};
int command_sweep(const std::string& sweep_path, const std::string& out_dir,
                  const SweepOptions& options);
int command_sweep_case(const std::string& dir, int index, const CommonOptions& options);
int command_collect(const std::string& dir);
// `action`: "info" or "clear".
int command_mesh_cache(const std::string& action);

}  // namespace gapflux
