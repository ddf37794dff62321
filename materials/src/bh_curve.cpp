#include "materials/bh_curve.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace gapflux {
namespace {

// Cubic Hermite on [b0, b1] with values h0, h1 and slopes m0, m1, at b.
double hermite(double b0, double b1, double h0, double h1, double m0, double m1, double b) {
  const double dx = b1 - b0, t = (b - b0) / dx, t2 = t * t, t3 = t2 * t;
  return (2 * t3 - 3 * t2 + 1) * h0 + (t3 - 2 * t2 + t) * dx * m0 + (-2 * t3 + 3 * t2) * h1 +
         (t3 - t2) * dx * m1;
}

double hermite_derivative(double b0, double b1, double h0, double h1, double m0, double m1,
                          double b) {
  const double dx = b1 - b0, t = (b - b0) / dx, t2 = t * t;
  return ((6 * t2 - 6 * t) * h0 + (3 * t2 - 4 * t + 1) * dx * m0 + (-6 * t2 + 6 * t) * h1 +
          (3 * t2 - 2 * t) * dx * m1) /
         dx;
}

}  // namespace

BHCurve::BHCurve(std::vector<double> h_a_per_m, std::vector<double> b_tesla)
    : b_(std::move(b_tesla)), h_(std::move(h_a_per_m)) {
  if (b_.size() != h_.size())
    throw std::invalid_argument(
        fmt::format("the table has {} H values but {} B values", h_.size(), b_.size()));
  if (b_.size() < 5)
    throw std::invalid_argument(
        fmt::format("a B–H table needs at least 5 points (got {})", b_.size()));
  if (b_[0] != 0.0 || h_[0] != 0.0)
    throw std::invalid_argument(
        fmt::format("a B–H table must start at H = 0, B = 0 (got H = {}, "
                    "B = {})",
                    h_[0], b_[0]));
  for (std::size_t i = 1; i < b_.size(); ++i) {
    if (!(h_[i] > h_[i - 1]) || !(b_[i] > b_[i - 1]))
      throw std::invalid_argument(
          fmt::format("H and B must both increase strictly; point {} "
                      "(H = {}, B = {}) does not",
                      i + 1, h_[i], b_[i]));
  }
  const std::size_t n = b_.size();
  std::vector<double> secant(n - 1);
  for (std::size_t i = 0; i + 1 < n; ++i) secant[i] = (h_[i + 1] - h_[i]) / (b_[i + 1] - b_[i]);
  // Fritsch–Carlson: three-point slopes, then limited so that each cubic stays monotone.
  slope_.assign(n, 0.0);
  slope_[0] = secant[0];
  slope_[n - 1] = secant[n - 2];
  for (std::size_t i = 1; i + 1 < n; ++i) slope_[i] = 0.5 * (secant[i - 1] + secant[i]);
  // The last point's slope is that of the extension, dH/dB = 1/μ0, so that the curve is C¹
  // there (Newton keeps its quadratic rate across the end of the table); Fritsch and Carlson's
  // box condition (slopes at most 3× the segment's secant) keeps every cubic monotone.
  slope_[n - 1] = 1.0 / mu0;
  for (std::size_t i = 0; i + 1 < n; ++i) {
    slope_[i] = std::min(slope_[i], 3.0 * secant[i]);
    slope_[i + 1] = std::min(slope_[i + 1], 3.0 * secant[i]);
    if (i > 0) slope_[i] = std::min(slope_[i], 3.0 * secant[i - 1]);
  }
  j_sat_ = b_.back() - mu0 * h_.back();
  if (j_sat_ < 0.0)
    throw std::invalid_argument("the last point lies below the free-space line B = μ0·H");
  // Energy at the points: the Hermite cubic is integrated exactly by two-point Gauss.
  energy_at_.assign(n, 0.0);
  const double g = 0.5 / std::sqrt(3.0);
  for (std::size_t i = 0; i + 1 < n; ++i) {
    const double b0 = b_[i], b1 = b_[i + 1], mid = 0.5 * (b0 + b1), half = b1 - b0;
    const double e = 0.5 * half *
                     (hermite(b0, b1, h_[i], h_[i + 1], slope_[i], slope_[i + 1], mid - g * half) +
                      hermite(b0, b1, h_[i], h_[i + 1], slope_[i], slope_[i + 1], mid + g * half));
    energy_at_[i + 1] = energy_at_[i] + e;
  }
}

std::size_t BHCurve::segment(double b) const {
  const auto it = std::upper_bound(b_.begin(), b_.end(), b);
  const std::size_t i = static_cast<std::size_t>(it - b_.begin());
  return i == 0 ? 0 : std::min(i - 1, b_.size() - 2);
}

double BHCurve::h_of_b(double b) const {
  if (b < 0.0) return -h_of_b(-b);
  if (b >= b_.back()) return (b - j_sat_) / mu0;
  const std::size_t i = segment(b);
  return hermite(b_[i], b_[i + 1], h_[i], h_[i + 1], slope_[i], slope_[i + 1], b);
}

double BHCurve::dh_db(double b) const {
  b = std::abs(b);
  if (b >= b_.back()) return 1.0 / mu0;
  const std::size_t i = segment(b);
  return hermite_derivative(b_[i], b_[i + 1], h_[i], h_[i + 1], slope_[i], slope_[i + 1], b);
}

void BHCurve::reluctivity(double b_squared, double& nu, double& dnu_db2) const {
  const double b = std::sqrt(std::max(0.0, b_squared));
  if (b < 1e-9) {
    nu = slope_[0];
    dnu_db2 = 0.0;
    return;
  }
  const double h = h_of_b(b);
  nu = h / b;
  // dν/dB = (H'·B − H)/B², and d/d(B²) = (1/2B)·d/dB.
  dnu_db2 = (dh_db(b) * b - h) / (2.0 * b * b * b);
}

double BHCurve::energy_density(double b) const {
  b = std::abs(b);
  if (b >= b_.back()) {
    // ∫ (b' − J)/μ0 db' from the last point.
    const double b0 = b_.back();
    return energy_at_.back() + ((b * b - b0 * b0) / 2.0 - j_sat_ * (b - b0)) / mu0;
  }
  const std::size_t i = segment(b);
  const double b0 = b_[i], half = b - b0, mid = 0.5 * (b0 + b), g = 0.5 / std::sqrt(3.0);
  const auto h = [&](double x) {
    return hermite(b_[i], b_[i + 1], h_[i], h_[i + 1], slope_[i], slope_[i + 1], x);
  };
  return energy_at_[i] + 0.5 * half * (h(mid - g * half) + h(mid + g * half));
}

double BHCurve::steepest_b() const {
  double best = 0.0;
  std::size_t at = 0;
  for (std::size_t i = 0; i < b_.size(); ++i)
    if (1.0 / slope_[i] > best) {
      best = 1.0 / slope_[i];
      at = i;
    }
  return b_[at];
}

double BHCurve::knee_tesla() const {
  // The first B above the steepest point where the differential permeability has fallen below a
  // tenth of its largest.
  const double from = steepest_b();
  const double best = 1.0 / dh_db(from);
  for (double b = from; b < b_.back(); b += 1e-3)
    if (1.0 / dh_db(b) < 0.1 * best) return b;
  return b_.back();
}

double BHCurve::b_at_differential_mu_r(double mu_r) const {
  for (double b = steepest_b(); b < b_.back(); b += 1e-3)
    if (1.0 / (mu0 * dh_db(b)) < mu_r) return b;
  return b_.back();
}

}  // namespace gapflux
