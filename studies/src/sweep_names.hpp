#pragma once
// Names shared by the sweep's files: what a sweep writes into its folder, the unit a key's name
// carries, table titles and CSV cells.
#include <string>
#include <vector>

namespace gapflux {

// What a sweep writes directly in its folder (the names --replace clears).
std::vector<std::string> sweep_outputs();

// The unit a dotted key's last word ends in ("torque.mean_nm" → "N*m", "…_pct" → "%"); "1"
// for a count or a ratio, "" when the name does not say.
std::string unit_of_key(const std::string& key);

// "torque.mean_nm [N*m]"; without a unit, the key alone.
std::string column_title(const std::string& key, const std::string& unit);

// A CSV cell (RFC 4180): quoted when it holds a comma, a quote or a line break.
std::string csv_cell(const std::string& text);

}  // namespace gapflux

#include "studies/sweep.hpp"

namespace gapflux {

// The command line that runs one case of a sweep (a local worker, a Slurm task): `program
// --threads T run CASE --out RUN [--lean] [--resume | --replace]`, the last when an earlier
// attempt left outputs (a time-stepping run continues; a static one starts again).
std::vector<std::string> sweep_case_command(const SweepPlan& plan, const SweepCase& c,
                                            const std::string& program, int threads);

// `text` quoted for a POSIX shell.
std::string shell_quote(const std::string& text);

}  // namespace gapflux
