// gapflux: command-line entry. Parses the command, runs it, and maps failures to exit codes:
// 0 ok, 2 bad input (message names file, line, key), 3 numerical failure, 1 anything else.
#include <fmt/format.h>
#include <CLI/CLI.hpp>

#include <charconv>
#include <iostream>
#include <string>
#include <vector>

#include "cases/input_error.hpp"
#include "commands.hpp"
#include "postproc/output_file.hpp"
#include "version.hpp"

namespace {

constexpr int max_threads = 1024;

// CLI11's own range check prints its bound with 309 digits; this one says what is valid.
std::string thread_count_error(std::string& text) {
  int value = -1;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (ec == std::errc() && end == text.data() + text.size() && value >= 0 && value <= max_threads)
    return "";
  return fmt::format(
      "{} is not a thread count: give a whole number from 1 to {}, or 0 for all cores",
      gapflux::quote_text(text), max_threads);
}

// The first word that is not an option must name a command: CLI11 alone answers a misspelt
// command with "A subcommand is required".
std::string unknown_command(int argc, char** argv, const std::vector<std::string>& commands) {
  for (int i = 1; i < argc; ++i) {
    const std::string word = argv[i];
    if (word == "--threads") {
      ++i;  // its value
      continue;
    }
    if (word.starts_with("-")) continue;
    for (const std::string& c : commands)
      if (word == c) return "";
    return word;
  }
  return "";
}

}  // namespace

int main(int argc, char** argv) {
  using namespace gapflux;
  const std::vector<std::string> commands{"check",      "mesh",    "run",       "sweep",
                                          "sweep-case", "collect", "mesh-cache"};
  if (const std::string word = unknown_command(argc, argv, commands); !word.empty()) {
    std::cerr << fmt::format(
        "gapflux: error: unknown command {}; the commands are {} (see "
        "gapflux --help)\n",
        quote_text(word), fmt::join(commands, ", "));
    return 2;
  }
  CLI::App app{
      "gapflux: 2-D finite-element field simulation of induction-motor laminations "
      "under disturbed supplies"};
  app.require_subcommand(1);
  app.fallthrough();  // --threads may come before or after the command
  app.set_version_flag("--version", fmt::format("gapflux {}", version_string));
  CommonOptions options;
  app.add_option("--threads", options.threads, "worker threads (default: all cores)")
      ->check(CLI::Validator(thread_count_error, "N"));

  std::string case_path, out_dir;
  auto* check = app.add_subcommand("check",
                                   "validate a case; print it resolved, with derived "
                                   "quantities");
  check->add_option("CASE", case_path, "case file (TOML)")->required();
  auto* mesh = app.add_subcommand("mesh", "validate and mesh a case; write DIR/mesh.vtu");
  mesh->add_option("CASE", case_path, "case file (TOML)")->required();
  mesh->add_option("--out", out_dir, "output directory")->required();
  mesh->add_flag("--replace", options.replace, "overwrite DIR/mesh.vtu if it exists");
  auto* run = app.add_subcommand("run", "solve a case; write results into DIR");
  run->add_option("CASE", case_path, "case file (TOML)")->required();
  run->add_option("--out", out_dir, "output directory")->required();
  auto* resume = run->add_flag(
      "--resume", options.resume,
      "continue a stopped time-stepping run from its last finished step in DIR (the case must "
      "be unchanged)");
  run->add_flag("--replace", options.replace,
                "overwrite the outputs of an earlier run in DIR (they are removed first)")
      ->excludes(resume);
  run->add_flag("--lean", options.lean,
                "keep only what summary.json and the analysis need: no per-step nodal potentials, "
                "element fields only for the last period, no field snapshots");
  run->add_flag("--baseline", options.baseline,
                "also run the same case on a balanced, harmonic-free supply of its "
                "positive-sequence fundamental (into DIR/baseline) and report the differences");

  std::string sweep_path;
  SweepOptions sweep_options;
  auto* sweep = app.add_subcommand(
      "sweep",
      "run the cases a sweep file makes from its base case (checked first, written to "
      "DIR/cases) on local worker processes or as a Slurm job array; collect DIR/sweep.csv");
  sweep->add_option("SWEEP", sweep_path, "sweep file (TOML)")->required();
  sweep->add_option("--out", out_dir, "sweep folder")->required();
  sweep
      ->add_option("--workers", sweep_options.workers,
                   "cases at a time on this machine (default: the sweep file's, else cores / "
                   "threads per case)")
      ->check(CLI::Range(1, max_threads));
  sweep->add_flag("--replace", sweep_options.replace,
                  "remove the outputs of another sweep in DIR first (the same sweep continues "
                  "without it)");
  auto* slurm = sweep->add_flag("--slurm", sweep_options.slurm,
                                "write a Slurm job array (one task per case) and a collect job "
                                "into DIR/slurm and submit them with sbatch");
  sweep
      ->add_flag("!--no-submit", sweep_options.submit,
                 "with --slurm: write the job scripts but do not submit them")
      ->needs(slurm);
  std::string sweep_dir;
  int case_index = -1;
  auto* sweep_case = app.add_subcommand(
      "sweep-case",
      "run case INDEX of the sweep in DIR as its workers do (what a Slurm task runs)");
  sweep_case->add_option("DIR", sweep_dir, "sweep folder")->required();
  sweep_case->add_option("INDEX", case_index, "case index (manifest.csv)")->required();
  auto* collect = app.add_subcommand(
      "collect", "gather the sweep in DIR into DIR/sweep.csv and sweep.h5 (also mid-sweep)");
  collect->add_option("DIR", sweep_dir, "sweep folder")->required();

  std::string cache_action = "info";
  auto* cache =
      app.add_subcommand("mesh-cache",
                         "show or clear the meshes kept between runs ($GAPFLUX_MESH_CACHE, else "
                         "~/.cache/gapflux/meshes; GAPFLUX_MESH_CACHE=off turns it off)");
  cache->add_option("ACTION", cache_action, "info (default) or clear")
      ->check(CLI::IsMember({"info", "clear"}));

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    return app.exit(e) == 0 ? 0 : 2;
  }

  try {
    if (check->parsed()) return command_check(case_path, options);
    if (mesh->parsed()) return command_mesh(case_path, out_dir, options);
    if (run->parsed()) return command_run(case_path, out_dir, options);
    if (sweep->parsed()) return command_sweep(sweep_path, out_dir, sweep_options);
    if (sweep_case->parsed()) return command_sweep_case(sweep_dir, case_index, options);
    if (collect->parsed()) return command_collect(sweep_dir);
    if (cache->parsed()) return command_mesh_cache(cache_action);
  } catch (const InputError& e) {
    std::cerr << e.what() << "\n";
    return 2;
  } catch (const OutputError& e) {
    std::cerr << "gapflux: error: " << e.what() << "\n";
    return 1;
  } catch (const std::exception& e) {
    std::cerr << "gapflux: error: " << e.what() << "\n";
    return 1;
  }
  return 1;
}
