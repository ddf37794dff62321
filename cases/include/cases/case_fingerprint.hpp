#pragma once
// What identifies a run's settings, so that `--resume` continues only the run it started:
// every key and value of the case file (comments, spacing and key order do not count), the
// contents of the files it names (a measured supply table), and the program's version.
#include <string>
#include <string_view>
#include <vector>

#include "cases/case.hpp"

namespace gapflux {

struct CaseFingerprint {
  std::vector<std::string> lines;  // "dotted.key = value", sorted
  std::string digest;              // 16 hex digits (FNV-1a, 64 bit) of the lines
};

// `c` is the case read from `case_path` (its waveform table, if any, already loaded).
CaseFingerprint case_fingerprint(const std::string& case_path, const Case& c,
                                 std::string_view program_version);

// 16 hex digits (FNV-1a, 64 bit) of the lines, each ended by a newline.
std::string lines_digest(const std::vector<std::string>& lines);

// What changed from `before` to `after`, one readable line per key ("supply.rms_a: 21.0 →
// 22.0", "study.slip added: 0.05", "output.fields_every removed").
std::vector<std::string> fingerprint_changes(const std::vector<std::string>& before,
                                             const std::vector<std::string>& after);

}  // namespace gapflux
