// run_study: the one entry to a case's study, shared by the CLI, the sweep runner and the tests.
#include "studies/study.hpp"

#include <fmt/format.h>

#include <filesystem>
#include <numbers>

#include "analysis_printout.hpp"
#include "cases/input_error.hpp"
#include "harmonic_study.hpp"
#include "postproc/baseline.hpp"
#include "static_study.hpp"
#include "studies/interrupts.hpp"
#include "transient_study.hpp"

namespace gapflux {
namespace {

// The same case on a balanced, harmonic-free supply of the run's positive-sequence fundamental,
// into DIR/baseline; the differences go into DIR/summary.json and onto stdout.
RunSummary run_baseline(const std::string& case_path, const Case& c, const std::string& out_dir,
                        const TransientStudy& study, OutputDetail detail) {
  RunSummary run = study.summary();
  if (!run.analysis || run.analysis->periods < 1)
    throw std::runtime_error("--baseline needs at least one whole retained electrical period");
  // A voltage feed keeps its connection and gets balanced phase voltages at the supply's
  // positive-sequence fundamental; a current feed balanced currents at the currents' one.
  const SupplySpec& given = c.supply;
  const bool voltage = given.voltage_fed();
  const HarmonicPhasors* f =
      find_order(voltage ? run.analysis->supply_voltage : run.analysis->current, 1.0);
  if (!f) throw std::runtime_error("--baseline: the run has no fundamental");
  SupplySpec balanced;
  balanced.feed = given.feed;
  balanced.connection = given.connection;
  balanced.voltage_basis = VoltageBasis::phase;
  balanced.frequency_hz = run.frequency_hz;
  balanced.form = SupplyForm::phases;
  balanced.rms = std::abs(f->sequences.positive);
  const double angle = std::arg(f->sequences.positive);
  for (int k = 0; k < 3; ++k)
    balanced.phases[k] = {balanced.rms, angle - k * 2.0 * std::numbers::pi / 3.0};
  const std::string dir = (std::filesystem::path(out_dir) / "baseline").string();
  fmt::print("\n== baseline: balanced {:.4g} {} at {:.2f}°, no harmonics, into {}\n", balanced.rms,
             voltage ? "V (phase)" : "A", angle * 180.0 / std::numbers::pi, dir);
  // The baseline's folder belongs to this run (locked with it): it is always rewritten.
  TransientStudy base(case_path, c, dir, FolderUse::replace, detail);
  base.override_supply(balanced);
  base.run();
  BaselineComparison cmp = compare_with_baseline(run, base.summary());
  cmp.baseline_dir = dir;
  cmp.fundamental_rms = balanced.rms;
  cmp.voltage_fed = voltage;
  cmp.fundamental_angle_deg = angle * 180.0 / std::numbers::pi;
  run.baseline = cmp;
  write_summary_json(study.summary_path(), run);
  print_baseline_table(stdout, cmp);
  return run;
}

}  // namespace

RunSummary run_study(const std::string& case_path, const Case& c, const std::string& out_dir,
                     const StudyOptions& options) {
  const bool stepping = c.study.kind == StudyKind::time_stepping;
  if (options.folder_use == FolderUse::resume && !stepping)
    throw InputError(case_path, {}, "study.kind",
                     "--resume continues a time-stepping study; this case is not one");
  if (options.baseline && !stepping)
    throw InputError(case_path, {}, "study.kind",
                     "--baseline compares time-stepping studies; this case is not one");
  if (c.study.kind == StudyKind::time_harmonic || c.study.kind == StudyKind::slip_curves) {
    HarmonicStudy study(case_path, c, out_dir, options.folder_use);
    study.run();
    return study.summary();
  }
  if (!stepping) {
    StaticStudy study(case_path, c, out_dir, options.folder_use);
    study.run();
    return study.summary();
  }
  const InterruptWatch interrupts;
  TransientStudy study(case_path, c, out_dir, options.folder_use, options.detail);
  study.run();
  if (options.baseline) return run_baseline(case_path, c, out_dir, study, options.detail);
  return study.summary();
}

}  // namespace gapflux
