#include "materials/iron_loss.hpp"

#include <cmath>
#include <numbers>
#include <stdexcept>

namespace gapflux {

IronLossModel fit_iron_loss(double p15, double d, double sigma, double rho) {
  IronLossModel m;
  if (!(p15 > 0.0)) return m;
  const double f = 50.0, b = 1.5;
  m.k_c = std::numbers::pi * std::numbers::pi * sigma * d * d / (6.0 * rho);
  const double classical = m.k_c * (f * b) * (f * b);
  const double excess = 0.10 * p15;
  if (classical > 0.9 * p15)
    throw std::invalid_argument(
        "the lamination's classical eddy-current loss alone exceeds 90 % "
        "of its grade figure: check thickness and conductivity");
  m.k_e = excess / std::pow(f * b, 1.5);
  m.k_h = (p15 - classical - excess) / (f * std::pow(b, m.alpha));
  return m;
}

double specific_iron_loss_w_per_kg(const IronLossModel& m, double f, double b) {
  if (f <= 0.0 || b <= 0.0) return 0.0;
  return m.k_h * f * std::pow(b, m.alpha) + m.k_c * (f * b) * (f * b) +
         m.k_e * std::pow(f * b, 1.5);
}

}  // namespace gapflux
