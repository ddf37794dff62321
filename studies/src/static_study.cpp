#include "static_study.hpp"

#include "studies/prepared_case.hpp"

#include "study_summary.hpp"

#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <numbers>

#include "cases/case_reader.hpp"
#include "postproc/ensight_writer.hpp"
#include "postproc/field_evaluation.hpp"
#include "postproc/field_snapshot.hpp"
#include "postproc/output_file.hpp"
#include "postproc/result_sets.hpp"
#include "postproc/results_file.hpp"
#include "postproc/summary.hpp"
#include "postproc/vtu_writer.hpp"
#include "solver/newton_settings.hpp"
#include "solver/region_model.hpp"
#include "solver/rotor_currents.hpp"
#include "solver/supply_currents.hpp"

namespace gapflux {
namespace {

constexpr int nested_dissection_above_dofs = 150000;  // see set_up()

double now_s() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

}  // namespace

StaticStudy::StaticStudy(std::string case_path, Case c, std::string out_dir, FolderUse use)
    : case_path_(std::move(case_path)),
      out_dir_(std::move(out_dir)),
      folder_use_(use),
      case_(std::move(c)) {}

void StaticStudy::run() {
  wall_start_s_ = now_s();
  set_up();
  set_up_s_ = now_s() - wall_start_s_;
  try {
    solve_and_write();
  } catch (const OutputError&) {
    folder_->discard_partial_files();  // only whole files stay under their names
    throw;
  }
}

void StaticStudy::solve_and_write() {
  try {
    solve();
  } catch (const NumericalError& e) {
    report_ = e.report();
    // Where the field is most extreme is where a failing solve usually goes wrong.
    std::string where = "\n  largest |B| at the last iterate:";
    for (const auto& [element, b] : worst_elements(system_->assembler(), system_->x(), 5)) {
      const ElementRecord& rec = system_->assembler().elements()[element];
      const Vec2 c = (rec.nodes.x[0] + rec.nodes.x[1] + rec.nodes.x[2]) / 3.0;
      where += fmt::format("\n    {:.3f} T in {} at ({:.2f}, {:.2f}) mm", b,
                           mesh_.regions[rec.region].name, c.x() * 1e3, c.y() * 1e3);
    }
    const std::string text = e.what() + where;
    write_output(text);
    throw NumericalError(text, report_);
  }
  // The output needs the solution, not the factor: its memory is the largest of the run's.
  system_->release_factor();
  write_output("");
}

void StaticStudy::set_up() {
  materials_ = resolve_region_materials(case_);
  lamination_ = build_lamination(case_);
  mesh_settings_ = resolve_mesh_settings(case_, lamination_);
  for (const std::string& w : case_.warnings) fmt::print(stderr, "warning: {}\n", w);
  for (const std::string& w : mesh_settings_.forecast.warnings)
    fmt::print(stderr, "warning: {}\n", w);
  check_supply_at_instant(case_, case_.study.time_s);
  // The case is valid: only now may the folder be locked (and, with --replace, cleared).
  folder_ = std::make_unique<RunFolder>(out_dir_, RunFolder::run_outputs(), folder_use_);
  const double mesh_start_s = now_s();
  CachedMesh meshed = cached_mesh(lamination_, mesh_settings_);
  mesh_ = std::move(meshed.mesh);
  mesh_from_cache_ = meshed.from_cache;
  mesh_s_ = now_s() - mesh_start_s;
  system_ = std::make_unique<MagnetostaticSystem>(mesh_, case_.study.rotor_angle_rad);
  // One pattern, solved once: above this size nested dissection's smaller factor (−7 % peak
  // memory at 280 k unknowns) is worth its ordering time (+4–8 % wall there, +9 % at the
  // demo's 29 k, where memory does not matter); docs/performance.md.
  if (system_->assembler().n_dofs() > nested_dissection_above_dofs)
    system_->set_ordering(Ordering::nested_dissection);
  phase_current_a_ = supply_phase_currents_a(case_.supply, case_.study.time_s);

  coils_ = coil_regions(mesh_, lamination_.winding);
  std::vector<double> j = region_current_density(coils_, phase_current_a_);
  // Imposed bar currents at the instant (rotor.bar_currents = "imposed"); induced ones need time
  // to be induced, so a static study's bars carry none (summary.json says which).
  const std::vector<double> bars =
      bar_current_density(mesh_, case_, lamination_.winding, lamination_.bars, case_.study.time_s,
                          case_.study.rotor_angle_rad);
  for (std::size_t r = 0; r < j.size(); ++r) j[r] += bars[r];
  model_ = make_region_model(mesh_, materials_, j);
}

void StaticStudy::solve() {
  report_ = system_->solve(model_, newton_settings(case_.solver));
}

void StaticStudy::write_output(const std::string& failure) {
  namespace fs = std::filesystem;
  const Assembler& assembler = system_->assembler();
  const Eigen::VectorXd& x = system_->x();
  fs::create_directories(fs::path(out_dir_) / "fields");
  const ElementFields fields = evaluate_element_fields(assembler, x, model_);
  const int sectors = mesh_.symmetry.sectors;
  const double stack = case_.machine.stack_length_m;
  const auto energies = region_energies(assembler, x, model_, mesh_.regions.size(), stack, sectors);
  const int n_samples =
      case_.output.airgap_samples > 0 ? case_.output.airgap_samples : default_airgap_samples(mesh_);
  const AirgapSamples airgap = sample_airgap(assembler, x, mesh_, n_samples);
  const auto psi = phase_flux_linkage(assembler, x, coils_, stack, sectors);
  const std::vector<double> a_nodes = nodal_potential(mesh_, system_->dofs(), x);
  const MeshQuality quality = mesh_quality(mesh_);

  // results.h5, written under a partial name and renamed when whole
  const std::string h5_path = folder_->path("results.h5");
  {
    ResultsFile h5(h5_path + ".partial");
    h5.attribute("/", "schema", std::string("gapflux-results/1"));
    h5.attribute("/", "case_name", case_.machine.name);
    h5.attribute("/", "converged", static_cast<long>(failure.empty()));
    h5.attribute("/", "steps_done", static_cast<long>(failure.empty() ? 1 : 0));
    write_mesh_datasets(h5, mesh_);
    std::vector<int> triangle_region;
    for (int r : mesh_.triangle_region) triangle_region.push_back(mesh_.regions[r].id);
    h5.attribute("mesh", "rotor_angle_rad", case_.study.rotor_angle_rad);
    h5.write("field/A", a_nodes, "Wb/m");
    const std::size_t n_tri = mesh_.n_triangles();
    std::vector<double> b, b_abs, mu_r;
    for (std::size_t t = 0; t < n_tri; ++t) {
      b.insert(b.end(), {fields.b_tesla[t].x(), fields.b_tesla[t].y()});
      b_abs.push_back(fields.b_abs_tesla[t]);
      mu_r.push_back(fields.mu_r_differential[t]);
    }
    h5.write("field/B", b, "T", 2);
    h5.write("field/B_abs", b_abs, "T");
    h5.write("field/mu_r_differential", mu_r, "1");
    h5.write("field/region", triangle_region, "1");
    h5.write("airgap/theta", airgap.theta_rad, "rad");
    h5.write("airgap/B_r", airgap.b_r_tesla, "T");
    h5.write("airgap/B_theta", airgap.b_theta_tesla, "T");
    h5.attribute("airgap/theta", "radius_m", airgap.radius_m);
    h5.write("winding/phase_current",
             std::vector<double>(phase_current_a_.begin(), phase_current_a_.end()), "A");
    h5.write("winding/flux_linkage", std::vector<double>(psi.begin(), psi.end()), "Wb");
    std::vector<double> energy, coenergy;
    for (const RegionEnergy& e : energies) {
      energy.push_back(e.energy_j);
      coenergy.push_back(e.coenergy_j);
    }
    h5.write("energy/region_energy", energy, "J");
    h5.write("energy/region_coenergy", coenergy, "J");
    h5.write("solver/relative_residual", report_.residuals(), "1");
    h5.flush();
  }
  {
    std::error_code ec;
    fs::rename(h5_path + ".partial", h5_path, ec);
    if (ec) throw OutputError(h5_path, ec.message());
  }

  // fields.pvd + fields/step_00000.vtu
  {
    const FieldSnapshot snap = make_field_snapshot(assembler, x, mesh_, fields);
    write_fields_vtu((fs::path(out_dir_) / "fields" / "step_00000.vtu").string(), snap);
    write_ensight_step(out_dir_, 0, snap);
    write_ensight_case(out_dir_, {{case_.study.time_s, 0}});
    write_pvd((fs::path(out_dir_) / "fields.pvd").string(),
              {{case_.study.time_s, "fields/step_00000.vtu"}});
  }

  // summary.json
  RunSummary s =
      common_summary(case_, lamination_, mesh_, static_cast<std::size_t>(assembler.n_dofs()));
  s.time_s = case_.study.time_s;
  s.rotor_angle_deg = case_.study.rotor_angle_rad * 180.0 / std::numbers::pi;
  s.phase_current_a = phase_current_a_;
  s.flux_linkage_wb = psi;
  for (const RegionEnergy& e : energies) {
    s.energy_j += e.energy_j;
    s.coenergy_j += e.coenergy_j;
  }
  s.airgap_radius_m = airgap.radius_m;
  for (std::size_t t = 0; t < mesh_.n_triangles(); ++t)
    s.b_peak_tesla = std::max(s.b_peak_tesla, fields.b_abs_tesla[t]);
  s.steps = failure.empty() ? 1 : 0;
  s.newton_iterations = report_.iterations;
  s.newton_factorizations = report_.factorizations;
  s.cg_iterations = report_.cg_iterations;
  s.converged = failure.empty();
  s.wall_s = now_s() - wall_start_s_;
  s.set_up_s = set_up_s_;
  s.mesh_s = mesh_s_;
  s.mesh_from_cache = mesh_from_cache_;
  s.residual_history = report_.residuals();
  for (const NewtonIteration& it : report_.history) s.step_history.push_back(it.step);
  s.failure = failure;
  write_summary_json((fs::path(out_dir_) / "summary.json").string(), s);
  summary_ = s;

  fmt::print("case: {}\n", case_.machine.name);
  fmt::print("mesh: order {}, {} triangles, {} dofs, sector 1 of {}\n", mesh_.order,
             quality.triangles, assembler.n_dofs(), sectors);
  fmt::print("newton: {} iteration(s), {} with a new factor, relative residual {:.2e}{}\n",
             report_.iterations, report_.factorizations, report_.relative_residual,
             failure.empty() ? "" : " (not converged)");
  fmt::print(
      "currents a/b/c: {:.3f} {:.3f} {:.3f} A; flux linkage a/b/c: {:.5f} {:.5f} {:.5f} Wb\n",
      phase_current_a_[0], phase_current_a_[1], phase_current_a_[2], psi[0], psi[1], psi[2]);
  fmt::print("peak |B| {:.3f} T; stored energy {:.3f} J, co-energy {:.3f} J\n", s.b_peak_tesla,
             s.energy_j, s.coenergy_j);
  fmt::print("wrote {}/results.h5, summary.json, fields.pvd and fields.case (snapshot)\n",
             out_dir_);
}

}  // namespace gapflux
