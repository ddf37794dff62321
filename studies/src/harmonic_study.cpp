// HarmonicStudy: set up (lamination, mesh, the system at the case's rotor angle, winding and
// cage), solve (the positive sequence with the effective reluctivity iterated, the negative one
// on that state), write output (summary.json, results.h5, a few lines on stdout).
#include "harmonic_study.hpp"

#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <numbers>

#include "postproc/output_file.hpp"
#include "postproc/results_file.hpp"
#include "postproc/torque.hpp"
#include "solver/circuit.hpp"
#include "solver/region_model.hpp"
#include "solver/supply_currents.hpp"
#include "solver/winding_resistance.hpp"
#include "studies/prepared_case.hpp"
#include "supply_sequences.hpp"
#include "version.hpp"

namespace gapflux {
namespace {

constexpr double pi = std::numbers::pi;

double now_s() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

double rms(Complex amplitude) {
  return std::abs(amplitude) / std::sqrt(2.0);
}
double degrees(Complex x) {
  return std::arg(x) * 180.0 / pi;
}

}  // namespace

HarmonicStudy::HarmonicStudy(std::string case_path, Case c, std::string out_dir, FolderUse use)
    : case_path_(std::move(case_path)),
      out_dir_(std::move(out_dir)),
      folder_use_(use),
      case_(std::move(c)) {}

void HarmonicStudy::run() {
  wall_start_s_ = now_s();
  set_up();
  set_up_s_ = now_s() - wall_start_s_;
  if (case_.study.kind == StudyKind::slip_curves) {
    solve_curves();
    write_curves();
    return;
  }
  solve();
  write_output();
}

void HarmonicStudy::set_up() {
  materials_ = resolve_region_materials(case_);
  lamination_ = build_lamination(case_);
  const MeshSettings mesh_settings = resolve_mesh_settings(case_, lamination_);
  for (const std::string& w : case_.warnings) fmt::print(stderr, "warning: {}\n", w);
  for (const std::string& w : mesh_settings.forecast.warnings)
    fmt::print(stderr, "warning: {}\n", w);
  folder_ = std::make_unique<RunFolder>(out_dir_, RunFolder::run_outputs(), folder_use_);
  const double mesh_start_s = now_s();
  CachedMesh meshed = cached_mesh(lamination_, mesh_settings);
  mesh_ = std::move(meshed.mesh);
  mesh_from_cache_ = meshed.from_cache;
  mesh_s_ = now_s() - mesh_start_s;
  system_ = std::make_unique<MagnetostaticSystem>(mesh_, case_.study.rotor_angle_rad);
  coils_ = coil_regions(mesh_, lamination_.winding);
  model_ = make_region_model(mesh_, materials_, std::vector<double>(mesh_.regions.size(), 0.0));

  slip_ = slip_of(case_);
  omega_ = 2.0 * pi * case_.supply.frequency_hz;
  const WindingResistance r = phase_resistance(case_, lamination_, materials_.coils);
  winding_ = harmonic_winding(case_, system_->assembler(), coils_,
                              {r.resistance_ohm, r.end_inductance_h}, mesh_.symmetry.sectors);

  if (case_.rotor.kind == RotorKind::cage && case_.rotor.bar_currents == BarCurrents::induced) {
    cage_values_ = cage_values(case_, lamination_, materials_);
    bar_of_region_.assign(mesh_.regions.size(), -1);
    for (std::size_t k = 0; k < mesh_.regions.size(); ++k)
      if (mesh_.regions[k].tag.kind == RegionKind::bar)
        bar_of_region_[k] = mesh_.regions[k].tag.index;
    cage_ = std::make_unique<HarmonicCage>(
        harmonic_cage(system_->assembler(), cage_values_->circuit, bar_of_region_, model_));
  }
  // The fundamental of the supply, referred to the start instant, where the rotor is held.
  source_ = supply_fundamental(case_.supply, winding_.voltage_fed, case_.study.time_s);
}

void HarmonicStudy::solve() {
  const double start_s = now_s();
  SequenceFields fields =
      solve_sequences(system_->assembler(), model_, winding_, cage_.get(), omega_, slip_, source_);
  positive_ = std::move(fields.positive);
  negative_ = std::move(fields.negative);
  has_negative_ = fields.has_negative;
  source_positive_ = fields.source_positive;
  source_negative_ = fields.source_negative;
  solve_s_ = now_s() - start_s;
}

PointContext HarmonicStudy::point_context() const {
  return gapflux::point_context(case_, *system_, winding_, cage_.get(), bar_of_region_, omega_);
}

void HarmonicStudy::write_output() {
  namespace fs = std::filesystem;
  using json = nlohmann::json;
  const double sync_rad_s = omega_ / case_.machine.pole_pairs();
  const double rotor_rad_s = (1.0 - slip_) * sync_rad_s;

  // The torque is the air-gap power over synchronous speed per sequence (the equivalent
  // circuit's). The Maxwell stress in the band (Arkkio) is reported beside it: with the rotor
  // held at one position the stator's slot harmonics meet the bars at the fundamental's slip, not
  // at their own, and the stress counts their spurious torques (2.8 % of the torque at s = 0.5 on
  // the linear test motor, where time stepping agreed with the air-gap power to 0.5 %).
  SequenceFields fields;
  fields.positive = positive_;
  fields.negative = negative_;
  fields.has_negative = has_negative_;
  const HarmonicPoint point = evaluate_point(point_context(), fields, slip_);
  const Eigen::Vector3cd& current = point.current_a;
  const Eigen::Vector3cd& voltage = point.voltage_v;
  const double gap1_w = point.airgap_positive_w, gap2_w = point.airgap_negative_w;
  const double torque1 = point.torque_positive_nm, torque2 = point.torque_negative_nm;
  const double input_w = point.input_w, apparent_va = point.apparent_va, copper_w = point.copper_w;
  const double torque = point.torque_nm;
  const double cage_w = point.cage_bars_w + point.cage_rings_w;
  const double mechanical_w = point.mechanical_w;
  const Sequences i_seq = point.current_seq, v_seq = point.voltage_seq;
  const double b_peak = point.b_peak_tesla;

  // results.h5: the phasors, and per element the effective reluctivity and the peak |B|.
  const std::string h5_path = folder_->path("results.h5");
  {
    ResultsFile h5(h5_path + ".partial");
    h5.attribute("/", "schema", std::string("gapflux-results/1"));
    h5.attribute("/", "study", std::string("time_harmonic"));
    h5.attribute("/", "case_name", case_.machine.name);
    h5.attribute("/", "program_version", std::string(version_string));
    const auto pairs = [](const Eigen::VectorXcd& v) {
      std::vector<double> out;
      for (const Complex& z : v) out.insert(out.end(), {z.real(), z.imag()});
      return out;
    };
    h5.write("harmonic/branch_current", pairs(current), "A (amplitude: re, im)", 2);
    h5.write("harmonic/branch_voltage", pairs(voltage), "V (amplitude: re, im)", 2);
    if (cage_) {
      h5.write("harmonic/positive/bar_current", pairs(positive_.bar_current_a),
               "A (amplitude at s·f: re, im)", 2);
      if (has_negative_)
        h5.write("harmonic/negative/bar_current", pairs(negative_.bar_current_a),
                 "A (amplitude at (2 − s)·f: re, im)", 2);
    }
    h5.write("harmonic/positive/element_reluctivity", positive_.reluctivity, "m/H");
    h5.write("harmonic/positive/element_b_peak", positive_.b_peak_tesla, "T");
  }
  fs::rename(h5_path + ".partial", h5_path);

  json j;
  j["schema"] = "gapflux-summary/1";
  j["case_name"] = case_.machine.name;
  j["program_version"] = version_string;
  j["study"] = {{"kind", "time_harmonic"},
                {"slip", slip_},
                {"negative_sequence_slip", 2.0 - slip_},
                {"frequency_hz", case_.supply.frequency_hz},
                {"mechanical_speed_rpm", rotor_rad_s * 60.0 / (2.0 * pi)},
                {"rotor_angle_deg", case_.study.rotor_angle_rad * 180.0 / pi},
                {"model",
                 "fundamental only, rotor held at one position, cage by the slip transformation, "
                 "iron by the energy-equivalent effective reluctivity of each element's peak |B| "
                 "(positive sequence; the negative sequence is solved on the same state)"}};
  j["mesh"] = {{"dofs", system_->assembler().n_dofs()},
               {"triangles", mesh_.n_triangles()},
               {"order", mesh_.order},
               {"sectors", mesh_.symmetry.sectors}};
  j["solver"] = {{"converged", positive_.converged},
                 {"reluctivity_iterations", positive_.iterations},
                 {"field_change", positive_.field_change},
                 {"reluctivity_change", positive_.reluctivity_change},
                 {"wall_s", now_s() - wall_start_s_},
                 {"set_up_s", set_up_s_},
                 {"solve_s", solve_s_},
                 {"mesh_s", mesh_s_},
                 {"mesh_from_cache", mesh_from_cache_}};
  const auto seq_json = [](const Sequences& s, const char* unit) {
    return json{{fmt::format("positive_{}", unit), rms(s.positive)},
                {fmt::format("negative_{}", unit), rms(s.negative)},
                {fmt::format("zero_{}", unit), rms(s.zero)},
                {"positive_angle_deg", degrees(s.positive)},
                {"negative_angle_deg", degrees(s.negative)}};
  };
  std::vector<double> i_rms, v_rms, i_deg, v_deg;
  for (int k = 0; k < 3; ++k) {
    i_rms.push_back(rms(current[k]));
    v_rms.push_back(rms(voltage[k]));
    i_deg.push_back(degrees(current[k]));
    v_deg.push_back(degrees(voltage[k]));
  }
  const double vuf = 100.0 * std::abs(v_seq.negative) / std::abs(v_seq.positive);
  const double cuf = 100.0 * std::abs(i_seq.negative) / std::abs(i_seq.positive);
  j["supply"] = {{"feed", winding_.voltage_fed ? "voltage" : "current"},
                 {"connection", to_string(case_.supply.connection)},
                 {"branch_current_rms_a", i_rms},
                 {"branch_current_angle_deg", i_deg},
                 {"branch_voltage_rms_v", v_rms},
                 {"branch_voltage_angle_deg", v_deg},
                 {"current_sequence", seq_json(i_seq, "a")},
                 {"voltage_sequence", seq_json(v_seq, "v")},
                 {"unbalance", {{"vuf_pct", vuf}}},
                 {"current_unbalance", {{"vuf_pct", cuf}}},
                 {"note",
                  "branch quantities of the winding (phases of a star, the delta's "
                  "branches); fundamental phasors, RMS"}};
  if (vuf > 1e-6) j["supply"]["unbalance_amplification"] = cuf / vuf;
  const auto impedance_json = [](Complex z, const char* definition) {
    return json{{"ohm", std::abs(z)},
                {"angle_deg", degrees(z)},
                {"resistance_ohm", z.real()},
                {"reactance_ohm", z.imag()},
                {"definition", definition}};
  };
  if (has_negative_)
    j["supply"]["negative_sequence_impedance"] =
        impedance_json(v_seq.negative / i_seq.negative,
                       "V2/I2 of the winding branches' fundamental, solved at slip 2 − s");
  j["supply"]["positive_sequence_impedance"] = impedance_json(
      v_seq.positive / i_seq.positive, "V1/I1 of the winding branches' fundamental, at slip s");
  j["torque"] = {{"mean_nm", torque},
                 {"positive_sequence_nm", torque1},
                 {"negative_sequence_nm", torque2},
                 {"maxwell_stress_nm", point.maxwell_stress_nm},
                 {"method",
                  "air-gap power over synchronous speed, per sequence (the equivalent circuit's "
                  "torque); maxwell_stress_nm: Arkkio's band integral of the phasor field, which "
                  "with the rotor held also counts the slot harmonics' spurious torques"}};
  j["field"] = {{"b_peak_tesla", b_peak}};
  j["power"] = {
      {"slip", slip_},
      {"input_w", input_w},
      {"stator_copper_w", copper_w},
      {"cage_w", cage_w},
      {"airgap_w", gap1_w + gap2_w},
      {"mechanical_w", mechanical_w},
      {"efficiency_pct", input_w > 0 ? 100.0 * mechanical_w / input_w : 0.0},
      {"power_factor", apparent_va > 0 ? input_w / apparent_va : 0.0},
      {"displacement_factor", std::cos(std::arg(v_seq.positive) - std::arg(i_seq.positive))},
      {"definitions",
       "input Σ ½·Re(V·I*) over the winding branches; air gap: each sequence's torque times its "
       "field's speed (±Ω_sync); mechanical T·Ω_rotor; efficiency = mechanical / input with no "
       "iron, friction, windage or stray-load loss (an upper bound); power_factor = input / "
       "Σ V·I (RMS per branch); displacement_factor = cos(∠V1 − ∠I1)"}};
  j["losses"] = {{"copper_w", copper_w}};
  if (cage_) {
    const double bar1 = point.bar_forward_rms_a, bar2 = point.bar_backward_rms_a;
    j["cage"] = {{"currents", "induced"},
                 {"loss_w", cage_w},
                 {"loss_bars_w", point.cage_bars_w},
                 {"loss_rings_w", point.cage_rings_w},
                 {"forward",
                  {{"frequency_hz", slip_ * case_.supply.frequency_hz},
                   {"bar_rms_a", bar1},
                   {"loss_w", point.cage_forward_w}}},
                 {"backward",
                  {{"frequency_hz", (2.0 - slip_) * case_.supply.frequency_hz},
                   {"bar_rms_a", bar2},
                   {"loss_w", point.cage_backward_w}}}};
  }
  j["cautions"] = {
      "A model's estimate, not a measurement: rotor heating and protection settings rest on the "
      "motor maker's data, local codes and licensed practice."};
  write_file_whole((fs::path(out_dir_) / "summary.json").string(), j.dump(2) + "\n");
  summary_.converged = positive_.converged;
  summary_.wall_s = now_s() - wall_start_s_;
  summary_.set_up_s = set_up_s_;
  summary_.mesh_s = mesh_s_;
  summary_.mesh_from_cache = mesh_from_cache_;
  summary_.steps = 1;

  fmt::print("case: {}\n", case_.machine.name);
  fmt::print(
      "time-harmonic at {:.2f} Hz, slip {:.4f}: {} effective-reluctivity iteration(s), "
      "{:.2f} s\n",
      case_.supply.frequency_hz, slip_, positive_.iterations, solve_s_);
  fmt::print("branch currents a/b/c: {:.3f} {:.3f} {:.3f} A (RMS); I1 {:.3f} A, I2 {:.3f} A\n",
             i_rms[0], i_rms[1], i_rms[2], rms(i_seq.positive), rms(i_seq.negative));
  fmt::print(
      "torque {:.3f} N·m (positive {:.3f}, negative {:.3f}); input {:.1f} W, power factor "
      "{:.3f}\n",
      torque, torque1, torque2, input_w, apparent_va > 0 ? input_w / apparent_va : 0.0);
  if (cage_)
    fmt::print("cage loss {:.1f} W (forward {:.1f}, backward {:.1f}); peak |B| {:.3f} T\n", cage_w,
               point.cage_forward_w, point.cage_backward_w, b_peak);
  fmt::print("wrote {}/results.h5 and summary.json\n", out_dir_);
}

}  // namespace gapflux
