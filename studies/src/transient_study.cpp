#include "transient_study.hpp"

#include "studies/prepared_case.hpp"

#include "analysis_printout.hpp"
#include "studies/interrupts.hpp"
#include "study_summary.hpp"
#include "version.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <csignal>
#include <filesystem>
#include <numbers>

#include "cases/case_reader.hpp"
#include "postproc/ensight_writer.hpp"
#include "postproc/field_evaluation.hpp"
#include "postproc/field_snapshot.hpp"
#include "postproc/output_file.hpp"
#include "postproc/result_sets.hpp"
#include "postproc/run_analysis.hpp"
#include "postproc/spectrum.hpp"
#include "postproc/summary.hpp"
#include "postproc/torque.hpp"
#include "postproc/vtu_writer.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver/newton_settings.hpp"
#include "solver/region_model.hpp"
#include "solver/rotor_currents.hpp"
#include "solver/supply_currents.hpp"
#include "solver/winding_resistance.hpp"

namespace gapflux {
namespace {

namespace fs = std::filesystem;

double now_s() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

std::string duration_text(double seconds) {
  const long s = std::lround(seconds);
  if (s < 60) return fmt::format("{}s", s);
  if (s < 3600) return fmt::format("{}m{:02d}s", s / 60, s % 60);
  return fmt::format("{}h{:02d}m", s / 3600, (s / 60) % 60);
}

}  // namespace

TransientStudy::TransientStudy(std::string case_path, Case c, std::string out_dir, FolderUse use,
                               OutputDetail detail)
    : case_path_(std::move(case_path)),
      out_dir_(std::move(out_dir)),
      folder_use_(use),
      detail_(detail),
      case_(std::move(c)) {}

void TransientStudy::run() {
  wall_start_s_ = now_s();
  set_up();
  const int first = open_results();
  set_up_s_ = now_s() - wall_start_s_;
  const bool terminal = isatty(fileno(stderr));
  for (int n = first; n < grid_.steps; ++n) {
    try {
      ensure_room_for_step(n);
      step(n);
    } catch (const OutputError& e) {
      // A write failed: results.h5 keeps the steps finished before (steps_done says how many).
      // Nothing more goes to a disk that refuses writes; rows of the failed step are dropped if
      // the file still takes that much.
      if (terminal) fmt::print(stderr, "\n");
      drop_unfinished_rows();
      fmt::print(stderr,
                 "gapflux: stopped at step {} of {}: {} steps are kept in {}; free space and "
                 "continue with --resume\n",
                 n + 1, grid_.steps, steps_done_, folder_->path("results.h5"));
      throw;
    } catch (const std::exception& e) {
      // Every finished step is in results.h5 already; the summary says where it stopped.
      finish(fmt::format("step {} of {}: {}", n + 1, grid_.steps, e.what()));
      throw;
    }
    if (const int sig = InterruptWatch::received()) {
      if (terminal) fmt::print(stderr, "\n");
      const std::string where =
          fmt::format("interrupted by {} after step {} of {}; continue with --resume",
                      sig == SIGINT ? "SIGINT" : "SIGTERM", n + 1, grid_.steps);
      fmt::print(stderr, "gapflux: {}\n", where);
      finish(where);
      throw Interrupted{sig};
    }
    if (settled_after_step(n)) {
      if (terminal) fmt::print(stderr, "\n");
      fmt::print(stderr, "settled after period {} (within {:g} %): the run ends here\n",
                 settled_at_period_, case_.study.steady_state_tolerance_pct);
      break;
    }
    const double elapsed = now_s() - wall_start_s_;
    const double left = elapsed / (n + 1 - first) * (grid_.steps - n - 1);
    if (terminal) {
      const int width = 30, filled = width * (n + 1) / grid_.steps;
      fmt::print(stderr, "\r  [{}{}] step {}/{}, newton {} ({} factorised), {} left   ",
                 std::string(filled, '#'), std::string(width - filled, '.'), n + 1, grid_.steps,
                 newton_last_, factorizations_last_, duration_text(left));
    } else {
      fmt::print(stderr, "step {}/{} t = {:.6f} s, newton {} ({} factorised), elapsed {}\n", n + 1,
                 grid_.steps, grid_.time(n), newton_last_, factorizations_last_,
                 duration_text(elapsed));
    }
  }
  if (terminal && settled_at_period_ == 0) fmt::print(stderr, "\n");
  finish("");
}

bool TransientStudy::settled_after_step(int n) {
  const int spp = grid_.steps_per_period, done = n + 1;
  if (!case_.study.stop_when_settled || done % spp != 0 || done / spp < 2) return false;
  const SteadyStateIndicator ss =
      steady_state_indicator(settle_record(done), case_.study.steady_state_tolerance_pct);
  if (!ss.reached) return false;
  settled_at_period_ = done / spp;
  // The settled period is the one analysed; the record says the run is whole (a resume has
  // nothing left to do).
  grid_.discarded_steps = done - spp;
  grid_.steps = done;
  h5_->attribute("/", "settled_at_period", static_cast<long>(settled_at_period_));
  h5_->flush();
  return true;
}

void TransientStudy::set_up() {
  fingerprint_ = case_fingerprint(case_path_, case_, version_string);
  if (supply_override_) case_.supply = *supply_override_;
  materials_ = resolve_region_materials(case_);
  lamination_ = build_lamination(case_);
  const MeshSettings mesh_settings = resolve_mesh_settings(case_, lamination_);
  for (const std::string& w : case_.warnings) fmt::print(stderr, "warning: {}\n", w);
  for (const std::string& w : mesh_settings.forecast.warnings)
    fmt::print(stderr, "warning: {}\n", w);
  // The case is valid: only now may the folder be locked (and, with --replace, cleared).
  folder_ = std::make_unique<RunFolder>(out_dir_, RunFolder::run_outputs(), folder_use_);
  if (folder_->resuming()) check_fingerprint();
  const double mesh_start_s = now_s();
  CachedMesh meshed = cached_mesh(lamination_, mesh_settings);
  mesh_ = std::move(meshed.mesh);
  mesh_from_cache_ = meshed.from_cache;
  mesh_s_ = now_s() - mesh_start_s;
  coils_ = coil_regions(mesh_, lamination_.winding);
  grid_ = make_time_grid(case_, mesh_.stator_ring.pitch_rad);
  airgap_samples_ =
      case_.output.airgap_samples > 0 ? case_.output.airgap_samples : default_airgap_samples(mesh_);
  winding_r_ = phase_resistance(case_, lamination_, materials_.coils);
  if (case_.supply.voltage_fed()) {
    impedance_ = {winding_r_.resistance_ohm, winding_r_.end_inductance_h};
    circuit_ = std::make_unique<WindingCircuit>(
        case_.supply.connection, impedance_, case_.study.time_scheme,
        case_.machine.stack_length_m * mesh_.symmetry.sectors, case_.supply);
  }
  if (cage_wanted()) set_up_cage();
  const int bars = case_.rotor.kind == RotorKind::cage ? case_.rotor.bars : 0;
  if (const std::string w = slot_passing_warning(grid_, case_.stator.slots, bars); !w.empty())
    fmt::print(stderr, "warning: {}\n", w);
}

int TransientStudy::open_results() {
  if (detail_ == OutputDetail::full) fs::create_directories(fs::path(out_dir_) / "fields");
  const std::string path = folder_->path("results.h5");
  if (folder_->resuming()) return resume_results(path);
  h5_ = std::make_unique<ResultsFile>(path);
  h5_->attribute("/", "schema", std::string("gapflux-results/1"));
  h5_->attribute("/", "case_name", case_.machine.name);
  h5_->attribute("/", "study", std::string("time_stepping"));
  h5_->attribute("/", "program_version", std::string(version_string));
  h5_->attribute("/", "case_fingerprint", fingerprint_.digest);
  h5_->attribute("/", "output_detail", std::string(to_string(detail_)));
  h5_->write_strings("case/settings", fingerprint_.lines);
  h5_->attribute("/", "steps_total", static_cast<long>(grid_.steps));
  h5_->attribute("/", "steps_done", 0L);
  h5_->attribute("/", "converged", 0L);
  h5_->attribute("/", "dt_s", grid_.dt_s);
  h5_->attribute("/", "steps_per_period", static_cast<long>(grid_.steps_per_period));
  h5_->attribute("/", "discarded_steps", static_cast<long>(grid_.discarded_steps));
  h5_->attribute("/", "rotor_currents",
                 std::string(case_.rotor_currents.bar_rms_a > 0 ? "imposed on the bars, not induced"
                                                                : "none"));
  h5_->attribute("/", "feed", std::string(case_.supply.voltage_fed() ? "voltage" : "current"));
  if (circuit_) {
    h5_->write("circuit/impedance",
               std::vector<double>{impedance_.resistance_ohm, impedance_.end_inductance_h},
               "ohm, H");
    h5_->attribute("circuit/impedance", "connection",
                   std::string(to_string(case_.supply.connection)));
    h5_->attribute("circuit/impedance", "time_scheme",
                   std::string(to_string(case_.study.time_scheme)));
  }
  write_mesh_datasets(*h5_, mesh_);
  h5_->flush();
  warn_if_run_will_not_fit();
  return 0;
}

void TransientStudy::step(int n) {
  const double t = grid_.time(n), angle = grid_.rotor_angle(n);
  // The rotor where it was (a locked rotor): the same band, so the system of the last step, its
  // solution and its factor serve again, and Newton's first step can go by CG on that factor.
  // Exact comparison on purpose: only the very same angle gives the same band.
  if (!system_ || angle != system_angle_rad_) {
    system_ = std::make_unique<MagnetostaticSystem>(mesh_, angle);
    system_angle_rad_ = angle;
    // Warm start from the last step. Per-node extrapolations through the last steps were
    // measured on the saturated running demo and needed more Newton iterations (10.5 per step
    // against 8.75 at 108 steps per period): slot passing is not smooth from step to step.
    if (have_last_ && x_last_.size() == system_->x().size())
      system_->warm_start(x_last_, shift_last_);
  }
  MagnetostaticSystem& system = *system_;
  // A current feed imposes the coil currents; a voltage feed leaves them to the circuit.
  std::vector<double> j =
      circuit_ ? std::vector<double>(mesh_.regions.size(), 0.0)
               : region_current_density(coils_, supply_phase_currents_a(case_.supply, t));
  const std::vector<double> bars =
      bar_current_density(mesh_, case_, lamination_.winding, lamination_.bars, t, angle);
  for (std::size_t r = 0; r < j.size(); ++r) j[r] += bars[r];
  RegionModel model = make_region_model(mesh_, materials_, j);
  const NewtonSettings settings = newton_settings(case_.solver);

  // The circuits coupled to the field: each eliminated into a term of the Newton system.
  std::vector<CoupledCircuit*> circuits;
  const bool harmonic_start = !have_last_ && case_.study.start == StartKind::time_harmonic;
  if (harmonic_start) start_from_harmonic(system, model);
  if (circuit_) {
    circuit_->attach(coil_coupling(system.assembler(), coils_));
    if (!have_last_ && !harmonic_start)
      start_circuit(system, model, circuit_->coupling(), bars, settings);
    circuits.push_back(circuit_.get());
  }
  if (cage_wanted()) {
    if (!cage_) start_cage(system, model, settings);
    x_before_ = cage_->newest_history();
    cage_->prepare(grid_.dt_s);
    add_eddy_currents(model);
    circuits.push_back(cage_.get());
  }
  std::vector<LowRankTerm> terms;
  std::vector<const LowRankTerm*> parts;
  for (CoupledCircuit* c : circuits) terms.push_back(c->step_term(t, grid_.dt_s));
  for (const LowRankTerm& term : terms) parts.push_back(&term);
  const LowRankTerm stacked = stack_terms(parts);
  NewtonReport report = system.solve(model, settings, circuits.empty() ? nullptr : &stacked);
  for (std::size_t k = 0; k < circuits.size(); ++k)
    circuits[k]->finish_step(terms[k], system.x(), grid_.dt_s);
  std::array<double, 3> currents =
      circuit_ ? circuit_->last().branch_current_a : supply_phase_currents_a(case_.supply, t);
  WindingCircuit::StepResult circuit_step;
  if (circuit_) circuit_step = circuit_->last();
  newton_last_ = report.iterations;
  factorizations_last_ = report.factorizations;
  newton_total_ += report.iterations;
  factorizations_total_ += report.factorizations;
  cg_total_ += report.cg_iterations;

  // Post-processing of this step.
  const double stack = case_.machine.stack_length_m;
  const Assembler& a = system.assembler();
  const double torque = arkkio_torque_nm(a, system.x(), mesh_, stack);
  const auto psi = phase_flux_linkage(a, system.x(), coils_, stack, mesh_.symmetry.sectors);
  const AirgapSamples s = sample_airgap(a, system.x(), mesh_, airgap_samples_);
  std::vector<double> sigma(s.b_r_tesla.size());
  for (std::size_t k = 0; k < sigma.size(); ++k)
    sigma[k] =
        (s.b_r_tesla[k] * s.b_r_tesla[k] - s.b_theta_tesla[k] * s.b_theta_tesla[k]) / (2.0 * mu0);
  std::vector<double> emf(3, 0.0);
  // Backward difference, consistent with the step sequence; the first step has no predecessor.
  if (have_last_)
    for (int k = 0; k < 3; ++k) emf[k] = (psi[k] - psi_last_[k]) / grid_.dt_s;

  // Append the step, then mark it done: a kill between the two loses only this step.
  std::error_code size_error;
  const std::uint64_t file_bytes_before = fs::file_size(folder_->path("results.h5"), size_error);
  h5_->append_row("steps/time", {t}, "s");
  h5_->append_row("steps/rotor_angle", {angle}, "rad");
  h5_->append_row("steps/torque", {torque}, "N*m");
  h5_->append_row("steps/phase_current", {currents.begin(), currents.end()}, "A");
  h5_->append_row("steps/flux_linkage", {psi.begin(), psi.end()}, "Wb");
  h5_->append_row("steps/emf", emf, "V");
  if (circuit_) {
    const auto& v = circuit_step.branch_voltage_v;
    const auto line_i = line_currents_a(case_.supply.connection, currents);
    const auto line_v = supply_line_voltages_v(case_.supply, t);
    const auto phase_v = supply_phase_voltages_v(case_.supply, t);
    h5_->append_row("steps/winding_voltage", {v.begin(), v.end()}, "V");
    h5_->append_row("steps/line_current", {line_i.begin(), line_i.end()}, "A");
    h5_->append_row("steps/line_voltage", {line_v.begin(), line_v.end()}, "V");
    h5_->append_row("steps/supply_voltage", {phase_v.begin(), phase_v.end()}, "V");
  }
  if (cage_) write_cage_step(system, angle);
  h5_->append_row("steps/newton_iterations", {double(report.iterations)}, "1");
  h5_->append_row("steps/newton_factorizations", {double(report.factorizations)}, "1");
  h5_->append_row("steps/cg_iterations", {double(report.cg_iterations)}, "1");
  h5_->append_row("steps/airgap_B_r", s.b_r_tesla, "T");
  h5_->append_row("steps/airgap_B_theta", s.b_theta_tesla, "T");
  h5_->append_row("steps/radial_force_density", sigma, "N/m^2");
  if (detail_ == OutputDetail::full)
    h5_->append_row("steps/A", nodal_potential(mesh_, system.dofs(), system.x()), "Wb/m");
  const ElementFields fields = evaluate_element_fields(system.assembler(), system.x(), model);
  if (n >= first_b_step()) {
    // B per mesh triangle in the frame of its side (rotor triangles turned back by the rotor
    // angle), for the saturation map and the iron loss.
    std::vector<double> b(2 * mesh_.n_triangles());
    const Eigen::Rotation2Dd back(-angle);
    for (std::size_t t = 0; t < mesh_.n_triangles(); ++t) {
      const bool rotor = is_rotor_side(mesh_.regions[mesh_.triangle_region[t]].tag.kind);
      const Vec2 v = rotor ? Vec2(back * fields.b_tesla[t]) : fields.b_tesla[t];
      b[2 * t] = v.x(), b[2 * t + 1] = v.y();
    }
    h5_->append_row("steps/B", b, "T");
  }
  if (n == 0 || !h5_->exists("airgap/theta")) {
    h5_->write("airgap/theta", s.theta_rad, "rad");
    h5_->attribute("airgap/theta", "radius_m", s.radius_m);
  }
  h5_->write("restart/x",
             std::vector<double>(system.x().data(), system.x().data() + system.x().size()), "1");
  if (cage_)  // the cage's second history value (BDF2) after a resume
    h5_->write("restart/x_previous",
               std::vector<double>(x_before_.data(), x_before_.data() + x_before_.size()), "1");
  if (snapshot_at(n)) write_fields(n, system, fields);
  h5_->attribute("/", "steps_done", static_cast<long>(n + 1));
  h5_->flush();

  measure_step_bytes(size_error ? 0 : file_bytes_before, snapshot_at(n));

  x_last_ = system.x();
  shift_last_ = system.band().shift;
  psi_last_ = psi;
  have_last_ = true;
  steps_done_ = n + 1;
}

void TransientStudy::write_fields(int n, const MagnetostaticSystem& system,
                                  const ElementFields& fields) {
  FieldSnapshot snap = make_field_snapshot(system.assembler(), system.x(), mesh_, fields,
                                           cage_ ? &bar_density_ : nullptr);
  write_fields_vtu(folder_->path(snapshot_file(n)), snap);
  write_ensight_step(out_dir_, n, snap);
  snapshot_steps_.emplace_back(grid_.time(n), n);
  std::vector<std::pair<double, std::string>> files;
  for (const auto& [time, step] : snapshot_steps_) files.emplace_back(time, snapshot_file(step));
  write_pvd(folder_->path("fields.pvd"), files);
  write_ensight_case(out_dir_, snapshot_steps_, cage_ != nullptr);
}

std::string snapshot_file(int step) {
  return fmt::format("fields/step_{:05d}.vtu", step);
}

std::string TransientStudy::summary_path() const {
  return (fs::path(out_dir_) / "summary.json").string();
}

void TransientStudy::finish(const std::string& failure) {
  RunSummary s =
      common_summary(case_, lamination_, mesh_, static_cast<std::size_t>(x_last_.size()));
  s.time_stepping = true;
  s.dt_s = grid_.dt_s;
  s.steps_per_period = grid_.steps_per_period;
  s.discarded_steps = grid_.discarded_steps;
  s.band_pitches_per_step = grid_.band_pitches_per_step;
  s.mechanical_speed_rpm = grid_.mechanical_speed_rad_s * 60.0 / (2.0 * std::numbers::pi);

  // Torque statistics and spectrum over the retained steps (all finished steps past start-up).
  const std::vector<double> torque =
      h5_->rows("steps/torque") ? h5_->read("steps/torque") : std::vector<double>{};
  const int done = static_cast<int>(torque.size());
  if (done > grid_.discarded_steps) {
    const std::vector<double> kept(torque.begin() + grid_.discarded_steps, torque.end());
    double sum = 0, lo = 1e300, hi = -1e300;
    for (double v : kept) sum += v, lo = std::min(lo, v), hi = std::max(hi, v);
    s.torque_available = true;
    s.torque_mean_nm = sum / kept.size();
    s.torque_min_nm = lo;
    s.torque_max_nm = hi;
    s.torque_ripple_pct =
        std::abs(s.torque_mean_nm) > 0 ? 100.0 * (hi - lo) / std::abs(s.torque_mean_nm) : 0.0;
  }
  s.steps = done;
  s.newton_iterations = newton_total_;
  s.newton_factorizations = factorizations_total_;
  s.cg_iterations = cg_total_;
  s.converged = failure.empty();
  s.failure = failure;
  s.wall_s = now_s() - wall_start_s_;
  s.set_up_s = set_up_s_;
  s.mesh_s = mesh_s_;
  s.mesh_from_cache = mesh_from_cache_;
  // What the supply did, over the last whole periods; written even after a failure, from the
  // steps that finished.
  const RunRecord record = read_record(done);
  s.analysis = analyse_run(record);
  s.steady_state = steady_state_indicator(record, case_.study.steady_state_tolerance_pct);
  s.start = case_.study.start == StartKind::time_harmonic ? "time_harmonic" : "cold";
  s.start_harmonic_solves = start_iterations_;
  s.start_harmonic_s = start_s_;
  if (h5_->exists("start/predicted")) {  // also after a resume, which does not start again
    const std::vector<double> p = h5_->read("start/predicted");
    if (p.size() == 7)
      s.start_prediction = RunSummary::HarmonicPrediction{p[0], p[1], p[2], p[3], p[4], p[5], p[6]};
    if (h5_->has_attribute("/", "start_harmonic_iterations"))
      s.start_harmonic_solves =
          static_cast<int>(h5_->read_long_attribute("/", "start_harmonic_iterations"));
  }
  s.settled_stop = case_.study.stop_when_settled;
  s.settled_at_period = settled_at_period_;
  s.periods_run = done / grid_.steps_per_period;
  s.periods_allowed = case_.study.periods;
  if (circuit_) {
    s.voltage_fed = true;
    s.connection = to_string(case_.supply.connection);
    s.voltage_basis = to_string(case_.supply.voltage_basis);
    s.time_scheme = to_string(case_.study.time_scheme);
    const WindingResistance& r = winding_r_;
    s.phase_resistance_ohm = r.resistance_ohm;
    s.resistance_given = r.resistance_given;
    s.end_inductance_h = r.end_inductance_h;
    s.end_inductance_estimated = r.end_inductance_estimated;
  }
  write_analysis(*h5_, *s.analysis);
  s.flux_linkage_wb = psi_last_;
  // |B| per triangle and step: the rows of steps/B (from step b_first on) of the retained steps.
  const int b_first = first_b_step();
  const std::vector<double> b_rows = done > b_first ? h5_->read("steps/B") : std::vector<double>{};
  for (std::size_t i = 2 * mesh_.n_triangles() * std::max(0, grid_.discarded_steps - b_first);
       i + 1 < b_rows.size(); i += 2)
    s.b_peak_tesla = std::max(s.b_peak_tesla, std::hypot(b_rows[i], b_rows[i + 1]));
  // A lean run keeps element fields for its last period only: stopped earlier, it has no
  // saturation map and no losses.
  if (s.analysis->periods >= 1 && done - b_first >= grid_.steps_per_period) {
    s.saturation = saturation_over_last_period(done, b_rows, b_first);
    s.losses_available = true;
    s.iron_stator_w = iron_loss_.stator_w;
    s.iron_rotor_w = iron_loss_.rotor_w;
    // Copper: I²R per phase with the RMS over the same period (harmonics included).
    const WindingResistance& r = winding_r_;
    const std::vector<double> i = h5_->read("steps/phase_current");
    const int spp = grid_.steps_per_period;
    s.copper_w = 0.0;
    for (int n = done - spp; n < done; ++n)
      for (int k = 0; k < 3; ++k)
        s.copper_w += r.resistance_ohm * i[n * 3 + k] * i[n * 3 + k] / spp;
    s.phase_resistance_ohm = r.resistance_ohm;
    s.end_winding_length_m = r.end_winding_length_m;
    s.end_winding_estimated = r.end_winding_estimated;
    s.conductor_temperature_c = r.temperature_c;
  }
  cage_and_power_summary(s, done);
  s.torque_harmonics.clear();
  for (const TorqueHarmonic& t : s.analysis->torque_harmonics)
    s.torque_harmonics.emplace_back(t.order, t.amplitude_nm);
  if (failure.empty()) h5_->attribute("/", "converged", 1L);
  h5_->flush();
  write_summary_json(summary_path(), s);
  summary_ = s;

  fmt::print("case: {}\n", case_.machine.name);
  fmt::print(
      "time stepping: {} steps ({} per period, dt {:.3e} s), rotor {:.2f} rpm, {} Newton "
      "iterations, {} of them with a new factor\n",
      done, grid_.steps_per_period, grid_.dt_s, s.mechanical_speed_rpm, newton_total_,
      factorizations_total_);
  if (s.torque_available)
    fmt::print(
        "torque (Arkkio, over {} retained steps): mean {:.4f} N·m, min {:.4f}, max {:.4f}, ripple "
        "{:.2f} %\n",
        done - grid_.discarded_steps, s.torque_mean_nm, s.torque_min_nm, s.torque_max_nm,
        s.torque_ripple_pct);
  if (s.bar_rms_a > 0)
    fmt::print("rotor bar currents: {:.1f} A RMS imposed (not induced)\n", s.bar_rms_a);
  if (circuit_)
    fmt::print("voltage feed, {} connection, {}: R = {:.4g} Ω{}, L_end = {:.4g} mH{} per branch\n",
               s.connection, s.time_scheme, s.phase_resistance_ohm,
               s.resistance_given ? " (given)" : "", s.end_inductance_h * 1e3,
               s.end_inductance_estimated ? " (estimated)" : " (given)");
  if (s.steady_state && !s.steady_state->change_pct.empty())
    fmt::print(
        "steady state: last period's flux-linkage change {:.3g} %, DC part {:.3g} % ({} the {:g} "
        "% tolerance)\n",
        s.steady_state->change_pct.back(), s.steady_state->dc_pct.back(),
        s.steady_state->reached ? "within" : "NOT within", s.steady_state->tolerance_pct);
  print_analysis_table(stdout, *s.analysis, s.torque_mean_nm, s.torque_ripple_pct);
  if (s.saturation) print_saturation_table(stdout, *s.saturation);
  print_cage_and_power(stdout, s);
  if (s.losses_available)
    fmt::print(
        "  losses over the last period: iron stator {:.1f} W, rotor {:.1f} W (Steinmetz/"
        "Bertotti from the grade figure; rotational loss not separate); stator copper "
        "{:.1f} W (R = {:.4f} Ω per phase at {:g} °C)\n",
        s.iron_stator_w, s.iron_rotor_w, s.copper_w, s.phase_resistance_ohm,
        s.conductor_temperature_c);
  fmt::print("wrote {}/results.h5, summary.json, fields.pvd and fields.case (snapshots)\n",
             out_dir_);
}

}  // namespace gapflux
