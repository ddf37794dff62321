#include "postproc/sequences.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "postproc/spectrum.hpp"

namespace gapflux {

SequenceSet fortescue(const std::array<Phasor, 3>& x) {
  const Phasor a = std::polar(1.0, 2.0 * std::numbers::pi / 3.0), a2 = a * a;
  return {(x[0] + x[1] + x[2]) / 3.0, (x[0] + a * x[1] + a2 * x[2]) / 3.0,
          (x[0] + a2 * x[1] + a * x[2]) / 3.0};
}

namespace {

double max_deviation_pct(const std::array<double, 3>& m) {
  const double mean = (m[0] + m[1] + m[2]) / 3.0;
  if (!(mean > 0)) return 0.0;
  double dev = 0;
  for (double v : m) dev = std::max(dev, std::abs(v - mean));
  return 100.0 * dev / mean;
}

}  // namespace

UnbalanceMetrics unbalance_metrics(const std::array<Phasor, 3>& x) {
  UnbalanceMetrics u;
  const SequenceSet s = fortescue(x);
  u.vuf_pct = std::abs(s.positive) > 0 ? 100.0 * std::abs(s.negative) / std::abs(s.positive) : 0.0;
  u.lvur_pct =
      max_deviation_pct({std::abs(x[0] - x[1]), std::abs(x[1] - x[2]), std::abs(x[2] - x[0])});
  u.pvur_pct = max_deviation_pct({std::abs(x[0]), std::abs(x[1]), std::abs(x[2])});
  return u;
}

std::vector<HarmonicPhasors> three_phase_harmonics(const std::array<std::vector<double>, 3>& series,
                                                   int periods, double t0_s, double frequency_hz,
                                                   double floor_fraction) {
  std::vector<HarmonicPhasors> out;
  const std::size_t n = series[0].size();
  if (periods < 1 || n < 4) return out;
  std::array<std::vector<std::complex<double>>, 3> dft;
  for (int k = 0; k < 3; ++k) dft[k] = real_dft(series[k]);
  const std::size_t bins = dft[0].size() - (n % 2 == 0 ? 1 : 0);  // Nyquist bin left out
  const auto phasor = [&](int k, std::size_t bin) {
    // x_n = √2|X|cos(hω t_n + φ) gives DFT bin = N·|X|/√2·e^{j(φ + hωt0)}.
    const double order = double(bin) / periods;
    return std::sqrt(2.0) * dft[k][bin] / double(n) *
           std::polar(1.0, -2.0 * std::numbers::pi * frequency_hz * order * t0_s);
  };
  double fundamental = 0.0;
  if (static_cast<std::size_t>(periods) < bins)
    for (int k = 0; k < 3; ++k)
      fundamental = std::max(fundamental, std::abs(phasor(k, static_cast<std::size_t>(periods))));
  for (std::size_t bin = 1; bin < bins; ++bin) {
    HarmonicPhasors h;
    h.order = double(bin) / periods;
    double largest = 0;
    for (int k = 0; k < 3; ++k) {
      h.abc[k] = phasor(k, bin);
      largest = std::max(largest, std::abs(h.abc[k]));
    }
    const bool is_fundamental = bin == static_cast<std::size_t>(periods);
    if (!is_fundamental && !(largest > floor_fraction * fundamental && largest > 0)) continue;
    h.sequences = fortescue(h.abc);
    out.push_back(h);
  }
  return out;
}

const HarmonicPhasors* find_order(const std::vector<HarmonicPhasors>& harmonics, double order) {
  for (const auto& h : harmonics)
    if (std::abs(h.order - order) < 1e-9) return &h;
  return nullptr;
}

}  // namespace gapflux
