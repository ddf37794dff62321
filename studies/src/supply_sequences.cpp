#include "supply_sequences.hpp"

#include <numbers>

#include "postproc/torque.hpp"
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

HarmonicWinding harmonic_winding(const Case& c, const Assembler& assembler,
                                 const CoilRegions& coils, const BranchImpedance& impedance,
                                 int sectors) {
  HarmonicWinding w;
  w.coupling = coil_coupling(assembler, coils);
  w.connection = c.supply.connection;
  w.impedance = impedance;
  w.linkage_scale = c.machine.stack_length_m * sectors;
  w.voltage_fed = c.supply.voltage_fed();
  return w;
}

HarmonicCage harmonic_cage(const Assembler& assembler, const CageParameters& cage,
                           const std::vector<int>& bar_of_region, RegionModel& model) {
  HarmonicCage h;
  h.parameters = cage;
  h.coupling = bar_coupling(assembler, bar_of_region, cage.bars, h.bar_area_m2);
  model.eddy_s_per_m.assign(bar_of_region.size(), 0.0);
  for (std::size_t r = 0; r < bar_of_region.size(); ++r)
    if (bar_of_region[r] >= 0) model.eddy_s_per_m[r] = cage.conductivity_s_per_m;
  return h;
}

SequenceFields solve_sequences(const Assembler& assembler, const RegionModel& model,
                               HarmonicWinding winding, const HarmonicCage* cage,
                               double omega_rad_per_s, double slip, const Eigen::Vector3cd& source,
                               const HarmonicSettings& settings) {
  SequenceFields out;
  const Sequences seq = sequences_of(source);
  out.source_positive = positive_set(seq.positive);
  out.source_negative = negative_set(seq.negative);
  out.has_negative = std::abs(seq.negative) > 1e-9 * std::abs(seq.positive);
  winding.source = out.source_positive;
  out.positive = solve_harmonic(assembler, model, winding, cage, omega_rad_per_s, slip, settings);
  if (out.has_negative) {
    winding.source = out.source_negative;
    out.negative = solve_harmonic(assembler, model, winding, cage, omega_rad_per_s, 2.0 - slip,
                                  settings, &out.positive.reluctivity);
  }
  return out;
}

SequenceImpedances sequence_impedances(const Assembler& assembler, const RegionModel& model,
                                       HarmonicWinding winding, const HarmonicCage* cage,
                                       double omega_rad_per_s, double slip,
                                       const SequenceFields& f) {
  const auto z_of = [](const HarmonicState& s, bool negative) {
    const Sequences v = sequences_of(s.branch_voltage_v), i = sequences_of(s.branch_current_a);
    return negative ? v.negative / i.negative : v.positive / i.positive;
  };
  SequenceImpedances z;
  z.positive_ohm = z_of(f.positive, false);
  if (f.has_negative) {
    z.negative_ohm = z_of(f.negative, true);
    return z;
  }
  winding.source = negative_set(sequences_of(f.source_positive).positive);
  const HarmonicState probe = solve_harmonic(assembler, model, winding, cage, omega_rad_per_s,
                                             2.0 - slip, {}, &f.positive.reluctivity);
  z.negative_ohm = z_of(probe, true);
  z.probe_solves = probe.iterations;
  return z;
}

double HarmonicPoint::current_rms_a() const {
  return std::abs(current_seq.positive) / std::sqrt(2.0);
}

PointContext point_context(const Case& c, const MagnetostaticSystem& system,
                           const HarmonicWinding& winding, const HarmonicCage* cage,
                           const std::vector<int>& bar_of_region, double omega_rad_per_s) {
  PointContext context;
  context.system = &system;
  context.winding = &winding;
  context.cage = cage;
  context.bar_of_region = &bar_of_region;
  context.omega_rad_per_s = omega_rad_per_s;
  context.pole_pairs = c.machine.pole_pairs();
  context.stack_m = c.machine.stack_length_m;
  return context;
}

HarmonicPoint evaluate_point(const PointContext& c, const SequenceFields& f, double slip) {
  HarmonicPoint p;
  p.slip = slip;
  const HarmonicWinding& w = *c.winding;
  const double sync_rad_s = c.omega_rad_per_s / c.pole_pairs;
  const auto gap_power_w = [&](const HarmonicState& s) {
    double power = 0.0;
    for (int k = 0; k < 3; ++k)
      power += 0.5 * (s.branch_voltage_v[k] * std::conj(s.branch_current_a[k])).real() -
               0.5 * w.impedance.resistance_ohm * std::norm(s.branch_current_a[k]);
    return power;
  };
  // Mean over a period of Arkkio's stress of x(t) = Re{x̂·e^{jωt}} (bilinear in the field).
  const auto stress_nm = [&](const Eigen::VectorXcd& x) {
    return 0.5 * (arkkio_torque_nm(c.system->assembler(), x.real(), c.system->mesh(), c.stack_m) +
                  arkkio_torque_nm(c.system->assembler(), x.imag(), c.system->mesh(), c.stack_m));
  };
  p.airgap_positive_w = gap_power_w(f.positive);
  p.airgap_negative_w = f.has_negative ? gap_power_w(f.negative) : 0.0;
  p.torque_positive_nm = p.airgap_positive_w / sync_rad_s;
  p.torque_negative_nm = -p.airgap_negative_w / sync_rad_s;
  p.torque_nm = p.torque_positive_nm + p.torque_negative_nm;
  p.maxwell_stress_nm = stress_nm(f.positive.x) + (f.has_negative ? stress_nm(f.negative.x) : 0.0);
  const auto largest_rms = [](const Eigen::VectorXcd& currents) {
    double largest = 0.0;
    for (const Complex& i : currents) largest = std::max(largest, std::abs(i) / std::sqrt(2.0));
    return largest;
  };
  // Each sequence's cage loss and its largest bar current.
  const auto cage_of = [&](const HarmonicState& s, double& loss_w, double& bar_rms_a) {
    const HarmonicCageLoss loss =
        harmonic_cage_loss(c.system->assembler(), *c.bar_of_region, *c.cage, s);
    loss_w = loss.bars_w + loss.rings_w;
    p.cage_bars_w += loss.bars_w, p.cage_rings_w += loss.rings_w;
    bar_rms_a = largest_rms(s.bar_current_a);
  };
  if (c.cage) {
    cage_of(f.positive, p.cage_forward_w, p.bar_forward_rms_a);
    if (f.has_negative) cage_of(f.negative, p.cage_backward_w, p.bar_backward_rms_a);
  }
  p.current_a = f.positive.branch_current_a;
  p.voltage_v = f.positive.branch_voltage_v;
  if (f.has_negative) {
    p.current_a += f.negative.branch_current_a;
    p.voltage_v += f.negative.branch_voltage_v;
  }
  for (int k = 0; k < 3; ++k) {
    p.input_w += 0.5 * (p.voltage_v[k] * std::conj(p.current_a[k])).real();
    p.apparent_va += 0.5 * std::abs(p.voltage_v[k]) * std::abs(p.current_a[k]);
    p.copper_w += 0.5 * w.impedance.resistance_ohm * std::norm(p.current_a[k]);
  }
  p.mechanical_w = p.torque_nm * (1.0 - slip) * sync_rad_s;
  p.current_seq = sequences_of(p.current_a);
  p.voltage_seq = sequences_of(p.voltage_v);
  for (double b : f.positive.b_peak_tesla) p.b_peak_tesla = std::max(p.b_peak_tesla, b);
  return p;
}

}  // namespace gapflux
