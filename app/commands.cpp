#include "commands.hpp"

#include <fmt/format.h>

#include <omp.h>
#include <filesystem>
#include <iostream>
#include <numbers>
#include <optional>

#include "analysis_printout.hpp"
#include "case_printout.hpp"
#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "geometry/moving_band.hpp"
#include "interrupts.hpp"
#include "materials/library.hpp"
#include "postproc/baseline.hpp"
#include "postproc/summary.hpp"
#include "postproc/vtu_writer.hpp"
#include "run_folder.hpp"
#include "solver/cage_parameters.hpp"
#include "solver/supply_currents.hpp"
#include "solver/time_grid.hpp"
#include "static_study.hpp"
#include "transient_study.hpp"

namespace gapflux {
namespace {

// Everything a command needs before meshing, fully checked.
struct Prepared {
  Case c;
  Lamination lamination;
  MeshSettings mesh_settings;
  TimeGrid grid;
  std::optional<CageValues> cage;  // an induced cage's circuit values
};

Prepared prepare(const std::string& case_path) {
  Prepared p;
  p.c = read_case_file(case_path);
  const RegionMaterials materials = resolve_region_materials(p.c);
  p.lamination = build_lamination(p.c);
  if (p.c.rotor.kind == RotorKind::cage && p.c.rotor.bar_currents == BarCurrents::induced)
    p.cage = cage_values(p.c, p.lamination, materials);
  p.mesh_settings = resolve_mesh_settings(p.c, p.lamination);
  if (p.c.study.kind == StudyKind::time_stepping)
    p.grid = make_time_grid(p.c, 2.0 * std::numbers::pi / p.mesh_settings.band_nodes);
  else
    check_supply_at_instant(p.c, p.c.study.time_s);
  return p;
}

}  // namespace

int command_check(const std::string& case_path, const CommonOptions&) {
  const Prepared p = prepare(case_path);
  print_resolved_case(std::cout, p.c, p.lamination, p.mesh_settings);
  if (p.cage)
    fmt::print(
        "# cage (induced currents) at {:g} °C: bars {:.4g} MS/m, {:.4g} µΩ each (DC); ring "
        "segments {:.4g} µΩ ({}), {:.4g} nH ({}); rings {:.1f} mm mean diameter, {:.1f} mm²\n",
        p.cage->temperature_c, p.cage->circuit.conductivity_s_per_m / 1e6,
        p.cage->bar_dc_resistance_ohm * 1e6, p.cage->circuit.ring_segment_resistance_ohm * 1e6,
        p.cage->resistance_given ? "given" : "from the ring's dimensions",
        p.cage->circuit.ring_segment_inductance_h * 1e9,
        p.cage->inductance_given ? "given" : "rough estimate", p.cage->ring_mean_diameter_m * 1e3,
        p.cage->ring_area_m2 * 1e6);
  for (const std::string& w : p.c.warnings) fmt::print("warning: {}\n", w);
  for (const std::string& w : p.mesh_settings.forecast.warnings) fmt::print("warning: {}\n", w);
  if (p.c.study.kind == StudyKind::time_stepping)
    fmt::print(
        "time_grid = {{ steps = {}, steps_per_period = {}, dt_s = {:.6e}, rotor_speed_rpm = "
        "{:.3f}{} }}\n",
        p.grid.steps, p.grid.steps_per_period, p.grid.dt_s,
        p.grid.mechanical_speed_rad_s * 30.0 / std::numbers::pi,
        p.grid.band_pitches_per_step > 0
            ? fmt::format(", band_pitches_per_step = {}", p.grid.band_pitches_per_step)
            : std::string());
  if (p.c.study.kind == StudyKind::time_stepping) {
    const int bars = p.c.rotor.kind == RotorKind::cage ? p.c.rotor.bars : 0;
    if (const std::string w = slot_passing_warning(p.grid, p.c.stator.slots, bars); !w.empty())
      fmt::print("warning: {}\n", w);
  }
  std::cout << "check: ok\n";
  return 0;
}

int command_mesh(const std::string& case_path, const std::string& out_dir,
                 const CommonOptions& options) {
  const Prepared p = prepare(case_path);
  const RunFolder folder(out_dir, {"mesh.vtu"},
                         options.replace ? FolderUse::replace : FolderUse::fresh);
  for (const std::string& w : p.mesh_settings.forecast.warnings)
    fmt::print(stderr, "warning: {}\n", w);
  const Mesh mesh = mesh_lamination(p.lamination, p.mesh_settings);
  const MeshQuality quality = mesh_quality(mesh);
  const BandMesh band = build_moving_band(mesh, 0.0);
  const std::string path = folder.path("mesh.vtu");
  write_mesh_vtu(path, mesh, &band);
  fmt::print("case: {} ({})\n", p.c.machine.name, case_path);
  print_mesh_statistics(std::cout, mesh, quality);
  fmt::print("wrote {}\n", path);
  return 0;
}

namespace {

// The same case on a balanced, harmonic-free supply of the run's positive-sequence fundamental,
// into DIR/baseline; the differences go into DIR/summary.json and onto stdout.
void run_baseline(const std::string& case_path, const std::string& out_dir,
                  const TransientStudy& study) {
  RunSummary run = study.summary();
  if (!run.analysis || run.analysis->periods < 1)
    throw std::runtime_error("--baseline needs at least one whole retained electrical period");
  // A voltage feed keeps its connection and gets balanced phase voltages at the supply's
  // positive-sequence fundamental; a current feed balanced currents at the currents' one.
  const SupplySpec given = read_case_file(case_path).supply;
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
  TransientStudy base(case_path, dir, FolderUse::replace);
  base.override_supply(balanced);
  base.run();
  BaselineComparison c = compare_with_baseline(run, base.summary());
  c.baseline_dir = dir;
  c.fundamental_rms = balanced.rms;
  c.voltage_fed = voltage;
  c.fundamental_angle_deg = angle * 180.0 / std::numbers::pi;
  run.baseline = c;
  write_summary_json(study.summary_path(), run);
  print_baseline_table(stdout, c);
}

}  // namespace

int command_run(const std::string& case_path, const std::string& out_dir,
                const CommonOptions& options) {
  if (options.threads > 0) omp_set_num_threads(options.threads);
  const bool stepping = read_case_file(case_path).study.kind == StudyKind::time_stepping;
  if (options.resume && !stepping)
    throw InputError(case_path, {}, "study.kind",
                     "--resume continues a time-stepping study; this case is static");
  if (options.baseline && !stepping)
    throw InputError(case_path, {}, "study.kind",
                     "--baseline compares time-stepping studies; this case is static");
  const FolderUse use = options.resume    ? FolderUse::resume
                        : options.replace ? FolderUse::replace
                                          : FolderUse::fresh;
  try {
    if (stepping) {
      const InterruptWatch interrupts;
      TransientStudy study(case_path, out_dir, use);
      study.run();
      if (options.baseline) run_baseline(case_path, out_dir, study);
    } else {
      StaticStudy(case_path, out_dir, use).run();
    }
  } catch (const Interrupted& i) {
    return 128 + i.signal_number;
  } catch (const NumericalError& e) {
    fmt::print(stderr, "gapflux: numerical failure: {}\n(what was computed is saved in {})\n",
               e.what(), out_dir);
    return 3;
  }
  return 0;
}

}  // namespace gapflux
