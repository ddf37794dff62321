#include "postproc/power_balance.hpp"

#include <cmath>
#include <complex>
#include <numbers>

namespace gapflux {

PowerBalance power_balance(const PowerRecord& r, const std::vector<HarmonicPhasors>& voltage,
                           const std::vector<HarmonicPhasors>& current) {
  PowerBalance b;
  const std::size_t n = r.torque_nm.size();
  if (n == 0) return b;
  const double omega = 2.0 * std::numbers::pi * r.frequency_hz;
  const double sync = omega / r.pole_pairs;
  b.slip = 1.0 - r.mechanical_speed_rad_s / sync;
  double torque = 0.0, input = 0.0;
  std::array<double, 3> v2{0, 0, 0}, i2{0, 0, 0};
  for (std::size_t s = 0; s < n; ++s) {
    torque += r.torque_nm[s] / n;
    for (int k = 0; k < 3; ++k) {
      const double v = r.branch_voltage_v[k][s], i = r.branch_current_a[k][s];
      input += v * i / n;
      v2[k] += v * v / n;
      i2[k] += i * i / n;
    }
  }
  b.input_w = input;
  b.copper_w = r.copper_w;
  b.cage_w = r.cage_w;
  b.iron_w = r.iron_w;
  b.airgap_w = torque * sync;
  b.mechanical_w = torque * r.mechanical_speed_rad_s;
  b.slip_times_airgap_w = b.slip * b.airgap_w;
  if (input != 0.0) {
    b.balance_residual_pct = 100.0 * (input - b.copper_w - b.cage_w - b.mechanical_w) / input;
    b.efficiency_pct = 100.0 * b.mechanical_w / (input + b.iron_w);
  }
  double apparent = 0.0;
  for (int k = 0; k < 3; ++k) apparent += std::sqrt(v2[k] * i2[k]);
  if (apparent > 0.0) b.power_factor = input / apparent;
  // Torque by space order: Re{b_r,ν·b*_θ,ν} from each step's full-circle DFT.
  if (!r.airgap_b_r.empty()) {
    double order_p = 0.0, all = 0.0;
    const std::size_t samples = r.airgap_b_r.front().size();
    for (std::size_t s = 0; s < r.airgap_b_r.size(); ++s) {
      for (std::size_t nu = 1; nu < samples / 2; ++nu) {
        std::complex<double> br = 0, bt = 0;
        for (std::size_t m = 0; m < samples; ++m) {
          const std::complex<double> turn =
              std::polar(1.0, -2.0 * std::numbers::pi * double(nu * m) / double(samples));
          br += r.airgap_b_r[s][m] * turn;
          bt += r.airgap_b_theta[s][m] * turn;
        }
        const double product = std::real(br * std::conj(bt));
        all += product;
        if (nu == static_cast<std::size_t>(r.pole_pairs)) order_p += product;
      }
    }
    if (all != 0.0) {
      b.fundamental_torque_nm = torque * order_p / all;
      b.fundamental_airgap_w = b.fundamental_torque_nm * sync;
      b.slip_times_fundamental_w = b.slip * b.fundamental_airgap_w;
    }
  }
  const auto fundamental = [](const std::vector<HarmonicPhasors>& h) -> const HarmonicPhasors* {
    for (const HarmonicPhasors& p : h)
      if (std::abs(p.order - 1.0) < 1e-9) return &p;
    return nullptr;
  };
  const HarmonicPhasors* v1 = fundamental(voltage);
  const HarmonicPhasors* i1 = fundamental(current);
  if (v1 && i1 && std::abs(v1->sequences.positive) > 0 && std::abs(i1->sequences.positive) > 0)
    b.displacement_factor =
        std::cos(std::arg(v1->sequences.positive) - std::arg(i1->sequences.positive));
  return b;
}

}  // namespace gapflux
