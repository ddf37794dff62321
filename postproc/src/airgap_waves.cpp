#include "postproc/airgap_waves.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "postproc/spectrum.hpp"

namespace gapflux {

std::vector<double> full_circle(const std::vector<double>& sector, int sectors, bool antiperiodic) {
  std::vector<double> out;
  out.reserve(sector.size() * sectors);
  double sign = 1.0;
  for (int k = 0; k < sectors; ++k, sign *= antiperiodic ? -1.0 : 1.0)
    for (double v : sector) out.push_back(sign * v);
  return out;
}

std::vector<double> space_amplitudes(const double* row, int samples) {
  std::vector<double> a = amplitude_spectrum(std::vector<double>(row, row + samples));
  a.resize(static_cast<std::size_t>(samples / 2));  // the Nyquist order is left out
  return a;
}

std::vector<Wave> space_time_waves(const AirgapRecord& r, int periods, double t0_s,
                                   double frequency_hz, int pole_pairs, double floor_fraction) {
  std::vector<Wave> waves;
  const int nt = r.steps, ns = r.samples;
  if (periods < 1 || nt < 2 || ns < 4) return waves;
  const std::vector<std::complex<double>> out = real_dft_2d(r.values, nt, ns);
  const int cols = ns / 2 + 1;
  const double omega = 2.0 * std::numbers::pi * frequency_hz;
  for (int m = 0; m < (ns + 1) / 2; ++m) {
    for (int k0 = 0; k0 < nt; ++k0) {
      // FFTW's time bin k0 is e^{−2πi·k0·n/N}; the wave's e^{+ihωt_n} is bin −k_h (mod N).
      int kh = (nt - k0) % nt;
      if (kh > nt / 2) kh -= nt;
      if (nt % 2 == 0 && std::abs(kh) == nt / 2) continue;  // Nyquist: direction undefined
      if (m == 0 && kh < 0) continue;  // a uniform field: ±h are one real pulsation
      const double h = double(kh) / periods;
      const std::complex<double> c = out[static_cast<std::size_t>(k0) * cols + m] /
                                     (double(nt) * ns) *
                                     std::polar(1.0, -m * r.theta0_rad + h * omega * t0_s);
      Wave w;
      w.space_order_mech = m;
      w.space_order_el = double(m) / pole_pairs;
      w.time_order = std::abs(h);
      w.direction = (m == 0 || kh == 0) ? 0 : (kh > 0 ? 1 : -1);
      w.amplitude = (m == 0 && kh == 0) ? std::abs(c) : 2.0 * std::abs(c);
      w.phase_rad = -std::arg(c);
      waves.push_back(w);
    }
  }
  double largest = 0;
  for (const Wave& w : waves) largest = std::max(largest, w.amplitude);
  std::erase_if(waves, [&](const Wave& w) {
    return !(w.amplitude > floor_fraction * largest && w.amplitude > 0);
  });
  std::sort(waves.begin(), waves.end(),
            [](const Wave& a, const Wave& b) { return a.amplitude > b.amplitude; });
  return waves;
}

const Wave* find_wave(const std::vector<Wave>& waves, int order_mech, double signed_time_order) {
  for (const Wave& w : waves)
    if (w.space_order_mech == order_mech &&
        std::abs(w.signed_time_order() - signed_time_order) < 1e-9)
      return &w;
  return nullptr;
}

std::vector<std::complex<double>> space_fundamental(const AirgapRecord& r, int pole_pairs) {
  std::vector<std::complex<double>> out(static_cast<std::size_t>(r.steps));
  const double pitch = 2.0 * std::numbers::pi / r.samples;
  for (int n = 0; n < r.steps; ++n) {
    std::complex<double> sum = 0;
    for (int j = 0; j < r.samples; ++j)
      sum += r.values[static_cast<std::size_t>(n) * r.samples + j] *
             std::polar(1.0, -pole_pairs * (r.theta0_rad + j * pitch));
    out[n] = 2.0 * sum / double(r.samples);
  }
  return out;
}

FieldLocus field_locus(const std::vector<Wave>& waves, int pole_pairs) {
  FieldLocus l;
  const Wave* f = find_wave(waves, pole_pairs, 1.0);
  const Wave* b = find_wave(waves, pole_pairs, -1.0);
  l.forward_tesla = f ? f->amplitude : 0.0;
  l.backward_tesla = b ? b->amplitude : 0.0;
  l.major_tesla = l.forward_tesla + l.backward_tesla;
  l.minor_tesla = std::abs(l.forward_tesla - l.backward_tesla);
  l.axis_ratio = l.major_tesla > 0 ? l.minor_tesla / l.major_tesla : 1.0;
  // The two phasors B_f·e^{−j(ωt+φ_f)} and B_b·e^{j(ωt−φ_b)} align at the angle −(φ_f + φ_b)/2 of
  // the phasor, i.e. the wave's crest at p·θ = (φ_f + φ_b)/2.
  const double crest = 0.5 * ((f ? f->phase_rad : 0.0) + (b ? b->phase_rad : 0.0));
  double deg = std::fmod(crest * 180.0 / std::numbers::pi, 180.0);
  if (deg < 0) deg += 180.0;
  l.major_axis_deg_el = deg;
  return l;
}

}  // namespace gapflux
