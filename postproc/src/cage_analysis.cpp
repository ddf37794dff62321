#include "postproc/cage_analysis.hpp"

#include <Eigen/Dense>
#include <cmath>
#include <numbers>

namespace gapflux {
namespace {

constexpr double pi = std::numbers::pi;
using Basis = Eigen::Matrix<double, Eigen::Dynamic, 4>;

double rms(const std::vector<std::vector<double>>& rows) {
  double sum = 0.0;
  std::size_t count = 0;
  for (const auto& row : rows)
    for (double v : row) sum += v * v, ++count;
  return count ? std::sqrt(sum / count) : 0.0;
}

}  // namespace

CageAnalysis analyse_cage(const CageRecord& r) {
  CageAnalysis a;
  const std::size_t steps = r.time_s.size();
  if (steps == 0) return a;
  const double omega = 2.0 * pi * r.frequency_hz;
  const double w_f = r.slip * omega, w_b = (2.0 - r.slip) * omega;
  a.forward_hz = std::abs(w_f) / (2.0 * pi);
  a.backward_hz = std::abs(w_b) / (2.0 * pi);
  a.bar_rms_a = rms(r.bar_current_a);
  a.ring_rms_a = rms(r.ring_current_a);
  a.ring_to_bar = a.bar_rms_a > 0 ? a.ring_rms_a / a.bar_rms_a : 0.0;
  a.ring_to_bar_balanced = 1.0 / (2.0 * std::sin(pi * r.pole_pairs / r.bars_total));
  for (const auto& row : r.loss_w) {
    a.loss_bars_w += row[0] / steps;
    a.loss_rings_w += row[1] / steps;
  }
  a.loss_w = a.loss_bars_w + a.loss_rings_w;

  // The two bar-current waves by least squares over every bar and step.
  const std::size_t bars = r.bar_current_a.front().size();
  // Four columns fixed at compile time: a QR on MatrixXd would share its symbols with the copy
  // libgmsh exports and be interposed with it (a mismatched allocator under ASan).
  Basis basis(steps * bars, 4);
  Eigen::VectorXd values(steps * bars);
  for (std::size_t n = 0; n < steps; ++n)
    for (std::size_t k = 0; k < bars; ++k) {
      const double theta = (k + 0.5) * 2.0 * pi / r.bars_total;
      const double f = w_f * r.time_s[n] - r.pole_pairs * theta;
      const double b = w_b * r.time_s[n] + r.pole_pairs * theta;
      basis.row(n * bars + k) << std::cos(f), std::sin(f), std::cos(b), std::sin(b);
      values[n * bars + k] = r.bar_current_a[n][k];
    }
  const Eigen::Vector4d c = basis.colPivHouseholderQr().solve(values);
  a.forward_bar_rms_a = std::hypot(c[0], c[1]) / std::sqrt(2.0);
  a.backward_bar_rms_a = std::hypot(c[2], c[3]) / std::sqrt(2.0);

  // The loss shares: each bar triangle's J fitted at the two frequencies (no constant: over a
  // window of whole supply periods a slow forward wave and a constant cannot be told apart),
  // and each ring segment's current likewise.
  Basis t(steps, 4);
  for (std::size_t n = 0; n < steps; ++n)
    t.row(n) << std::cos(w_f * r.time_s[n]), std::sin(w_f * r.time_s[n]),
        std::cos(w_b * r.time_s[n]), std::sin(w_b * r.time_s[n]);
  const Eigen::ColPivHouseholderQR<Basis> qr(t);
  Eigen::VectorXd series(steps);
  if (!r.bar_density.empty() && r.conductivity_s_per_m > 0) {
    const double scale = r.stack_length_m * r.sectors / (2.0 * r.conductivity_s_per_m);
    for (std::size_t e = 0; e < r.bar_triangle_area_m2.size(); ++e) {
      for (std::size_t n = 0; n < steps; ++n) series[n] = r.bar_density[n][e];
      const Eigen::VectorXd k = qr.solve(series);
      a.loss_forward_w += r.bar_triangle_area_m2[e] * (k[0] * k[0] + k[1] * k[1]) * scale;
      a.loss_backward_w += r.bar_triangle_area_m2[e] * (k[2] * k[2] + k[3] * k[3]) * scale;
    }
  }
  // Rings: both alike, each segment's R·Î²/2 twice, over the sectors.
  for (std::size_t s = 0; s < r.ring_current_a.front().size(); ++s) {
    for (std::size_t n = 0; n < steps; ++n) series[n] = r.ring_current_a[n][s];
    const Eigen::VectorXd k = qr.solve(series);
    const double scale = r.ring_segment_resistance_ohm * r.sectors;
    a.loss_forward_w += (k[0] * k[0] + k[1] * k[1]) * scale;
    a.loss_backward_w += (k[2] * k[2] + k[3] * k[3]) * scale;
  }
  a.loss_rest_w = a.loss_w - a.loss_forward_w - a.loss_backward_w;
  return a;
}

}  // namespace gapflux
