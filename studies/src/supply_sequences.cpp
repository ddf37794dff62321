#include "supply_sequences.hpp"

#include <numbers>

#include "solver/supply_currents.hpp"
#include "solver/winding_sources.hpp"

namespace gapflux {
namespace {

constexpr double pi = std::numbers::pi;
const Complex a_op = std::polar(1.0, 2.0 * pi / 3.0);  // Fortescue's operator

}  // namespace

Sequences sequences_of(const Eigen::Vector3cd& x) {
  return {(x[0] + x[1] + x[2]) / 3.0, (x[0] + a_op * x[1] + a_op * a_op * x[2]) / 3.0,
          (x[0] + a_op * a_op * x[1] + a_op * x[2]) / 3.0};
}
Eigen::Vector3cd positive_set(Complex x1) {
  return {x1, a_op * a_op * x1, a_op * x1};
}
Eigen::Vector3cd negative_set(Complex x2) {
  return {x2, a_op * x2, a_op * a_op * x2};
}

double slip_of(const Case& c) {
  switch (c.study.motion) {
    case Motion::slip:
      return c.study.slip;
    case Motion::locked:
      return 1.0;
    case Motion::speed: {
      const double sync_rpm = 60.0 * c.supply.frequency_hz / c.machine.pole_pairs();
      return (sync_rpm - c.study.speed_rpm) / sync_rpm;
    }
  }
  return 0.0;
}

Eigen::Vector3cd supply_fundamental(const SupplySpec& supply, bool voltage_fed, double t_ref_s) {
  const int samples = 720;
  const double period_s = 1.0 / supply.frequency_hz;
  const double omega = 2.0 * pi * supply.frequency_hz;
  Eigen::Vector3cd sum = Eigen::Vector3cd::Zero();
  for (int n = 0; n < samples; ++n) {
    const double t = t_ref_s + period_s * n / samples;
    const std::array<double, 3> v =
        voltage_fed ? branch_source_voltages_v(supply, t) : supply_phase_currents_a(supply, t);
    const Complex turn = std::polar(1.0, -omega * (t - t_ref_s));
    for (int k = 0; k < 3; ++k) sum[k] += v[k] * turn;
  }
  return sum * (2.0 / samples);
}

SequenceFields solve_sequences(const Assembler& assembler, const RegionModel& model,
                               HarmonicWinding winding, const HarmonicCage* cage,
                               double omega_rad_per_s, double slip,
                               const Eigen::Vector3cd& source) {
  SequenceFields out;
  const Sequences seq = sequences_of(source);
  out.source_positive = positive_set(seq.positive);
  out.source_negative = negative_set(seq.negative);
  out.has_negative = std::abs(seq.negative) > 1e-9 * std::abs(seq.positive);
  const HarmonicSettings settings;
  winding.source = out.source_positive;
  out.positive = solve_harmonic(assembler, model, winding, cage, omega_rad_per_s, slip, settings);
  if (out.has_negative) {
    winding.source = out.source_negative;
    out.negative = solve_harmonic(assembler, model, winding, cage, omega_rad_per_s, 2.0 - slip,
                                  settings, &out.positive.reluctivity);
  }
  return out;
}

}  // namespace gapflux
