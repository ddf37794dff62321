#include "analysis_printout.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>

namespace gapflux {
namespace {

void print_unbalance(std::FILE* out, const char* what, const UnbalanceMetrics& u) {
  fmt::print(out, "  {} VUF {:.3f} %  LVUR {:.3f} %  PVUR {:.3f} %\n", what, u.vuf_pct, u.lvur_pct,
             u.pvur_pct);
}

// Per time order: the three phases' RMS and the Fortescue sequences, `unit` A or V.
void print_sequence_rows(std::FILE* out, const std::vector<HarmonicPhasors>& rows, const char* unit,
                         int at_most) {
  const char* x = unit[0] == 'V' ? "V" : "I";
  fmt::print(out, "  {:>7}  {:>10} {:>10} {:>10}   {:>10} {:>10} {:>10}\n", "order",
             fmt::format("|{}a| {}", x, unit), fmt::format("|{}b| {}", x, unit),
             fmt::format("|{}c| {}", x, unit), fmt::format("pos {}", unit),
             fmt::format("neg {}", unit), fmt::format("zero {}", unit));
  int shown = 0;
  for (const HarmonicPhasors& h : rows) {
    if (++shown > at_most) break;
    fmt::print(out, "  {:>7.3g}  {:>10.4g} {:>10.4g} {:>10.4g}   {:>10.4g} {:>10.4g} {:>10.4g}\n",
               h.order, std::abs(h.abc[0]), std::abs(h.abc[1]), std::abs(h.abc[2]),
               std::abs(h.sequences.positive), std::abs(h.sequences.negative),
               std::abs(h.sequences.zero));
  }
}

}  // namespace

void print_analysis_table(std::FILE* out, const RunAnalysis& a, double torque_mean_nm,
                          double torque_ripple_pct) {
  if (a.periods < 1) {
    fmt::print(out, "analysis: {}\n", a.note);
    return;
  }
  fmt::print(out, "\nsupply response over {} electrical period(s) from t = {:.6g} s\n", a.periods,
             a.window_start_s);
  if (!a.supply_voltage.empty()) {
    print_unbalance(out, "supply voltage unbalance:", a.voltage_unbalance);
    print_unbalance(out, "line current unbalance:  ", a.line_current_unbalance);
    print_sequence_rows(out, a.supply_voltage, "V", 6);
    fmt::print(out, "  winding (branch) currents:\n");
  }
  print_unbalance(out, "current unbalance:", a.current_unbalance);
  print_sequence_rows(out, a.current, "A", 10);
  fmt::print(out, "  largest airgap waves (B_r at mid-gap):\n");
  fmt::print(out, "  {:>6} {:>7} {:>8} {:>10} {:>10}  {}\n", "ν el", "m mech", "h (×f)",
             "direction", "B T", "reading");
  int shown = 0;
  for (const LabelledWave& lw : a.waves) {
    if (++shown > 10) break;
    const Wave& w = lw.wave;
    const char* dir = w.direction > 0 ? "forward" : w.direction < 0 ? "backward" : "standing";
    fmt::print(out, "  {:>6.3g} {:>7} {:>8.4g} {:>10} {:>10.4f}  {}\n", w.space_order_el,
               w.space_order_mech, w.time_order, dir, w.amplitude, lw.label);
  }
  const FieldLocus& l = a.locus;
  fmt::print(out,
             "  field locus: forward {:.4f} T, backward {:.4f} T → ellipse {:.4f} × {:.4f} T, "
             "axis ratio {:.4f}, major axis at {:.1f}° el\n",
             l.forward_tesla, l.backward_tesla, l.major_tesla, l.minor_tesla, l.axis_ratio,
             l.major_axis_deg_el);
  fmt::print(out, "  radial force waves (time-varying, largest first; * = low mode 0–4):\n");
  shown = 0;
  for (const ForceWave& w : a.force_waves) {
    if (w.time_order == 0.0) continue;
    if (++shown > 6) break;
    fmt::print(out, "  {} mode {:>3} at {:>8.1f} Hz ({:>5.3g}f) {:>9}  {:>10.1f} N/m²\n",
               w.low_mode ? "*" : " ", w.mode, w.frequency_hz, w.time_order,
               w.direction > 0   ? "forward"
               : w.direction < 0 ? "backward"
                                 : "pulsating",
               w.amplitude_n_per_m2);
  }
  fmt::print(out, "  torque: mean {:.4f} N·m, ripple {:.2f} %\n", torque_mean_nm,
             torque_ripple_pct);
  shown = 0;
  for (const TorqueHarmonic& t : a.torque_harmonics) {
    if (++shown > 6) break;
    fmt::print(out, "  {:>8.4g}f {:>10.4f} N·m  {}{}\n", t.order, t.amplitude_nm, t.label,
               t.source.empty() ? "" : " (" + t.source + ")");
  }
}

void print_saturation_table(std::FILE* out, const SaturationMap& s) {
  fmt::print(out,
             "  saturation over the last period: peak |B| {:.3f} T; highest zones (by p95, "
             "area-weighted):\n",
             s.peak_tesla_overall);
  std::vector<const SaturationZone*> zones;
  for (const SaturationZone& z : s.zones) zones.push_back(&z);
  std::sort(zones.begin(), zones.end(),
            [](const auto* a, const auto* b) { return a->p95_tesla > b->p95_tesla; });
  for (std::size_t i = 0; i < zones.size() && i < 6; ++i) {
    const SaturationZone& z = *zones[i];
    fmt::print(out,
               "    {:<30} median {:.3f} T, p95 {:.3f} T, peak {:.3f} T, {:5.1f} % of its area "
               "above {:.2f} T{}\n",
               z.name, z.median_tesla, z.p95_tesla, z.peak_tesla, 100.0 * z.area_fraction_over,
               z.threshold_tesla,
               z.tooth >= 0 ? fmt::format(" (at {:.1f}°, nearest phase {} axis)", z.angle_deg,
                                          z.nearest_phase)
                            : std::string());
  }
}

void print_cage_and_power(std::FILE* out, const RunSummary& s) {
  if (s.cage) {
    const CageAnalysis& c = s.cage->analysis;
    fmt::print(out,
               "  cage (induced, {:g} °C): bar current {:.1f} A RMS (forward wave {:.1f} A at "
               "{:.3g} Hz, backward {:.1f} A at {:.3g} Hz), ring segments {:.1f} A ({:.3f} × the "
               "bars; a balanced set gives {:.3f})\n",
               s.cage->temperature_c, c.bar_rms_a, c.forward_bar_rms_a, c.forward_hz,
               c.backward_bar_rms_a, c.backward_hz, c.ring_rms_a, c.ring_to_bar,
               c.ring_to_bar_balanced);
    fmt::print(out,
               "  cage loss {:.1f} W (bars {:.1f}, rings {:.1f}): forward field {:.1f} W, "
               "backward {:.1f} W, the rest (harmonics, start) {:.1f} W\n",
               c.loss_w, c.loss_bars_w, c.loss_rings_w, c.loss_forward_w, c.loss_backward_w,
               c.loss_rest_w);
  }
  if (s.power) {
    const PowerBalance& p = *s.power;
    fmt::print(out,
               "  power: input {:.1f} W, stator copper {:.1f} W, cage {:.1f} W, air gap {:.1f} W "
               "(fundamental {:.1f} W, s times that {:.1f} W at slip {:.4f}), mechanical {:.1f} "
               "W; balance off by {:.2f} % of the input\n",
               p.input_w, p.copper_w, p.cage_w, p.airgap_w, p.fundamental_airgap_w,
               p.slip_times_fundamental_w, p.slip, p.mechanical_w, p.balance_residual_pct);
    fmt::print(out,
               "  efficiency {:.2f} % (iron loss estimate {:.1f} W included; no friction, windage "
               "or stray load loss), power factor {:.3f} (arithmetic), {:.3f} (positive-sequence "
               "displacement)\n",
               p.efficiency_pct, p.iron_w, p.power_factor, p.displacement_factor);
  }
  if (s.start_prediction && s.analysis && s.analysis->periods >= 1) {
    const RunSummary::HarmonicPrediction& p = *s.start_prediction;
    if (const HarmonicPhasors* f = find_order(s.analysis->current, 1.0))
      fmt::print(out,
                 "  time-harmonic model (the start) against this run: torque {:.2f} vs {:.2f} "
                 "N·m; current positive sequence {:.2f} vs {:.2f} A, negative {:.3f} vs {:.3f} "
                 "A (RMS)\n",
                 p.torque_nm, s.torque_mean_nm, p.current_positive_a,
                 std::abs(f->sequences.positive), p.current_negative_a,
                 std::abs(f->sequences.negative));
  }
  if (s.negative_sequence_impedance_ohm)
    fmt::print(out,
               "  negative-sequence impedance V2/I2 = {:.3f} Ω at {:.1f}°; current unbalance "
               "{:.2f} × the voltage unbalance; 2f torque {:.3f} N·m\n",
               std::abs(*s.negative_sequence_impedance_ohm),
               std::arg(*s.negative_sequence_impedance_ohm) * 180.0 / std::numbers::pi,
               s.unbalance_amplification, s.torque_2f_nm);
}

void print_baseline_table(std::FILE* out, const BaselineComparison& c) {
  const auto pct = [](double run, double base) {
    return base != 0.0 ? 100.0 * (run - base) / std::abs(base) : 0.0;
  };
  fmt::print(out, "\nagainst the balanced baseline ({}):\n", c.baseline_dir);
  fmt::print(out, "  iron loss   {:9.2f} W vs {:9.2f} W  ({:+.2f} %)\n", c.iron_w,
             c.baseline_iron_w, pct(c.iron_w, c.baseline_iron_w));
  fmt::print(out, "  copper loss {:9.2f} W vs {:9.2f} W  ({:+.2f} %)\n", c.copper_w,
             c.baseline_copper_w, pct(c.copper_w, c.baseline_copper_w));
  if (c.cage) {
    fmt::print(out,
               "  cage loss   {:9.2f} W vs {:9.2f} W  ({:+.2f} %; the backward field's share "
               "{:.2f} W)\n",
               c.cage_w, c.baseline_cage_w, pct(c.cage_w, c.baseline_cage_w), c.cage_backward_w);
    fmt::print(out, "  efficiency  {:9.2f} % vs {:9.2f} %  ({:+.2f} points)\n", c.efficiency_pct,
               c.baseline_efficiency_pct, c.efficiency_pct - c.baseline_efficiency_pct);
  }
  fmt::print(out, "  total       {:9.2f} W vs {:9.2f} W  ({:+.2f} %)\n", c.total_w(),
             c.baseline_total_w(), pct(c.total_w(), c.baseline_total_w()));
  fmt::print(out, "  torque mean {:.4f} vs {:.4f} N·m, ripple {:.2f} % vs {:.2f} %\n",
             c.torque_mean_nm, c.baseline_torque_mean_nm, c.ripple_pct, c.baseline_ripple_pct);
  for (std::size_t i = 0; i < c.zones.size() && i < 4; ++i)
    fmt::print(out, "  {:<30} peak {:.3f} T vs {:.3f} T ({:+.3f} T)\n", c.zones[i].name,
               c.zones[i].peak_tesla, c.zones[i].baseline_peak_tesla,
               c.zones[i].peak_tesla - c.zones[i].baseline_peak_tesla);
  for (std::size_t i = 0; i < c.added_waves.size() && i < 5; ++i) {
    const AddedWave& w = c.added_waves[i];
    fmt::print(out, "  wave ν={:g} h={:g} {}: {:.4f} T vs {:.4f} T  {}\n", w.wave.space_order_el,
               w.wave.time_order, w.wave.direction > 0 ? "forward" : "backward", w.wave.amplitude,
               w.baseline_amplitude_tesla, w.label);
  }
  fmt::print(out,
             "  Derating for unbalance follows NEMA MG-1 / IEC 60034-26 (voltage unbalance at the "
             "terminals), the motor's maker and licensed practice; see summary.json baseline.\n");
}

}  // namespace gapflux
