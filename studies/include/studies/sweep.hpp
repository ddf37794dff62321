#pragma once
// A sweep: the cases a sweep file makes, written into DIR/cases/ and checked before any runs;
// their runs (DIR/runs/NAME, logs in DIR/logs/) on local worker processes or as a Slurm job
// array; and the table collected from their summaries (DIR/sweep.csv, DIR/sweep.h5).
#include <string>
#include <vector>

#include "cases/sweep_file.hpp"

namespace gapflux {

struct SweepCase {
  int index = 0;
  std::string name;                // case_0003: stable, from the index
  std::vector<SweepValue> values;  // one per varied key, in the sweep file's order
  bool time_stepping = true;
  double cost = 0.0;  // relative size (unknowns × steps), for Slurm's time and memory estimate
  long long unknowns = 0;
  int steps = 1;
};

struct SweepPlan {
  SweepSpec spec;
  std::string dir;
  std::vector<SweepCase> cases;
  std::string digest;  // of the sweep's settings and the base case: the same sweep or another

  std::string case_file(const SweepCase& c) const;  // DIR/cases/NAME.toml
  std::string run_dir(const SweepCase& c) const;    // DIR/runs/NAME
  std::string log_file(const SweepCase& c) const;   // DIR/logs/NAME.log
};

enum class SweepFolderUse {
  continue_same,  // a folder holding this same sweep continues it; another sweep is refused
  replace,        // remove an earlier sweep's outputs first
};

// Reads the sweep file and its base case, expands and checks every case (as `check` does);
// only then writes DIR/cases/ and DIR/manifest.{csv,json}. A refused case is written to
// DIR/refused_NAME.toml and the InputError names it, its values and the sweep file's line.
SweepPlan plan_sweep(const std::string& sweep_file, const std::string& dir, SweepFolderUse use);

// The plan of a sweep already written into DIR (manifest.json), for collect.
SweepPlan read_sweep_plan(const std::string& dir);

// A case's run has finished: its summary.json is whole and names no failure.
bool case_finished(const SweepPlan& plan, const SweepCase& c);

// Runs the unfinished cases, `workers` at a time, each as `program run CASE --out RUN` (a
// process of its own, so that one case's crash or memory cannot take the others down), then
// collects the table. Ctrl-C stops the workers after their step in hand; rerunning continues.
// Returns the exit code: 0 all finished, 1 some failed, 128 + signal when interrupted.
int run_sweep_locally(const SweepPlan& plan, const std::string& program, int workers);

// One case of the sweep, as a Slurm task runs it: nothing if finished, else as a local worker
// runs it (log in DIR/logs/). Returns the run's exit code.
int run_sweep_case(const SweepPlan& plan, int index, const std::string& program, int threads);

struct SweepTable {
  std::vector<std::string> columns;  // "index", "name", "status", the varied keys, the outputs
  std::vector<std::string> units;
  std::vector<std::vector<std::string>> rows;  // as written to sweep.csv
  int finished = 0, failed = 0, pending = 0;
};

// Writes DIR/sweep.csv and DIR/sweep.h5 from the cases' summaries (unfinished cases get a row
// with status and empty outputs) and returns the table.
SweepTable collect_sweep(const SweepPlan& plan);

// The summary values a sweep table has when the sweep file names none.
std::vector<std::string> default_sweep_outputs();

// Writes DIR/slurm/{array.sbatch, collect.sbatch}; with `submit`, submits the array and a collect
// job that waits for it (sbatch) and prints their job ids. Returns the exit code.
int submit_sweep_to_slurm(const SweepPlan& plan, const std::string& program, bool submit);

}  // namespace gapflux
