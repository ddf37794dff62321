#include "solver/supply_currents.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>

namespace gapflux {

namespace {

void check_waveform_covers(const Case& c, double first, double last, double dt_s) {
  const SupplySpec& s = c.supply;
  if (s.form != SupplyForm::waveform) return;
  const auto& t = s.waveform.time_s;
  const double slack = 1e-9 * std::max(dt_s, 1e-12);
  if (t.front() > first + slack || t.back() < last - slack)
    throw c.sources.error(
        "supply.waveform.file",
        fmt::format("the table covers {:.6g} s to {:.6g} s but the study needs {:.6g} s to "
                    "{:.6g} s; record longer, or change study.time_s or study.periods",
                    t.front(), t.back(), first, last));
}

}  // namespace

std::array<double, 3> supply_values(const SupplySpec& supply, double t_s) {
  std::array<double, 3> i{0, 0, 0};
  if (supply.form == SupplyForm::waveform) {
    const auto& w = supply.waveform;
    const auto it = std::upper_bound(w.time_s.begin(), w.time_s.end(), t_s);
    std::size_t hi = std::clamp<std::size_t>(it - w.time_s.begin(), 1, w.time_s.size() - 1);
    const std::size_t lo = hi - 1;
    const double u = (t_s - w.time_s[lo]) / (w.time_s[hi] - w.time_s[lo]);
    for (int k = 0; k < 3; ++k) i[k] = (1.0 - u) * w.values[k][lo] + u * w.values[k][hi];
    return i;
  }
  const double omega = 2.0 * std::numbers::pi * supply.frequency_hz;
  for (int k = 0; k < 3; ++k) {
    i[k] =
        std::sqrt(2.0) * supply.phases[k].rms * std::cos(omega * t_s + supply.phases[k].angle_rad);
    for (const SupplyComponent& h : supply.harmonics)
      i[k] += std::sqrt(2.0) * h.rms[k] * std::cos(h.order * omega * t_s + h.angle_rad[k]);
  }
  return i;
}

void check_supply_on_grid(const Case& c, const TimeGrid& grid) {
  const SupplySpec& s = c.supply;
  const int periods = grid.analysis_periods();
  for (const SupplyComponent& h : s.harmonics) {
    if (h.order >= 0.5 * grid.steps_per_period)
      throw c.sources.error(
          h.key_path + ".order",
          fmt::format("order {:g} needs more than {} steps per period to be resolved (it would "
                      "alias); set study.steps_per_period above {}",
                      h.order, grid.steps_per_period, static_cast<int>(std::floor(2.0 * h.order))));
    const double cycles = h.order * periods;
    if (periods > 0 && std::abs(cycles - std::round(cycles)) > 1e-9)
      throw c.sources.error(
          h.key_path + ".order",
          fmt::format("order {:g} does not complete whole periods in the analysis window of {} "
                      "electrical period(s) ({:g} cycles), so its spectrum would leak; choose "
                      "study.periods − study.discard_periods so that order × periods is whole",
                      h.order, periods, cycles));
  }
  check_waveform_covers(c, grid.time(0), grid.time(grid.steps - 1), grid.dt_s);
}

void check_supply_at_instant(const Case& c, double t_s) {
  check_waveform_covers(c, t_s, t_s, 0.0);
}

}  // namespace gapflux
