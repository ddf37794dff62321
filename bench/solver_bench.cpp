// Solver benchmark: per Newton iteration, assembly / numeric factorisation / solve, against the
// bare CHOLMOD factor + solve of the same matrix; Newton iterations from a cold and a warm
// start; peak memory; and how time grows with the DOF count over a refined series.
//
//   build/bench/gapflux_bench [--quick] [--threads N] [--stepping STEPS] [--history]
//                             [--steps-per-period K] [--cg-budget N] [--locked]
//                             [--new-system-each-step] [--help]
// An unknown option or a value that is not a whole number is refused (exit 2).
//
// --stepping STEPS runs only the time-stepping figures over that many steps; --history prints
// each step's Newton iterations (residual, line-search step, update, new factor or CG);
// --steps-per-period overrides the running case's step; --cg-budget sets the CG iterations
// allowed on an earlier factor (0: plain Newton, a new factor every iteration); --locked holds
// the rotor still, where the last step's system and factor serve again (as in `gapflux run`),
// unless --new-system-each-step builds a new one every step (as before 2026-12-02).
// The static table times plain Newton per iteration (medians, the converging assembly included)
// against bare CHOLMOD (the median of five); cold_f and warm_f are
// the factorisations the same solves need with the default factor reuse.
//
// The time-stepping block runs bench/cases/pump_running_imposed.toml (current-fed, imposed bar
// set): the field solver alone. Prints figures and ratios; it is not a test and asserts nothing.
#include <fmt/format.h>
#include <omp.h>

#include <sys/resource.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <memory>
#include <numbers>
#include <string>
#include <vector>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "postproc/field_evaluation.hpp"
#include "postproc/torque.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver/region_model.hpp"
#include "solver/rotor_currents.hpp"
#include "solver/sparse_cholesky.hpp"
#include "solver/time_grid.hpp"
#include "solver/winding_sources.hpp"

using namespace gapflux;

namespace {

double seconds(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

double median(std::vector<double> v) {
  if (v.empty()) return 0.0;
  std::sort(v.begin(), v.end());
  const std::size_t n = v.size();
  return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

double peak_memory_mb() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return u.ru_maxrss / 1024.0;
}

struct Row {
  std::string name;
  int dofs = 0;
  int cold_iterations = 0, warm_iterations = 0;      // plain Newton (a new factor each iteration)
  int cold_factors = 0, warm_factors = 0;            // factorisations with the default CG reuse
  double assembly_s = 0, factor_s = 0, solve_s = 0;  // per iteration, averages
  double bare_s = 0;                                 // CHOLMOD factor + solve alone
  double analyse_s = 0;
  double mesh_s = 0;
  std::size_t factor_nnz = 0;
};

Row run_case(const std::string& name, const std::string& path, double refine) {
  Row row;
  row.name = name;
  Case c = read_case_file(path);
  const Lamination lam = build_lamination(c);
  MeshSettings settings = resolve_mesh_settings(c, lam);
  if (refine != 1.0) {
    settings.airgap_size_m *= refine;
    settings.iron_size_m *= refine;
    settings.elements_per_turn /= refine;
    const int multiple = 4 * lam.symmetry.sectors;
    settings.band_nodes =
        static_cast<int>(std::ceil(settings.band_nodes / refine / multiple)) * multiple;
  }
  auto t0 = std::chrono::steady_clock::now();
  const Mesh mesh = mesh_lamination(lam, settings);
  row.mesh_s = seconds(t0);
  const RegionMaterials materials = resolve_region_materials(c);
  const CoilRegions coils = coil_regions(mesh, lam.winding);
  const double omega = 2 * std::numbers::pi * c.supply.frequency_hz;
  const auto currents_at = [&](double t) {
    std::array<double, 3> i{};
    for (int k = 0; k < 3; ++k)
      i[k] = std::sqrt(2.0) * c.supply.phases[k].rms *
             std::cos(omega * t + c.supply.phases[k].angle_rad);
    return i;
  };
  MagnetostaticSystem system(mesh, 0.0);
  row.dofs = system.assembler().n_dofs();
  // Timing per iteration against bare CHOLMOD: plain Newton, every iteration factorises.
  NewtonSettings newton;
  newton.cg_budget = 0;
  RegionModel model =
      make_region_model(mesh, materials, region_current_density(coils, currents_at(0.0)));
  {
    // The same solves with the default factor reuse: how many factorisations they need.
    MagnetostaticSystem reuse(mesh, 0.0);
    row.cold_factors = reuse.solve(model, NewtonSettings{}).factorizations;
    const RegionModel next = make_region_model(
        mesh, materials, region_current_density(coils, currents_at(0.01 / c.supply.frequency_hz)));
    row.warm_factors = reuse.solve(next, NewtonSettings{}).factorizations;
  }
  const NewtonReport cold = system.solve(model, newton);
  row.cold_iterations = cold.iterations;
  row.analyse_s = cold.analyse_s;
  // Medians per iteration (the first iteration's assembly also sets up the pattern; a median
  // is not moved by it). The converging assembly is spread over the iterations it ends.
  std::vector<double> assembly, factor, solve;
  for (const NewtonIteration& it : cold.history) {
    assembly.push_back(it.assembly_s + cold.final_assembly_s / std::max(1, cold.iterations));
    factor.push_back(it.factorize_s);
    solve.push_back(it.solve_s);
  }
  row.assembly_s = median(assembly);
  row.factor_s = median(factor);
  row.solve_s = median(solve);

  // Warm start: the next time step of a 100-steps-per-period study, from this solution.
  model = make_region_model(
      mesh, materials, region_current_density(coils, currents_at(0.01 / c.supply.frequency_hz)));
  row.warm_iterations = system.solve(model, newton).iterations;

  // Bare CHOLMOD on the last Jacobian: numeric factorisation and one solve, the median of
  // five (a median against the medians above: the ratio is of like to like).
  Assembler& a = system.assembler();
  a.assemble(system.x(), model, true);
  SparseCholesky bare;
  bare.analyze(a.n_dofs(), a.column_starts(), a.row_indices());
  std::vector<double> x(a.n_dofs()), b(a.n_dofs(), 1.0);
  std::vector<double> bare_times;
  for (int k = 0; k < 5; ++k) {
    t0 = std::chrono::steady_clock::now();
    bare.factorize(a.values());
    bare.solve(b.data(), x.data());
    bare_times.push_back(seconds(t0));
  }
  row.bare_s = median(bare_times);
  row.factor_nnz = bare.factor_nonzeros();
  return row;
}

// Time stepping: per step, the band re-triangulation and system set-up ("remesh"), Newton's
// assembly / factorisation / solve, and the post-processing (torque, flux linkage, airgap).
struct SteppingOptions {
  int steps = 0;
  bool history = false;
  int steps_per_period = 0;  // 0: the case's
  int cg_budget = -1;        // −1: the default
  bool locked = false;
  bool new_system_each_step = false;
};

void run_stepping(const std::string& path, const SteppingOptions& o) {
  const int steps = o.steps, cg_budget = o.cg_budget;
  const bool history = o.history;
  Case c = read_case_file(path);
  if (o.steps_per_period > 0) c.study.steps_per_period = o.steps_per_period;
  if (o.locked) c.study.motion = Motion::locked;
  NewtonSettings newton;
  if (cg_budget >= 0) newton.cg_budget = cg_budget;
  const Lamination lam = build_lamination(c);
  const Mesh mesh = mesh_lamination(lam, resolve_mesh_settings(c, lam));
  const RegionMaterials materials = resolve_region_materials(c);
  const CoilRegions coils = coil_regions(mesh, lam.winding);
  const TimeGrid grid = make_time_grid(c, mesh.stator_ring.pitch_rad);
  const double omega = 2 * std::numbers::pi * c.supply.frequency_hz;
  double remesh = 0, assembly = 0, factor = 0, solve = 0, post = 0, wall = 0;
  int iterations = 0, analyses = 0, factorizations = 0, krylov = 0;
  double band_residual = 0, other_residual = 0;
  Eigen::VectorXd last;
  int last_shift = 0;
  std::unique_ptr<MagnetostaticSystem> kept;
  double kept_angle = 0.0;
  for (int n = 0; n < steps; ++n) {
    const auto t_step = std::chrono::steady_clock::now();
    const double t = grid.time(n), angle = grid.rotor_angle(n);
    auto t0 = std::chrono::steady_clock::now();
    // The same angle gives the same band: the study keeps the system (and its factor) then.
    if (!kept || angle != kept_angle || o.new_system_each_step) {
      kept = std::make_unique<MagnetostaticSystem>(mesh, angle);
      kept_angle = angle;
      if (last.size()) kept->warm_start(last, last_shift);
    }
    MagnetostaticSystem& system = *kept;
    remesh += seconds(t0);
    std::array<double, 3> i{};
    for (int k = 0; k < 3; ++k)
      i[k] = std::sqrt(2.0) * c.supply.phases[k].rms *
             std::cos(omega * t + c.supply.phases[k].angle_rad);
    std::vector<double> j = region_current_density(coils, i);
    const std::vector<double> bars = bar_current_density(mesh, c, lam.winding, lam.bars, t, angle);
    for (std::size_t r = 0; r < j.size(); ++r) j[r] += bars[r];
    const RegionModel model = make_region_model(mesh, materials, j);
    if (n > 0) {
      // Where the warm start's residual sits: on the nodes of the band's triangles (the two
      // rings and the band's own mid-edge nodes) or anywhere else.
      Assembler& as = system.assembler();
      as.assemble(system.x(), model, false);
      std::vector<char> in_band(as.n_dofs(), 0);
      const int band_region = mesh.region_index("moving_band");
      for (const ElementRecord& e : as.elements())
        if (e.region == band_region)
          for (int i = 0; i < e.nodes.n_nodes(); ++i)
            if (e.dof[i] >= 0) in_band[e.dof[i]] = 1;
      double on = 0, off = 0;
      for (int i = 0; i < as.n_dofs(); ++i)
        (in_band[i] ? on : off) += as.residual()[i] * as.residual()[i];
      const double load = std::max(as.load_norm(), 1e-300);
      band_residual += std::sqrt(on) / load;
      other_residual += std::sqrt(off) / load;
    }
    const NewtonReport report = system.solve(model, newton);
    if (history)
      for (const NewtonIteration& it : report.history)
        fmt::print(
            "    step {} iteration {}: residual {:.3e}, line-search step {:.3f}, update {:.3e}, "
            "{}, CG {}\n",
            n, it.iteration, it.relative_residual, it.step, it.relative_update,
            it.factorized ? "new factor" : "earlier factor", it.cg_iterations);
    iterations += report.iterations;
    factorizations += report.factorizations;
    krylov += report.cg_iterations;
    analyses += report.analysed;
    for (const NewtonIteration& it : report.history) {
      assembly += it.assembly_s;
      factor += it.factorize_s;
      solve += it.solve_s;
    }
    assembly += report.final_assembly_s;
    remesh += report.analyse_s;
    t0 = std::chrono::steady_clock::now();
    arkkio_torque_nm(system.assembler(), system.x(), mesh, c.machine.stack_length_m);
    phase_flux_linkage(system.assembler(), system.x(), coils, c.machine.stack_length_m,
                       mesh.symmetry.sectors);
    sample_airgap(system.assembler(), system.x(), mesh, default_airgap_samples(mesh));
    post += seconds(t0);
    last = system.x();
    last_shift = system.band().shift;
    wall += seconds(t_step);
  }
  fmt::print("time stepping {} ({} steps of {} per period, {} DOFs{}):\n",
             path.substr(path.rfind('/') + 1), steps, grid.steps_per_period, last.size(),
             o.locked ? (o.new_system_each_step ? ", rotor locked, a new system each step"
                                                : ", rotor locked, the system kept")
                      : "");
  fmt::print(
      "  per step: wall {:.3f} s = band + set-up + analysis {:.3f} + assembly {:.3f} + "
      "factorisation {:.3f} "
      "+ solve {:.3f} + post-processing {:.3f}\n",
      wall / steps, remesh / steps, assembly / steps, factor / steps, solve / steps, post / steps);
  fmt::print(
      "  Newton iterations per step {:.2f}, of them with a new factorisation {:.2f} (the others "
      "by CG on an earlier factor, {:.1f} CG iterations per step); symbolic analyses {} of {} "
      "steps; per electrical period {:.1f} s\n",
      double(iterations) / steps, double(factorizations) / steps, double(krylov) / steps, analyses,
      steps, wall / steps * grid.steps_per_period);
  fmt::print(
      "  warm-start relative residual ‖r‖/‖f‖ (mean over steps 2…): {:.3e} on the band's "
      "nodes, {:.3e} elsewhere\n",
      band_residual / std::max(1, steps - 1), other_residual / std::max(1, steps - 1));
}

// The options, each with whether it takes a whole-number value, and its one-line help.
struct BenchOption {
  const char* name;
  bool takes_value;
  const char* help;
};
constexpr BenchOption bench_options[] = {
    {"--quick", false, "three sizes of the series instead of six; 6 time steps instead of 20"},
    {"--threads", true, "OpenMP threads (default: all cores)"},
    {"--stepping", true, "only the time-stepping figures, over this many steps"},
    {"--history", false, "print each step's Newton iterations"},
    {"--steps-per-period", true, "override the running case's steps per period"},
    {"--cg-budget", true, "CG iterations allowed on an earlier factor (0: a new factor always)"},
    {"--locked", false, "hold the rotor still (the system and factor are kept between steps)"},
    {"--new-system-each-step", false, "with --locked: a new system every step"},
    {"--help", false, "this text"},
};

void print_usage(std::FILE* out) {
  fmt::print(out, "usage: gapflux_bench [options]\n");
  for (const BenchOption& o : bench_options)
    fmt::print(out, "  {:<24} {}\n", fmt::format("{}{}", o.name, o.takes_value ? " N" : ""),
               o.help);
}

}  // namespace

int main(int argc, char** argv) {
  bool quick = false;
  int stepping_only = 0;
  SteppingOptions stepping;
  for (int i = 1; i < argc; ++i) {
    const std::string word = argv[i];
    const BenchOption* option = nullptr;
    for (const BenchOption& o : bench_options)
      if (word == o.name) option = &o;
    if (!option) {
      fmt::print(stderr, "gapflux_bench: unknown option {}\n", word);
      print_usage(stderr);
      return 2;
    }
    int value = 0;
    if (option->takes_value) {
      const char* text = i + 1 < argc ? argv[++i] : "";
      char* end = nullptr;
      const long v = std::strtol(text, &end, 10);
      if (*text == '\0' || *end != '\0' || v < 0 || v > 1000000) {
        fmt::print(stderr, "gapflux_bench: {} needs a whole number ≥ 0 (got \"{}\")\n", word, text);
        return 2;
      }
      value = static_cast<int>(v);
    }
    if (word == "--help") {
      print_usage(stdout);
      return 0;
    }
    if (word == "--quick") quick = true;
    if (word == "--history") stepping.history = true;
    if (word == "--locked") stepping.locked = true;
    if (word == "--new-system-each-step") stepping.new_system_each_step = true;
    if (word == "--stepping") stepping_only = value;
    if (word == "--steps-per-period") stepping.steps_per_period = value;
    if (word == "--cg-budget") stepping.cg_budget = value;
    if (word == "--threads" && value > 0) omp_set_num_threads(value);
  }
  const std::string dir = GAPFLUX_EXAMPLES_DIR;
  // The field solver's own stepping cost: the running demo current-fed with an imposed bar set
  // (the induced cage's cost is measured on whole runs, docs/performance.md).
  const std::string stepping_case =
      std::string(GAPFLUX_BENCH_CASES_DIR) + "/pump_running_imposed.toml";
  if (stepping_only > 0) {
    stepping.steps = stepping_only;
    run_stepping(stepping_case, stepping);
    return 0;
  }
  std::vector<std::pair<std::string, double>> series = {
      {"pump_4p36s x2.0", 2.0}, {"pump_4p36s x1.0", 1.0}, {"pump_4p36s x0.6", 0.6}};
  if (!quick) {
    series.push_back({"pump_4p36s x0.4", 0.4});
    series.push_back({"pump_4p36s x0.28", 0.28});
    series.push_back({"pump_4p36s x0.18", 0.18});
  }
  fmt::print("gapflux solver benchmark ({} threads)\n", omp_get_max_threads());
  fmt::print(
      "{:<22} {:>8} {:>6} {:>5} {:>7} {:>7} {:>9} {:>9} {:>9} {:>9} {:>9} {:>7} {:>8} {:>9}\n",
      "case", "dofs", "cold", "warm", "cold_f", "warm_f", "assem_s", "factor_s", "solve_s",
      "iter_s", "bare_s", "ratio", "mesh_s", "L_nnz");
  std::vector<Row> rows;
  const auto print = [](const Row& r) {
    const double iteration = r.assembly_s + r.factor_s + r.solve_s;
    fmt::print(
        "{:<22} {:>8} {:>6} {:>5} {:>7} {:>7} {:>9.4f} {:>9.4f} {:>9.4f} {:>9.4f} {:>9.4f} "
        "{:>7.2f} "
        "{:>8.2f} {:>9}\n",
        r.name, r.dofs, r.cold_iterations, r.warm_iterations, r.cold_factors, r.warm_factors,
        r.assembly_s, r.factor_s, r.solve_s, iteration, r.bare_s, iteration / r.bare_s, r.mesh_s,
        r.factor_nnz);
    std::fflush(stdout);
  };
  for (const char* demo : {"compressor_2p24s", "pump_4p36s"}) {
    rows.push_back(run_case(demo, dir + "/" + demo + ".toml", 1.0));
    print(rows.back());
  }
  std::vector<Row> scaled;
  for (const auto& [name, refine] : series) {
    scaled.push_back(run_case(name, dir + "/pump_4p36s.toml", refine));
    print(scaled.back());
  }
  // Least-squares slope of log(time per iteration) against log(DOFs).
  double sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (const Row& r : scaled) {
    const double lx = std::log(r.dofs), ly = std::log(r.assembly_s + r.factor_s + r.solve_s);
    sx += lx, sy += ly, sxx += lx * lx, sxy += lx * ly;
  }
  const double n = scaled.size();
  fmt::print("time per Newton iteration ∝ DOFs^{:.3f} over {:.0f}…{:.0f} DOFs\n",
             (n * sxy - sx * sy) / (n * sxx - sx * sx), double(scaled.front().dofs),
             double(scaled.back().dofs));
  stepping.steps = quick ? 6 : 20;
  run_stepping(stepping_case, stepping);
  fmt::print("peak memory {:.0f} MB\n", peak_memory_mb());
  return 0;
}
