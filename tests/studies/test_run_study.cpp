// The studies library's entry: a case in memory runs as the CLI runs it, and what run_study
// returns is what summary.json holds.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>

#include "cases/case_reader.hpp"
#include "cases/input_error.hpp"
#include "postproc/results_file.hpp"
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

namespace {

// The running pump demo (induced cage, voltage feed, saturated) on a coarse first-order mesh.
Case coarse_running_pump() {
  Case c = read_case_file(test::example("pump_4p36s_running.toml"));
  c.mesh.order = 1;
  c.mesh.band_nodes = 1008;
  c.mesh.airgap_size_m = 0.45e-3;
  return c;
}

}  // namespace

TEST_CASE(
    "slip curves: each point conserves energy, and the curve runs from motoring past synchronism",
    "[studies][harmonic]") {
  // Poynting's theorem for the discrete field, whose iron is lossless (common practice, no
  // source): per point the cage loss is s × the air-gap power (input − stator copper), to
  // rounding (1e-9 of the input; 5e-15 measured).
  Case c = coarse_running_pump();
  c.study.kind = StudyKind::slip_curves;
  c.study.slip_from = 0.6;
  c.study.slip_to = -0.02;
  c.study.points = 3;
  const auto dir = test::temp_dir("run_study_slip_curves");
  std::filesystem::remove_all(dir);
  const RunSummary s = run_study(test::example("pump_4p36s_running.toml"), c, dir.string(), {});
  CHECK(s.converged);
  CHECK(s.steps == 3);
  std::ifstream in(dir / "summary.json");
  const nlohmann::json j = nlohmann::json::parse(in);
  const auto& curves = j["curves"];
  REQUIRE(curves["slip"].size() == 3);
  for (std::size_t k = 0; k < 3; ++k) {
    const double slip = curves["slip"][k].get<double>();
    const double input = curves["input_w"][k].get<double>();
    const double gap = input - curves["stator_copper_w"][k].get<double>();
    CHECK(std::abs(curves["cage_w"][k].get<double>() - slip * gap) < 1e-9 * std::abs(input));
  }
  // Motoring torque at s > 0, generating past synchronous speed (common practice, no source).
  CHECK(curves["torque_nm"][0].get<double>() > 0.0);
  CHECK(curves["torque_nm"][2].get<double>() < 0.0);
  CHECK(j["starting"]["converged"].get<bool>());  // standstill solved beside the range
}

TEST_CASE("time stepping from the time-harmonic start: the bars carry their current at once",
          "[studies][harmonic]") {
  // Started cold the bars are switched on in the stator's field and carry nothing at first;
  // started from the time-harmonic solution their first step's currents are those of the
  // steady state: the RMS over the bars of the first step within 15 % of the harmonic model's
  // forward bar current (the first step is one instant of a set whose RMS over the bars a
  // balanced wave keeps constant; the slot harmonics make the rest; 1.6 % measured).
  Case c = coarse_running_pump();
  c.study.steps_per_period = 24;
  c.study.periods = 0.25;
  c.study.discard_periods = 0.0;
  c.study.start = StartKind::time_harmonic;
  const auto dir = test::temp_dir("run_study_harmonic_start");
  std::filesystem::remove_all(dir);
  StudyOptions options;
  options.detail = OutputDetail::lean;
  const RunSummary s =
      run_study(test::example("pump_4p36s_running.toml"), c, (dir / "ts").string(), options);
  CHECK(s.converged);
  CHECK(s.start == "time_harmonic");
  CHECK(s.start_harmonic_solves > 1);

  Case h = coarse_running_pump();
  h.study.kind = StudyKind::time_harmonic;
  run_study(test::example("pump_4p36s_running.toml"), h, (dir / "harmonic").string(), {});
  std::ifstream in(dir / "harmonic" / "summary.json");
  const double harmonic_bar_rms_a =
      nlohmann::json::parse(in)["cage"]["forward"]["bar_rms_a"].get<double>();
  const auto h5 = ResultsFile::open_existing((dir / "ts" / "results.h5").string());
  const std::vector<double> bars = h5->read("steps/bar_current");
  const int n = static_cast<int>(h5->read("steps/cage_wave").size() / 2);
  REQUIRE(n == 6);
  const std::size_t per_step = bars.size() / n;
  double sum = 0.0;
  for (std::size_t k = 0; k < per_step; ++k) sum += bars[k] * bars[k];
  const double first_step_rms_a = std::sqrt(sum / per_step);
  CHECK(first_step_rms_a == Approx(harmonic_bar_rms_a).epsilon(0.15));
}
