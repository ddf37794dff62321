#pragma once
// Reading a case file: TOML → Case, with every key checked (type, range, unknown keys with a
// "did you mean"). Throws InputError naming file, line, column and key path.
#include <string>
#include <string_view>

#include "cases/case.hpp"

namespace gapflux {

Case read_case_file(const std::string& path);
Case read_case_text(std::string_view text, const std::string& file_name);

}  // namespace gapflux
