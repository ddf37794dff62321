// Every input the case fuzzer (script/fuzz) ever crashed on stays in tests/fuzz/regressions and
// is replayed here under the suite's sanitizers: each must end as a valid case or an InputError
// (refused_* inputs, bugs found by hand, as an InputError).
// The example cases, the fuzzer's seeds, must stay valid.
#include <catch2/catch.hpp>

#include <filesystem>
#include <string>

#include "../fuzz/case_validation.hpp"
#include "test_support.hpp"

using namespace gapflux;

TEST_CASE("the fuzzer's crash inputs and seeds replay without a crash", "[cases][fuzz]") {
  namespace fs = std::filesystem;
  const fs::path regressions = fs::path(GAPFLUX_SOURCE_DIR) / "tests" / "fuzz" / "regressions";
  int replayed = 0;
  for (const auto& entry : fs::directory_iterator(regressions)) {
    if (!entry.is_regular_file() || entry.path().filename() == "README.md") continue;
    INFO(entry.path().string());
    bool valid = false;
    CHECK_NOTHROW(valid = fuzz::validate_case_text(test::read_text(entry.path().string())));
    if (entry.path().filename().string().starts_with("refused_")) CHECK_FALSE(valid);
    ++replayed;
  }
  CHECK(replayed > 0);
  for (const auto& entry : fs::directory_iterator(GAPFLUX_EXAMPLES_DIR)) {
    if (entry.path().extension() != ".toml") continue;
    INFO(entry.path().string());
    CHECK(fuzz::validate_case_text(test::read_text(entry.path().string())));
  }
}
