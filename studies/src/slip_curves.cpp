// HarmonicStudy, kind = "slip_curves": the time-harmonic steady state at a range of slips —
// torque, stator current, power factor and efficiency against slip, the starting point
// (standstill), the breakdown torque and its slip, the rated point (the case's slip). Each point
// starts its effective-reluctivity iteration from its neighbour's flux densities.
#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <numbers>

#include "equivalent_circuit.hpp"
#include "harmonic_study.hpp"
#include "postproc/output_file.hpp"
#include "postproc/results_file.hpp"
#include "solver/newton.hpp"
#include "version.hpp"

namespace gapflux {
namespace {

double now_s() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

// The largest torque among the motoring points and, when it lies between two others, the vertex
// of the parabola through the three (slip, torque).
struct Breakdown {
  double slip = 0.0, torque_nm = 0.0;
  bool refined = false, found = false;
};
Breakdown breakdown_of(const std::vector<double>& slip, const std::vector<double>& torque) {
  Breakdown b;
  std::size_t best = 0;
  for (std::size_t k = 0; k < slip.size(); ++k)
    if (slip[k] > 0.0 && std::isfinite(torque[k]) && (!b.found || torque[k] > torque[best]))
      best = k, b.found = true;
  if (!b.found) return b;
  b.slip = slip[best], b.torque_nm = torque[best];
  if (best == 0 || best + 1 == slip.size() || !std::isfinite(torque[best - 1]) ||
      !std::isfinite(torque[best + 1]))
    return b;
  const double x0 = slip[best - 1], x1 = slip[best], x2 = slip[best + 1];
  const double y0 = torque[best - 1], y1 = torque[best], y2 = torque[best + 1];
  // Newton's divided differences: y = y0 + d1·(x − x0) + d2·(x − x0)(x − x1).
  const double d1 = (y1 - y0) / (x1 - x0);
  const double d2 = ((y2 - y1) / (x2 - x1) - d1) / (x2 - x0);
  if (!(d2 < 0.0)) return b;
  const double vertex = 0.5 * (x0 + x1) - d1 / (2.0 * d2);
  if (vertex < std::min(x0, x2) || vertex > std::max(x0, x2)) return b;
  b.slip = vertex;
  b.torque_nm = y0 + d1 * (vertex - x0) + d2 * (vertex - x0) * (vertex - x1);
  b.refined = true;
  return b;
}

}  // namespace

HarmonicStudy::CurvePoint HarmonicStudy::solve_point(double slip,
                                                     const std::vector<double>& start_b_peak,
                                                     std::vector<double>& b_peak) {
  HarmonicSettings settings;
  settings.initial_b_peak_tesla = start_b_peak;
  const SequenceFields f = solve_sequences(system_->assembler(), model_, winding_, cage_.get(),
                                           omega_, slip, source_, settings);
  b_peak = f.positive.b_peak_tesla;
  CurvePoint c;
  c.impedance =
      sequence_impedances(system_->assembler(), model_, winding_, cage_.get(), omega_, slip, f);
  c.iterations = f.positive.iterations + (f.has_negative ? f.negative.iterations : 0) +
                 c.impedance.probe_solves;
  c.point = evaluate_point(point_context(), f, slip);
  c.converged = true;
  return c;
}

void HarmonicStudy::solve_curves() {
  const double start_s = now_s();
  const StudySpec& st = case_.study;
  std::vector<double> b_peak;  // the last converged point's, to start the next from
  const auto solve_one = [&](double slip) {
    CurvePoint c;
    std::vector<double> b;
    try {
      c = solve_point(slip, b_peak, b);
      b_peak = b;
    } catch (const NumericalError& e) {
      // One point that does not settle does not end the curve: it is marked and said.
      c.point.slip = slip;
      c.failure = e.what();
      fmt::print(stderr, "warning: slip {:.4g}: {}\n", slip, e.what());
    }
    return c;
  };
  for (int k = 0; k < st.points; ++k) {
    const double slip = st.slip_from + (st.slip_to - st.slip_from) * k / (st.points - 1);
    curve_.push_back(solve_one(slip));
    fmt::print(stderr, "slip {:.4f}: {} ({} solves)\n", slip,
               curve_.back().converged ? "done" : "NOT settled", curve_.back().iterations);
  }
  for (const CurvePoint& c : curve_)
    if (std::abs(c.point.slip - 1.0) < 1e-12) standstill_ = c;
  if (!standstill_) standstill_ = solve_one(1.0);
  if (st.rated_given) rated_ = solve_one(slip_);
  // The equivalent circuit's no-load point, and three slips between rated and breakdown where
  // the circuit (with the rated point's rotor branch) is held against the field.
  no_load_ = solve_one(0.0);
  if (rated_ && rated_->converged) {
    std::vector<double> slips, torques;
    for (const CurvePoint& c : curve_)
      slips.push_back(c.point.slip), torques.push_back(c.converged ? c.point.torque_nm : -1e300);
    const double breakdown_slip =
        slips[std::max_element(torques.begin(), torques.end()) - torques.begin()];
    if (breakdown_slip > slip_)
      for (double f : {0.25, 0.5, 0.75})
        circuit_checks_.push_back(solve_one(slip_ + f * (breakdown_slip - slip_)));
  }
  solve_s_ = now_s() - start_s;
}

void HarmonicStudy::add_equivalent_circuit(nlohmann::json& j) const {
  using json = nlohmann::json;
  if (!no_load_->converged || !standstill_->converged) return;
  const auto z_of = [](const HarmonicPoint& p) {
    return p.voltage_seq.positive / p.current_seq.positive;
  };
  StatorBranches stator;
  try {
    stator = stator_branches(winding_.impedance.resistance_ohm, z_of(no_load_->point),
                             z_of(standstill_->point));
  } catch (const std::runtime_error& e) {
    j["equivalent_circuit"] = {{"failure", e.what()}};
    return;
  }
  const auto rotor_json = [&](const HarmonicPoint& p) {
    const RotorBranch r = rotor_branch(stator, z_of(p), p.slip);
    return json{{"slip", p.slip}, {"r2_ohm", r.r2_ohm}, {"x2_leakage_ohm", r.x2_leakage_ohm}};
  };
  json e = {{"r1_ohm", stator.r1_ohm},
            {"x1_leakage_ohm", stator.x1_leakage_ohm},
            {"xm_ohm", stator.xm_ohm},
            {"standstill", rotor_json(standstill_->point)},
            {"per",
             "winding branch (a star's phase, a delta's branch), positive sequence, at the "
             "supply frequency; rotor values referred to the stator"},
            {"method",
             "no-load (s = 0) impedance gives R1 + j(X1σ + Xm); the standstill impedance with "
             "X1σ = X2σ' there gives X1σ and R2'; at another slip the rotor branch follows from "
             "that slip's impedance with X1σ and Xm held (a no-load and locked-rotor test on "
             "the field solutions)"}};
  if (rated_ && rated_->converged) {
    e["rated"] = rotor_json(rated_->point);
    // The circuit against the field at the check slips, with the rated point's rotor branch
    // and with the rotor branch that follows slip and current between rated and standstill:
    // torque = air-gap power over synchronous speed, from the same positive-sequence voltage.
    const HarmonicPoint& rated = rated_->point;
    const HarmonicPoint& still = standstill_->point;
    const RotorBranch r = rotor_branch(stator, z_of(rated), rated.slip);
    const SaturatingRotor saturating = saturating_rotor(
        stator, r, rated.slip, rated.voltage_seq.positive,
        rotor_branch(stator, z_of(still), still.slip), still.slip, still.voltage_seq.positive);
    const double sync_rad_s = omega_ / case_.machine.pole_pairs();
    const auto torque_nm = [&](std::complex<double> v, std::complex<double> i) {
      return 3.0 * 0.5 * ((v * std::conj(i)).real() - stator.r1_ohm * std::norm(i)) / sync_rad_s;
    };
    json checks = json::array();
    for (const CurvePoint& c : circuit_checks_) {
      if (!c.converged) continue;
      const std::complex<double> v = c.point.voltage_seq.positive;
      const double s = c.point.slip;
      checks.push_back({{"slip", s},
                        {"torque_field_nm", c.point.torque_positive_nm},
                        {"torque_circuit_nm", torque_nm(v, v / circuit_impedance(stator, r, s))},
                        {"torque_saturating_circuit_nm",
                         torque_nm(v, saturating_circuit_current(stator, saturating, s, v))}});
    }
    e["torque_checks"] = checks;
    e["saturating_rotor"] = {
        {"leakage_exponent", saturating.exponent},
        {"rotor_current_rated_a", saturating.i2_rated / std::sqrt(2.0)},
        {"rotor_current_standstill_a", saturating.i2_standstill / std::sqrt(2.0)},
        {"model",
         "R2' linear in √s between the rated and standstill values (current displacement); "
         "X2σ' = X2σ'_rated·(I2'/I2'_rated)^−k, k from the two points (the bridges' saturation "
         "and current displacement together); held at the nearer point's values outside them"}};
  }
  j["equivalent_circuit"] = e;
}

void HarmonicStudy::write_curves() {
  namespace fs = std::filesystem;
  using json = nlohmann::json;
  const double pi = std::numbers::pi;
  const double sync_rpm = 60.0 * case_.supply.frequency_hz / case_.machine.pole_pairs();
  const double nan = std::nan("");
  std::vector<double> slip, speed, torque, current, pf, efficiency, input, mechanical, copper, cage,
      i2, bar, b_peak, z1_ohm, z1_deg, z2_ohm, z2_deg, z1_pairs, z2_pairs;
  std::vector<long> converged, iterations;
  for (const CurvePoint& c : curve_) {
    const HarmonicPoint& p = c.point;
    const auto value = [&](double v) { return c.converged ? v : nan; };
    slip.push_back(p.slip);
    speed.push_back((1.0 - p.slip) * sync_rpm);
    torque.push_back(value(p.torque_nm));
    current.push_back(value(p.current_rms_a()));
    i2.push_back(value(std::abs(p.current_seq.negative) / std::sqrt(2.0)));
    pf.push_back(value(p.power_factor()));
    // Generating (input ≤ 0): mechanical over input means nothing; left out.
    efficiency.push_back(value(p.input_w > 0 ? p.efficiency_pct() : nan));
    input.push_back(value(p.input_w));
    mechanical.push_back(value(p.mechanical_w));
    copper.push_back(value(p.copper_w));
    cage.push_back(value(p.cage_bars_w + p.cage_rings_w));
    bar.push_back(value(p.bar_forward_rms_a));
    b_peak.push_back(value(p.b_peak_tesla));
    const std::complex<double> z1 = c.impedance.positive_ohm, z2 = c.impedance.negative_ohm;
    z1_ohm.push_back(value(std::abs(z1)));
    z1_deg.push_back(value(std::arg(z1) * 180.0 / pi));
    z2_ohm.push_back(value(std::abs(z2)));
    z2_deg.push_back(value(std::arg(z2) * 180.0 / pi));
    for (double v : {value(z1.real()), value(z1.imag())}) z1_pairs.push_back(v);
    for (double v : {value(z2.real()), value(z2.imag())}) z2_pairs.push_back(v);
    converged.push_back(c.converged ? 1 : 0);
    iterations.push_back(c.iterations);
  }
  // Breakdown: over the points ordered by slip.
  std::vector<std::size_t> order(slip.size());
  for (std::size_t k = 0; k < order.size(); ++k) order[k] = k;
  std::sort(order.begin(), order.end(), [&](auto a, auto b) { return slip[a] < slip[b]; });
  std::vector<double> sorted_slip, sorted_torque;
  for (std::size_t k : order) sorted_slip.push_back(slip[k]), sorted_torque.push_back(torque[k]);
  const Breakdown breakdown = breakdown_of(sorted_slip, sorted_torque);

  // results.h5: the curves, one row per point, in the order solved.
  const std::string h5_path = folder_->path("results.h5");
  {
    ResultsFile h5(h5_path + ".partial");
    h5.attribute("/", "schema", std::string("gapflux-results/1"));
    h5.attribute("/", "study", std::string("slip_curves"));
    h5.attribute("/", "case_name", case_.machine.name);
    h5.attribute("/", "program_version", std::string(version_string));
    h5.write("curves/slip", slip, "1");
    h5.write("curves/speed", speed, "rpm");
    h5.write("curves/torque", torque, "N*m");
    h5.write("curves/current_positive_sequence", current, "A");
    h5.write("curves/current_negative_sequence", i2, "A");
    h5.write("curves/power_factor", pf, "1");
    h5.write("curves/efficiency", efficiency, "%");
    h5.write("curves/input_power", input, "W");
    h5.write("curves/mechanical_power", mechanical, "W");
    h5.write("curves/stator_copper_loss", copper, "W");
    h5.write("curves/cage_loss", cage, "W");
    h5.write("curves/bar_current_forward", bar, "A");
    h5.write("curves/b_peak", b_peak, "T");
    h5.write("curves/impedance_positive_sequence", z1_pairs, "ohm", 2);
    h5.write("curves/impedance_negative_sequence", z2_pairs, "ohm", 2);
    std::vector<double> settled(converged.begin(), converged.end());
    h5.write("curves/converged", settled, "1");
  }
  fs::rename(h5_path + ".partial", h5_path);

  const auto point_json = [&](const CurvePoint& c) {
    const HarmonicPoint& p = c.point;
    if (!c.converged) return json{{"slip", p.slip}, {"converged", false}, {"failure", c.failure}};
    return json{{"slip", p.slip},
                {"speed_rpm", (1.0 - p.slip) * sync_rpm},
                {"torque_nm", p.torque_nm},
                {"current_a", p.current_rms_a()},
                {"power_factor", p.power_factor()},
                {"efficiency_pct", p.efficiency_pct()},
                {"input_w", p.input_w},
                {"cage_w", p.cage_bars_w + p.cage_rings_w},
                {"converged", true}};
  };
  json j;
  j["schema"] = "gapflux-summary/1";
  j["case_name"] = case_.machine.name;
  j["program_version"] = version_string;
  j["study"] = {{"kind", "slip_curves"},
                {"slip_from", case_.study.slip_from},
                {"slip_to", case_.study.slip_to},
                {"points", case_.study.points},
                {"frequency_hz", case_.supply.frequency_hz},
                {"synchronous_speed_rpm", sync_rpm},
                {"rotor_angle_deg", case_.study.rotor_angle_rad * 180.0 / pi},
                {"model",
                 "per slip the time-harmonic steady state (the supply's fundamental, rotor held, "
                 "cage by the slip transformation, iron by the effective reluctivity; an "
                 "unbalanced supply's negative sequence at slip 2 − s on the positive state)"}};
  j["mesh"] = {{"dofs", system_->assembler().n_dofs()},
               {"triangles", mesh_.n_triangles()},
               {"order", mesh_.order},
               {"sectors", mesh_.symmetry.sectors}};
  int settled_points = 0, solves = 0;
  for (const CurvePoint& c : curve_) settled_points += c.converged, solves += c.iterations;
  j["solver"] = {{"converged", settled_points == static_cast<int>(curve_.size())},
                 {"points_settled", settled_points},
                 {"linear_solves", solves},
                 {"wall_s", now_s() - wall_start_s_},
                 {"set_up_s", set_up_s_},
                 {"solve_s", solve_s_},
                 {"mesh_s", mesh_s_},
                 {"mesh_from_cache", mesh_from_cache_}};
  j["curves"] = {{"slip", slip},
                 {"speed_rpm", speed},
                 {"torque_nm", torque},
                 {"current_a", current},
                 {"negative_sequence_current_a", i2},
                 {"impedance_positive_ohm", z1_ohm},
                 {"impedance_positive_angle_deg", z1_deg},
                 {"impedance_negative_ohm", z2_ohm},
                 {"impedance_negative_angle_deg", z2_deg},
                 {"power_factor", pf},
                 {"efficiency_pct", efficiency},
                 {"input_w", input},
                 {"mechanical_w", mechanical},
                 {"stator_copper_w", copper},
                 {"cage_w", cage},
                 {"converged", converged},
                 {"definitions",
                  "current: the winding branches' positive-sequence RMS; torque: air-gap power "
                  "over synchronous speed per sequence; efficiency: mechanical / input with no "
                  "iron, friction, windage or stray-load loss (an upper bound); power factor: "
                  "input / Σ V·I; impedances: per winding branch, V/I of the positive sequence "
                  "at slip s and of the negative sequence at slip 2 − s on the positive "
                  "sequence's reluctivity (Z2, what a negative-sequence voltage meets; solved "
                  "with a probe source when the supply has none); a point that did not settle "
                  "is null"}};
  j["starting"] = point_json(*standstill_);
  if (breakdown.found)
    j["breakdown"] = {{"slip", breakdown.slip},
                      {"torque_nm", breakdown.torque_nm},
                      {"refined", breakdown.refined},
                      {"method",
                       "the largest torque of the points at positive slip, refined by the "
                       "parabola through it and its two neighbours when it lies between them"}};
  if (rated_) {
    j["rated"] = point_json(*rated_);
    if (rated_->converged && standstill_->converged && rated_->point.torque_nm > 0) {
      j["starting"]["torque_per_rated"] = standstill_->point.torque_nm / rated_->point.torque_nm;
      j["starting"]["current_per_rated"] =
          standstill_->point.current_rms_a() / rated_->point.current_rms_a();
      if (breakdown.found)
        j["breakdown"]["torque_per_rated"] = breakdown.torque_nm / rated_->point.torque_nm;
    }
  }
  add_equivalent_circuit(j);
  j["cautions"] = {
      "A model's estimate, not a measurement: starting, protection and thermal decisions rest on "
      "the motor maker's data, local codes and licensed practice."};
  write_file_whole((fs::path(out_dir_) / "summary.json").string(), j.dump(2) + "\n");
  summary_.converged = settled_points == static_cast<int>(curve_.size());
  summary_.wall_s = now_s() - wall_start_s_;
  summary_.set_up_s = set_up_s_;
  summary_.mesh_s = mesh_s_;
  summary_.mesh_from_cache = mesh_from_cache_;
  summary_.steps = static_cast<int>(curve_.size());

  fmt::print("case: {}\n", case_.machine.name);
  fmt::print("slip curves at {:.2f} Hz: {} points ({} settled), {} linear solves, {:.1f} s\n",
             case_.supply.frequency_hz, curve_.size(), settled_points, solves, solve_s_);
  fmt::print("  {:>8} {:>9} {:>10} {:>9} {:>7} {:>8}\n", "slip", "rpm", "torque N·m", "I1 A", "pf",
             "eff %");
  for (std::size_t k = 0; k < curve_.size(); ++k)
    fmt::print("  {:>8.4f} {:>9.1f} {:>10.3f} {:>9.3f} {:>7.3f} {:>8.2f}{}\n", slip[k], speed[k],
               torque[k], current[k], pf[k], efficiency[k],
               curve_[k].converged ? "" : "  (not settled)");
  if (standstill_->converged)
    fmt::print("starting (s = 1): torque {:.2f} N·m, current {:.2f} A\n",
               standstill_->point.torque_nm, standstill_->point.current_rms_a());
  if (breakdown.found)
    fmt::print("breakdown: {:.2f} N·m at slip {:.4f}{}\n", breakdown.torque_nm, breakdown.slip,
               breakdown.refined ? " (parabola through the largest point and its neighbours)" : "");
  if (rated_ && rated_->converged)
    fmt::print("rated (s = {:.4f}): torque {:.2f} N·m, current {:.2f} A, power factor {:.3f}\n",
               rated_->point.slip, rated_->point.torque_nm, rated_->point.current_rms_a(),
               rated_->point.power_factor());
  if (j.contains("equivalent_circuit") && j["equivalent_circuit"].contains("xm_ohm")) {
    const json& e = j["equivalent_circuit"];
    fmt::print(
        "equivalent circuit per branch: R1 {:.4f} Ω, X1σ {:.4f} Ω, Xm {:.3f} Ω; R2' {:.4f} Ω, "
        "X2σ' {:.4f} Ω at standstill",
        e["r1_ohm"].get<double>(), e["x1_leakage_ohm"].get<double>(), e["xm_ohm"].get<double>(),
        e["standstill"]["r2_ohm"].get<double>(), e["standstill"]["x2_leakage_ohm"].get<double>());
    if (e.contains("rated"))
      fmt::print("; {:.4f} Ω, {:.4f} Ω at rated slip", e["rated"]["r2_ohm"].get<double>(),
                 e["rated"]["x2_leakage_ohm"].get<double>());
    fmt::print("\n");
    if (e.contains("torque_checks"))
      for (const json& c : e["torque_checks"])
        fmt::print(
            "  circuit at slip {:.4f}: torque {:.2f} N·m with the rated rotor branch, {:.2f} "
            "N·m with the saturating one, against the field's {:.2f}\n",
            c["slip"].get<double>(), c["torque_circuit_nm"].get<double>(),
            c["torque_saturating_circuit_nm"].get<double>(), c["torque_field_nm"].get<double>());
  }
  fmt::print("wrote {}/results.h5 and summary.json\n", out_dir_);
}

}  // namespace gapflux
