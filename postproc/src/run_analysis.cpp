#include "postproc/run_analysis.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "postproc/spectrum.hpp"

namespace gapflux {
namespace {

std::array<std::vector<double>, 3> window(const std::array<std::vector<double>, 3>& all, int first,
                                          int count) {
  std::array<std::vector<double>, 3> out;
  for (int k = 0; k < 3; ++k) out[k].assign(all[k].begin() + first, all[k].begin() + first + count);
  return out;
}

std::vector<TorqueHarmonic> torque_harmonics(const RunRecord& r, const std::vector<Wave>& waves,
                                             const std::vector<HarmonicPhasors>& current) {
  const int count = r.periods * r.steps_per_period;
  const std::vector<double> kept(r.torque_nm.begin() + r.first_step,
                                 r.torque_nm.begin() + r.first_step + count);
  double mean = 0;
  for (double v : kept) mean += v / count;
  const std::vector<double> spectrum = amplitude_spectrum(kept);
  // A floor so that round-off of a constant torque lists nothing.
  double scale = std::abs(mean);
  for (double v : kept) scale = std::max(scale, std::abs(v));
  std::vector<std::pair<double, double>> found;
  const std::size_t last = spectrum.size() - (count % 2 == 0 ? 1 : 0);
  for (std::size_t k = 1; k < last; ++k)
    if (spectrum[k] > 1e-6 * scale) found.emplace_back(double(k) / r.periods, spectrum[k]);
  std::sort(found.begin(), found.end(),
            [](const auto& a, const auto& b) { return a.second > b.second; });
  if (found.size() > 12) found.resize(12);
  std::vector<double> supply_orders;
  for (const HarmonicPhasors& h : current)
    if (std::abs(h.order - 1.0) > 1e-9) supply_orders.push_back(h.order);
  return attribute_torque_harmonics(found, waves, r.orders, supply_orders, 0.5 / r.periods);
}

// The force density's space–time waves over the window (σ_r is quadratic in B, so a sector
// repeats without sign change and the transform sees the full circle).
std::vector<ForceWave> force_waves(const RunRecord& r) {
  std::vector<ForceWave> out;
  const int count = r.periods * r.steps_per_period, ns = r.force.samples;
  if (ns == 0 || r.force.steps < r.first_step + count) return out;
  AirgapRecord win;
  win.theta0_rad = r.force.theta0_rad;
  win.samples = ns;
  win.steps = count;
  win.values.assign(r.force.values.begin() + static_cast<long>(r.first_step) * ns,
                    r.force.values.begin() + static_cast<long>(r.first_step + count) * ns);
  const double t0 = r.time_s[r.first_step];
  for (const Wave& w :
       space_time_waves(win, r.periods, t0, r.frequency_hz, r.orders.pole_pairs, 1e-4)) {
    ForceWave f;
    f.mode = w.space_order_mech;
    f.time_order = w.time_order;
    f.frequency_hz = w.time_order * r.frequency_hz;
    f.direction = w.direction;
    f.amplitude_n_per_m2 = w.amplitude;
    f.low_mode = f.mode <= 4;
    out.push_back(f);
  }
  return out;
}

}  // namespace

RunAnalysis analyse_run(const RunRecord& r) {
  RunAnalysis a;
  const int steps = static_cast<int>(r.time_s.size());
  const int p = r.orders.pole_pairs;
  // Space harmonics of every finished step.
  const int ns = r.airgap.samples;
  a.space_orders = ns / 2;
  for (int n = 0; n < r.airgap.steps; ++n) {
    const auto row = space_amplitudes(&r.airgap.values[static_cast<std::size_t>(n) * ns], ns);
    a.space_amplitude_tesla.insert(a.space_amplitude_tesla.end(), row.begin(), row.end());
  }
  a.periods = r.periods;
  const int count = r.periods * r.steps_per_period;
  if (r.periods < 1 || r.first_step + count > steps || r.airgap.steps < steps) {
    a.note = "fewer than one whole electrical period retained: no spectra, sequences or waves";
    return a;
  }
  a.window_start_s = r.time_s[r.first_step];

  // Sequence content per time harmonic.
  const double floor = 1e-4;
  a.current = three_phase_harmonics(window(r.current_a, r.first_step, count), r.periods,
                                    a.window_start_s, r.frequency_hz, floor);
  a.flux_linkage = three_phase_harmonics(window(r.flux_linkage_wb, r.first_step, count), r.periods,
                                         a.window_start_s, r.frequency_hz, floor);
  // EMF e = dψ/dt as the spectral derivative jhω·ψ_h: exact over whole periods, and free of the
  // half-step lag a difference quotient has.
  for (HarmonicPhasors h : a.flux_linkage) {
    const std::complex<double> d(0.0, 2.0 * std::numbers::pi * r.frequency_hz * h.order);
    for (auto& x : h.abc) x *= d;
    h.sequences = fortescue(h.abc);
    a.emf.push_back(h);
  }
  if (const HarmonicPhasors* f = find_order(a.current, 1.0))
    a.current_unbalance = unbalance_metrics(f->abc);
  if (r.voltage_fed) {
    const auto harmonics = [&](const std::array<std::vector<double>, 3>& series) {
      return three_phase_harmonics(window(series, r.first_step, count), r.periods, a.window_start_s,
                                   r.frequency_hz, floor);
    };
    a.supply_voltage = harmonics(r.supply_voltage_v);
    a.line_voltage = harmonics(r.line_voltage_v);
    a.line_current = harmonics(r.line_current_a);
    a.winding_voltage = harmonics(r.winding_voltage_v);
    if (const HarmonicPhasors* f = find_order(a.supply_voltage, 1.0))
      a.voltage_unbalance = unbalance_metrics(f->abc);
    if (const HarmonicPhasors* f = find_order(a.line_current, 1.0))
      a.line_current_unbalance = unbalance_metrics(f->abc);
  }

  // Mean space spectrum over the window, labelled.
  std::vector<double> mean(static_cast<std::size_t>(a.space_orders), 0.0);
  for (int n = r.first_step; n < r.first_step + count; ++n)
    for (int m = 0; m < a.space_orders; ++m)
      mean[m] += a.space_amplitude_tesla[static_cast<std::size_t>(n) * a.space_orders + m] / count;
  const double fundamental = p < a.space_orders ? mean[p] : 0.0;
  for (int m = 1; m < a.space_orders; ++m)
    if (m == p || mean[m] > 2e-3 * fundamental)
      a.space_harmonics.push_back({m, double(m) / p, mean[m], space_order_label(r.orders, m)});

  // Space–time waves over the window.
  AirgapRecord win;
  win.theta0_rad = r.airgap.theta0_rad;
  win.samples = ns;
  win.steps = count;
  win.values.assign(r.airgap.values.begin() + static_cast<long>(r.first_step) * ns,
                    r.airgap.values.begin() + static_cast<long>(r.first_step + count) * ns);
  const std::vector<Wave> waves =
      space_time_waves(win, r.periods, a.window_start_s, r.frequency_hz, p, 1e-4);
  const double tol = 0.5 / r.periods;
  for (const Wave& w : waves) {
    std::string label = wave_label(r.orders, w, tol);
    // A space-fundamental wave at a time order the currents do not carry comes from saturation
    // or slotting, not from the supply.
    if (label.starts_with("supply time harmonic")) {
      bool carried = false;
      for (const HarmonicPhasors& h : a.current)
        carried = carried || std::abs(h.order - w.time_order) < tol;
      if (!carried)
        label = fmt::format(
            "time order {:g} at space order 1, {}: not in the currents "
            "(saturation or slotting)",
            w.time_order, w.direction > 0 ? "forward" : "backward");
    }
    a.waves.push_back({w, label});
  }
  a.locus = field_locus(waves, p);
  a.fundamental_path = space_fundamental(win, p);
  a.torque_harmonics = torque_harmonics(r, waves, a.current);
  a.force_waves = force_waves(r);
  return a;
}

SteadyStateIndicator steady_state_indicator(const RunRecord& r, double tolerance_pct) {
  SteadyStateIndicator s;
  s.tolerance_pct = tolerance_pct;
  const int spp = r.steps_per_period;
  const int periods = spp > 0 ? static_cast<int>(r.flux_linkage_wb[0].size()) / spp : 0;
  std::vector<std::array<Phasor, 3>> phasors;
  std::vector<double> dc;
  for (int q = 0; q < periods; ++q) {
    std::array<Phasor, 3> x{};
    double largest_dc = 0.0;
    for (int k = 0; k < 3; ++k) {
      double mean = 0.0;
      for (int n = 0; n < spp; ++n) {
        x[k] += r.flux_linkage_wb[k][q * spp + n] *
                std::polar(2.0 / spp, -2.0 * std::numbers::pi * n / spp);
        mean += r.flux_linkage_wb[k][q * spp + n] / spp;
      }
      largest_dc = std::max(largest_dc, std::abs(mean));
    }
    phasors.push_back(x);
    dc.push_back(largest_dc);
  }
  for (int q = 0; q < periods; ++q) {
    double size = 0.0;
    for (int k = 0; k < 3; ++k) size = std::max(size, std::abs(phasors[q][k]));
    s.dc_pct.push_back(size > 0 ? 100.0 * dc[q] / size : 0.0);
  }
  for (int q = 1; q < periods; ++q) {
    double change = 0.0, size = 0.0;
    for (int k = 0; k < 3; ++k) {
      change = std::max(change, std::abs(phasors[q][k] - phasors[q - 1][k]));
      size = std::max(size, std::abs(phasors[q][k]));
    }
    s.change_pct.push_back(size > 0 ? 100.0 * change / size : 0.0);
  }
  // Mean torque per period, against the period's RMS torque (the mean may be near zero).
  const std::size_t steps = r.torque_nm.size();
  std::vector<double> mean, rms;
  for (int q = 0; q < periods && static_cast<std::size_t>((q + 1) * spp) <= steps; ++q) {
    double m = 0.0, sq = 0.0;
    for (int n = q * spp; n < (q + 1) * spp; ++n)
      m += r.torque_nm[n], sq += r.torque_nm[n] * r.torque_nm[n];
    mean.push_back(m / spp);
    rms.push_back(std::sqrt(sq / spp));
  }
  for (std::size_t q = 1; q < mean.size(); ++q)
    s.torque_change_pct.push_back(rms[q] > 0 ? 100.0 * std::abs(mean[q] - mean[q - 1]) / rms[q]
                                             : 0.0);
  // The cage's wave: forward and backward phasors per period.
  if (r.cage_wave_a.size() >= static_cast<std::size_t>(periods * spp) && periods > 0) {
    std::vector<std::array<std::complex<double>, 2>> w;
    for (int q = 0; q < periods; ++q) {
      std::array<std::complex<double>, 2> x{};
      for (int n = q * spp; n < (q + 1) * spp; ++n) {
        const double phase = 2.0 * std::numbers::pi * r.frequency_hz * r.time_s[n];
        x[0] += r.cage_wave_a[n] * std::polar(1.0 / spp, phase);
        x[1] += r.cage_wave_a[n] * std::polar(1.0 / spp, -phase);
      }
      w.push_back(x);
    }
    for (int q = 1; q < periods; ++q) {
      const double size = std::max(std::abs(w[q][0]), std::abs(w[q][1]));
      // Magnitudes only: the wave's phase against the supply wanders by a degree or so from
      // period to period as the bars pass the slots (measured on the pump demo: 1.4°, 2.4 % of
      // the wave), which is the steady state's own ripple, not an unsettled cage.
      const double change = std::max(std::abs(std::abs(w[q][0]) - std::abs(w[q - 1][0])),
                                     std::abs(std::abs(w[q][1]) - std::abs(w[q - 1][1])));
      s.cage_change_pct.push_back(size > 0 ? 100.0 * change / size : 0.0);
    }
  }
  s.reached = !s.change_pct.empty() && s.last_worst_pct() < tolerance_pct;
  return s;
}

double SteadyStateIndicator::last_worst_pct() const {
  double worst = 0.0;
  for (const std::vector<double>* v : {&change_pct, &dc_pct, &torque_change_pct, &cage_change_pct})
    if (!v->empty()) worst = std::max(worst, v->back());
  return worst;
}

namespace {

void write_harmonics(ResultsFile& f, const std::string& group,
                     const std::vector<HarmonicPhasors>& hs, const std::string& units) {
  std::vector<double> order, abc, seq;
  for (const HarmonicPhasors& h : hs) {
    order.push_back(h.order);
    for (const Phasor& x : h.abc) abc.insert(abc.end(), {std::abs(x), std::arg(x)});
    for (const Phasor& x : {h.sequences.zero, h.sequences.positive, h.sequences.negative})
      seq.insert(seq.end(), {std::abs(x), std::arg(x)});
  }
  f.write(group + "/order", order, "1");
  f.write(group + "/phases", abc, units + " RMS, rad", 6);
  f.write(group + "/sequences", seq, units + " RMS, rad", 6);
  f.attribute(group + "/phases", "columns",
              std::string("|a|, angle a, |b|, angle b, |c|, angle c"));
  f.attribute(group + "/sequences", "columns",
              std::string("|zero|, angle zero, |positive|, angle positive, |negative|, angle "
                          "negative"));
}

}  // namespace

void write_analysis(ResultsFile& f, const RunAnalysis& a) {
  f.write("analysis/space_harmonics/amplitude_per_step", a.space_amplitude_tesla, "T",
          static_cast<std::size_t>(std::max(1, a.space_orders)));
  f.attribute("analysis", "periods", static_cast<long>(a.periods));
  f.attribute("analysis", "window_start_s", a.window_start_s);
  if (!a.note.empty()) f.attribute("analysis", "note", a.note);
  if (a.periods < 1) return;
  write_harmonics(f, "analysis/current", a.current, "A");
  write_harmonics(f, "analysis/flux_linkage", a.flux_linkage, "Wb");
  write_harmonics(f, "analysis/emf", a.emf, "V");
  f.attribute("analysis/current", "vuf_pct", a.current_unbalance.vuf_pct);
  f.attribute("analysis/current", "lvur_pct", a.current_unbalance.lvur_pct);
  f.attribute("analysis/current", "pvur_pct", a.current_unbalance.pvur_pct);
  if (!a.supply_voltage.empty()) {
    write_harmonics(f, "analysis/supply_voltage", a.supply_voltage, "V");
    write_harmonics(f, "analysis/line_voltage", a.line_voltage, "V");
    write_harmonics(f, "analysis/line_current", a.line_current, "A");
    write_harmonics(f, "analysis/winding_voltage", a.winding_voltage, "V");
    for (const auto& [group, u] : {std::pair{"analysis/supply_voltage", a.voltage_unbalance},
                                   std::pair{"analysis/line_current", a.line_current_unbalance}}) {
      f.attribute(group, "vuf_pct", u.vuf_pct);
      f.attribute(group, "lvur_pct", u.lvur_pct);
      f.attribute(group, "pvur_pct", u.pvur_pct);
    }
  }

  std::vector<int> orders;
  std::vector<double> amplitude;
  std::vector<std::string> labels;
  for (const SpaceHarmonic& h : a.space_harmonics) {
    orders.push_back(h.order_mech);
    amplitude.push_back(h.amplitude_tesla);
    labels.push_back(h.label);
  }
  f.write("analysis/space_harmonics/order_mech", orders, "1");
  f.write("analysis/space_harmonics/amplitude", amplitude, "T");
  f.write_strings("analysis/space_harmonics/label", labels);

  std::vector<int> space, direction;
  std::vector<double> time_order, wave_amplitude, phase;
  std::vector<std::string> wave_labels;
  for (const LabelledWave& lw : a.waves) {
    space.push_back(lw.wave.space_order_mech);
    direction.push_back(lw.wave.direction);
    time_order.push_back(lw.wave.time_order);
    wave_amplitude.push_back(lw.wave.amplitude);
    phase.push_back(lw.wave.phase_rad);
    wave_labels.push_back(lw.label);
  }
  f.write("analysis/waves/space_order_mech", space, "1");
  f.write("analysis/waves/time_order", time_order, "1");
  f.write("analysis/waves/direction", direction, "1");
  f.write("analysis/waves/amplitude", wave_amplitude, "T");
  f.write("analysis/waves/phase", phase, "rad");
  f.write_strings("analysis/waves/label", wave_labels);

  std::vector<double> path;
  for (const auto& z : a.fundamental_path) path.insert(path.end(), {z.real(), z.imag()});
  f.write("analysis/locus/space_fundamental", path, "T", 2);
  f.attribute("analysis/locus/space_fundamental", "major_tesla", a.locus.major_tesla);
  f.attribute("analysis/locus/space_fundamental", "minor_tesla", a.locus.minor_tesla);
  f.attribute("analysis/locus/space_fundamental", "axis_ratio", a.locus.axis_ratio);
  f.attribute("analysis/locus/space_fundamental", "major_axis_deg_el", a.locus.major_axis_deg_el);

  std::vector<double> t_order, t_amp;
  std::vector<std::string> t_label, t_source;
  for (const TorqueHarmonic& t : a.torque_harmonics) {
    t_order.push_back(t.order);
    t_amp.push_back(t.amplitude_nm);
    t_label.push_back(t.label);
    t_source.push_back(t.source);
  }
  f.write("analysis/torque_harmonics/order", t_order, "1");
  f.write("analysis/torque_harmonics/amplitude", t_amp, "N*m");
  f.write_strings("analysis/torque_harmonics/label", t_label);
  f.write_strings("analysis/torque_harmonics/source", t_source);

  std::vector<int> mode, f_direction, low;
  std::vector<double> f_order, f_hz, f_amp;
  for (const ForceWave& w : a.force_waves) {
    mode.push_back(w.mode);
    f_direction.push_back(w.direction);
    low.push_back(w.low_mode ? 1 : 0);
    f_order.push_back(w.time_order);
    f_hz.push_back(w.frequency_hz);
    f_amp.push_back(w.amplitude_n_per_m2);
  }
  f.write("analysis/force_waves/mode", mode, "1");
  f.write("analysis/force_waves/time_order", f_order, "1");
  f.write("analysis/force_waves/frequency", f_hz, "Hz");
  f.write("analysis/force_waves/direction", f_direction, "1");
  f.write("analysis/force_waves/amplitude", f_amp, "N/m^2");
  f.write("analysis/force_waves/low_mode", low, "1");
}

}  // namespace gapflux
