// A sweep as a Slurm job array: one task per case (`gapflux sweep-case DIR INDEX`, which runs the
// case exactly as a local worker does), a throttle, time and memory per task estimated from the
// case size unless the sweep file gives them, and a collect job that runs when the array ends.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>

#include "postproc/output_file.hpp"
#include "studies/sweep.hpp"
#include "sweep_names.hpp"

namespace gapflux {

namespace fs = std::filesystem;

namespace {

// Per task, from docs/performance.md: a whole run holds 2–5 KiB per unknown (5 taken) over a
// ~300 MB process; a time step costs ~6.5e-5 s per unknown on one core of this machine kind
// (cage included), doubled for slower cluster cores and Newton's harder steps, plus 5 min for
// meshing and the analysis.
int estimated_memory_mb(const SweepCase& c) {
  return static_cast<int>(std::ceil((300e6 + 5.0 * 1024 * c.unknowns) / 1e6 / 100.0) * 100);
}
int estimated_minutes(const SweepCase& c, int threads) {
  const double s =
      2.0 * 6.5e-5 * static_cast<double>(c.unknowns) * c.steps / std::max(1.0, 0.7 * threads);
  return static_cast<int>(std::ceil(s / 60.0)) + 5;
}

std::string capture(const std::string& command, int& status) {
  std::string out;
  FILE* p = ::popen(command.c_str(), "r");
  if (!p) {
    status = -1;
    return out;
  }
  char buffer[512];
  while (std::fgets(buffer, sizeof buffer, p)) out += buffer;
  status = ::pclose(p);
  while (!out.empty() && (out.back() == '\n' || out.back() == '\r')) out.pop_back();
  return out;
}

}  // namespace

std::string shell_quote(const std::string& text) {
  std::string out = "'";
  for (char ch : text) out += ch == '\'' ? std::string("'\\''") : std::string(1, ch);
  return out + "'";
}

int submit_sweep_to_slurm(const SweepPlan& plan, const std::string& program, bool submit) {
  const SlurmSettings& s = plan.spec.slurm;
  const int threads = s.threads_per_task > 0 ? s.threads_per_task : plan.spec.threads_per_case;
  int memory_mb = s.memory_mb, minutes = s.time_minutes;
  for (const SweepCase& c : plan.cases) {
    if (s.memory_mb == 0) memory_mb = std::max(memory_mb, estimated_memory_mb(c));
    if (s.time_minutes == 0) minutes = std::max(minutes, estimated_minutes(c, threads));
  }
  const std::string dir = fs::absolute(plan.dir).lexically_normal().string();
  const std::string exe = fs::absolute(program).lexically_normal().string();
  const std::string slurm_dir = (fs::path(dir) / "slurm").string();
  fs::create_directories(slurm_dir);

  const auto header = [&](const std::string& name) {
    std::string h = "#!/bin/bash\n";
    h +=
        fmt::format("# written by gapflux sweep for {}: submit with sbatch from any folder\n", dir);
    h += fmt::format("#SBATCH --job-name={}\n", name);
    if (!s.partition.empty()) h += fmt::format("#SBATCH --partition={}\n", s.partition);
    if (!s.account.empty()) h += fmt::format("#SBATCH --account={}\n", s.account);
    if (!s.qos.empty()) h += fmt::format("#SBATCH --qos={}\n", s.qos);
    return h;
  };
  const auto setup = [&] {
    std::string t;
    for (const std::string& line : s.setup) t += line + "\n";
    return t;
  };

  // The array: task i runs case i; finished cases end at once (a resubmission skips them).
  std::string array = header("gapflux-sweep");
  const int last = static_cast<int>(plan.cases.size()) - 1;
  array += fmt::format("#SBATCH --array=0-{}{}\n", last,
                       s.throttle > 0 ? fmt::format("%{}", s.throttle) : "");
  array += fmt::format("#SBATCH --ntasks=1\n#SBATCH --cpus-per-task={}\n", threads);
  array += fmt::format("#SBATCH --mem={}M\n#SBATCH --time={}\n", memory_mb, minutes);
  array += fmt::format("#SBATCH --output={}/slurm_%A_%a.out\n", shell_quote(slurm_dir));
  array += "set -euo pipefail\n" + setup();
  array += fmt::format("exec {} --threads {} sweep-case {} \"$SLURM_ARRAY_TASK_ID\"\n",
                       shell_quote(exe), threads, shell_quote(dir));

  std::string collect = header("gapflux-collect");
  collect += "#SBATCH --ntasks=1\n#SBATCH --cpus-per-task=1\n#SBATCH --mem=500M\n";
  collect += "#SBATCH --time=10\n";
  collect += fmt::format("#SBATCH --output={}/collect_%j.out\n", shell_quote(slurm_dir));
  collect += "set -euo pipefail\n" + setup();
  collect += fmt::format("exec {} collect {}\n", shell_quote(exe), shell_quote(dir));

  const std::string array_path = (fs::path(slurm_dir) / "array.sbatch").string();
  const std::string collect_path = (fs::path(slurm_dir) / "collect.sbatch").string();
  write_file_whole(array_path, array);
  write_file_whole(collect_path, collect);
  fs::permissions(array_path, fs::perms::owner_exec, fs::perm_options::add);
  fs::permissions(collect_path, fs::perms::owner_exec, fs::perm_options::add);
  fmt::print(
      "sweep: {} case(s) as a Slurm job array, {} thread(s), {} MB and {} min per task{}{}\n",
      plan.cases.size(), threads, memory_mb, minutes,
      s.memory_mb || s.time_minutes ? " (as given)" : " (estimated from the case sizes)",
      s.throttle > 0 ? fmt::format(", {} at a time", s.throttle) : "");
  fmt::print("wrote {} and {}\n", array_path, collect_path);
  if (!submit) {
    fmt::print(
        "not submitted: submit with\n  id=$(sbatch --parsable {})\n  sbatch "
        "--dependency=afterany:$id {}\n",
        shell_quote(array_path), shell_quote(collect_path));
    return 0;
  }
  int status = 0;
  const std::string array_id =
      capture(fmt::format("sbatch --parsable {} 2>&1", shell_quote(array_path)), status);
  if (status != 0 || array_id.empty() ||
      array_id.find_first_not_of("0123456789;") != std::string::npos) {
    fmt::print(stderr, "gapflux: error: sbatch refused the job array: {}\n", array_id);
    return 1;
  }
  const std::string job = array_id.substr(0, array_id.find(';'));
  const std::string collect_id =
      capture(fmt::format("sbatch --parsable --dependency=afterany:{} {} 2>&1", job,
                          shell_quote(collect_path)),
              status);
  if (status != 0) {
    fmt::print(stderr,
               "gapflux: error: sbatch refused the collect job ({}); the array {} runs; collect "
               "with gapflux collect {} when it ends\n",
               collect_id, job, dir);
    return 1;
  }
  fmt::print(
      "submitted: array job {}, collect job {} (runs when the array ends; then {}/sweep.csv)\n",
      job, collect_id.substr(0, collect_id.find(';')), dir);
  write_file_whole((fs::path(slurm_dir) / "jobs.txt").string(),
                   fmt::format("array {}\ncollect {}\n", job, collect_id));
  return 0;
}

}  // namespace gapflux
