#include "commands.hpp"

#include <fmt/format.h>

#include <omp.h>
#include <filesystem>
#include <iostream>
#include <numbers>
#include <optional>

#include "case_printout.hpp"
#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh_cache.hpp"
#include "geometry/mesher.hpp"
#include "geometry/moving_band.hpp"
#include "materials/library.hpp"
#include "postproc/summary.hpp"
#include "postproc/vtu_writer.hpp"
#include "solver/cage_parameters.hpp"
#include "solver/supply_currents.hpp"
#include "solver/time_grid.hpp"
#include "studies/interrupts.hpp"
#include "studies/prepared_case.hpp"
#include "studies/run_folder.hpp"
#include "studies/study.hpp"
#include "studies/sweep.hpp"

namespace gapflux {

int command_check(const std::string& case_path, const CommonOptions&) {
  const PreparedCase p = prepare_case(case_path, read_case_file(case_path));
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
  const PreparedCase p = prepare_case(case_path, read_case_file(case_path));
  const RunFolder folder(out_dir, {"mesh.vtu"},
                         options.replace ? FolderUse::replace : FolderUse::fresh);
  for (const std::string& w : p.mesh_settings.forecast.warnings)
    fmt::print(stderr, "warning: {}\n", w);
  const Mesh mesh = cached_mesh(p.lamination, p.mesh_settings).mesh;
  const MeshQuality quality = mesh_quality(mesh);
  const BandMesh band = build_moving_band(mesh, 0.0);
  const std::string path = folder.path("mesh.vtu");
  write_mesh_vtu(path, mesh, &band);
  fmt::print("case: {} ({})\n", p.c.machine.name, case_path);
  print_mesh_statistics(std::cout, mesh, quality);
  fmt::print("wrote {}\n", path);
  return 0;
}

int command_run(const std::string& case_path, const std::string& out_dir,
                const CommonOptions& options) {
  if (options.threads > 0) omp_set_num_threads(options.threads);
  StudyOptions study;
  study.folder_use = options.resume    ? FolderUse::resume
                     : options.replace ? FolderUse::replace
                                       : FolderUse::fresh;
  study.detail = options.lean ? OutputDetail::lean : OutputDetail::full;
  study.baseline = options.baseline;
  try {
    run_study(case_path, read_case_file(case_path), out_dir, study);
  } catch (const Interrupted& i) {
    return 128 + i.signal_number;
  } catch (const NumericalError& e) {
    fmt::print(stderr, "gapflux: numerical failure: {}\n(what was computed is saved in {})\n",
               e.what(), out_dir);
    return 3;
  }
  return 0;
}

namespace {

// This very program, for the sweep's workers and Slurm tasks.
std::string this_program() {
  std::error_code ec;
  const std::filesystem::path self = std::filesystem::read_symlink("/proc/self/exe", ec);
  if (ec) throw std::runtime_error("cannot find this program's path (/proc/self/exe)");
  return self.string();
}

}  // namespace

int command_sweep(const std::string& sweep_path, const std::string& out_dir,
                  const SweepOptions& options) {
  const SweepPlan plan =
      plan_sweep(sweep_path, out_dir,
                 options.replace ? SweepFolderUse::replace : SweepFolderUse::continue_same);
  fmt::print(
      "sweep: {} case(s) from {} checked and written to {}/cases (manifest.csv maps "
      "names to values)\n",
      plan.cases.size(), sweep_path, out_dir);
  if (options.slurm) return submit_sweep_to_slurm(plan, this_program(), options.submit);
  int workers = options.workers > 0 ? options.workers : plan.spec.workers;
  if (workers == 0) workers = std::max(1, omp_get_num_procs() / plan.spec.threads_per_case);
  return run_sweep_locally(plan, this_program(), workers);
}

int command_sweep_case(const std::string& dir, int index, const CommonOptions& options) {
  const SweepPlan plan = read_sweep_plan(dir);
  const int threads = options.threads > 0 ? options.threads : plan.spec.threads_per_case;
  return run_sweep_case(plan, index, this_program(), threads);
}

int command_mesh_cache(const std::string& action) {
  const std::string dir = mesh_cache_dir();
  if (dir.empty()) {
    fmt::print("mesh cache: off (GAPFLUX_MESH_CACHE=off, or no home folder)\n");
    return 0;
  }
  const CacheContents c = action == "clear" ? clear_mesh_cache(dir) : mesh_cache_contents(dir);
  fmt::print("mesh cache {}: {} {} mesh(es), {:.1f} MB\n", dir,
             action == "clear" ? "removed" : "holds", c.entries, c.bytes / 1e6);
  return 0;
}

int command_collect(const std::string& dir) {
  const SweepPlan plan = read_sweep_plan(dir);
  const SweepTable t = collect_sweep(plan);
  fmt::print(
      "collect: {} case(s): {} finished, {} failed, {} not run; wrote {}/sweep.csv and "
      "sweep.h5\n",
      plan.cases.size(), t.finished, t.failed, t.pending, dir);
  return t.finished == static_cast<int>(plan.cases.size()) ? 0 : 1;
}

}  // namespace gapflux
