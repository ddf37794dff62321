#pragma once
// [supply]: the current set the winding carries, or the voltage set its terminals see (with the
// winding's connection), as per-phase magnitudes and angles, as symmetrical components, with
// harmonics, or as a measured waveform table.
#include <string>

#include "cases/case.hpp"
#include "table_reader.hpp"

namespace gapflux {

// `case_file` locates a waveform table given by a relative path.
SupplySpec parse_supply(TableReader t, const std::string& case_file);

// A current feed into an isolated star (the default connection) cannot carry zero sequence: it
// is removed from the described currents (fundamental, each harmonic order, or each sample of a
// measured table), with a warning when it exceeds 0.1 % of the fundamental's positive sequence.
void close_isolated_star(Case& c, std::vector<std::string>& warnings);

// Reads a CSV of time_s and three phase values (header line and '#' comments allowed); errors name
// the CSV's own line. `key_path` is the case key that named the file.
WaveformTable read_waveform_csv(const std::string& path, const std::string& key_path);

// Fundamental frequency of a measured set: a hysteresis zero-crossing count on the largest
// phase, refined by the Hann²-weighted least-squares sinusoid that explains most of the record.
// Throws a message when no whole period lies between two rising crossings.
double detect_fundamental_hz(const WaveformTable& table);

}  // namespace gapflux
