#pragma once
// A sweep file (TOML): a base case and the case keys to vary, each over a list or a range, as a
// full product or zipped; which summary values make up the table; how the cases run (local
// workers, a Slurm job array). read_sweep_file checks every key like the case reader does.
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "cases/input_error.hpp"

namespace gapflux {

// One value a varied key takes: a TOML scalar.
struct SweepValue {
  enum class Kind { number, integer, text, flag };
  Kind kind = Kind::number;
  double number = 0.0;  // number and integer
  long long integer = 0;
  std::string text;
  bool flag = false;

  std::string display() const;  // as a table cell: 0.05, teardrop, true
  double as_double() const;     // number, integer, flag (1/0); NaN for text
};

struct SweepParameter {
  std::string key;  // dotted case key, "stator.slot.opening_width_mm"; arrays of tables as "x[i]"
  std::vector<SweepValue> values;
  SourcePos pos;  // the [[vary]] table in the sweep file
};

enum class SweepCombine { product, zip };

struct SlurmSettings {
  std::string partition, account, qos;
  int throttle = 0;                // tasks at a time; 0: no limit
  int time_minutes = 0;            // per task; 0: estimated from the case size
  int memory_mb = 0;               // per task; 0: estimated from the case size
  int threads_per_task = 0;        // 0: the sweep's threads per case
  std::vector<std::string> setup;  // shell lines run before each task ("module load …")
};

struct SweepSpec {
  std::string file;       // the sweep file
  std::string base_case;  // the base case's path as the sweep file names it, resolved
  SweepCombine combine = SweepCombine::product;
  std::vector<SweepParameter> parameters;
  std::vector<std::string> outputs;  // summary.json dotted paths; empty: the default set
  int threads_per_case = 1;
  int workers = 0;  // local worker processes; 0: cores / threads_per_case
  bool lean = true;
  SlurmSettings slurm;
  // "dotted.key = value" of everything that decides the cases (the base case's own lines are
  // added by the runner), to tell the same sweep from a changed one.
  std::vector<std::string> settings;
};

// Throws InputError naming the sweep file, line and key.
SweepSpec read_sweep_file(const std::string& path);
SweepSpec read_sweep_text(std::string_view text, const std::string& file_name);

// The case text `base_text` (read from `base_file`) with each key set to its value: a table or
// key missing in the base is added, so the case reader's own checks judge it. A relative
// supply.waveform.file is rewritten to stay right from `case_dir`, where the text is written.
// Throws InputError (naming `base_file`) when a key's path runs through a value that is not a
// table.
std::string case_text_with(std::string_view base_text, const std::string& base_file,
                           const std::vector<std::pair<std::string, SweepValue>>& settings,
                           const std::string& case_dir);

}  // namespace gapflux
