// The studies library's entry: a case in memory runs as the CLI runs it, and what run_study
// returns is what summary.json holds.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <filesystem>
#include <fstream>

#include "cases/case_reader.hpp"
#include "cases/input_error.hpp"
#include "studies/study.hpp"
#include "test_support.hpp"

using namespace gapflux;

TEST_CASE("run_study runs a case held in memory and returns its summary", "[studies]") {
  const std::string path = test::example("reference_radial_4p24s.toml");
  Case c = read_case_file(path);
  REQUIRE(c.study.kind == StudyKind::static_field);
  // Changed in memory only: a coarse first-order mesh and half the supply.
  c.mesh.order = 1;
  c.mesh.airgap_size_m = 0.5e-3;
  c.mesh.iron_size_m = 6e-3;
  const Case half = [&] {
    Case h = c;
    h.supply.rms *= 0.5;
    for (auto& p : h.supply.phases) p.rms *= 0.5;
    return h;
  }();
  const auto dir = test::temp_dir("run_study");
  std::filesystem::remove_all(dir);
  StudyOptions options;
  const RunSummary full = run_study(path, c, (dir / "full").string(), options);
  const RunSummary halved = run_study(path, half, (dir / "half").string(), options);
  REQUIRE(full.converged);
  for (int k = 0; k < 3; ++k)
    CHECK(halved.phase_current_a[k] == Approx(0.5 * full.phase_current_a[k]).margin(1e-12));
  CHECK(full.order == 1);

  std::ifstream in(dir / "full" / "summary.json");
  const nlohmann::json j = nlohmann::json::parse(in);
  CHECK(j["field"]["b_peak_tesla"].get<double>() == full.b_peak_tesla);
  CHECK(j["mesh"]["order"].get<int>() == 1);

  // A folder holding that run is refused, as by the CLI.
  CHECK_THROWS_AS(run_study(path, c, (dir / "full").string(), options), InputError);
  options.folder_use = FolderUse::resume;  // resume is for time stepping only
  CHECK_THROWS_AS(run_study(path, c, (dir / "full").string(), options), InputError);
}
