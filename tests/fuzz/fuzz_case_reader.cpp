// libFuzzer target (clang's, from Debian): any bytes as a case file must end in a valid case or
// an InputError naming file, line and key; never a crash, a hang, another exception or a
// sanitizer report. Built by script/fuzz (its own clang build with ASan and UBSan).
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "case_validation.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  gapflux::fuzz::validate_case_text(std::string_view(reinterpret_cast<const char*>(data), size));
  return 0;
}
