#pragma once
// The supply's fundamental as phasors, its sequences (Fortescue) and their time-harmonic fields:
// what the time-harmonic study reports and what time stepping may start from.
#include <Eigen/Core>
#include <complex>

#include "cases/case.hpp"
#include "solver/circuit.hpp"
#include "solver/harmonic_field.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver/winding_sources.hpp"

namespace gapflux {

struct Sequences {
  Complex zero, positive, negative;
};
// Of a phase (or branch) set a, b, c: X1 = (Xa + a·Xb + a²·Xc)/3 and so on.
Sequences sequences_of(const Eigen::Vector3cd& x);
Eigen::Vector3cd positive_set(Complex x1);
Eigen::Vector3cd negative_set(Complex x2);

// The slip the case's motion gives (locked: 1).
double slip_of(const Case& c);

// The fundamental of what the supply imposes on each winding branch (voltages when voltage-fed,
// else currents), complex amplitudes referred to `t_ref_s` (X(t) = Re{X̂·e^{jω(t − t_ref)}}), by
// a DFT over one period; the supply's harmonics drop out.
Eigen::Vector3cd supply_fundamental(const SupplySpec& supply, bool voltage_fed, double t_ref_s);

// The winding in phasor form on `assembler` (its source is set by solve_sequences): the case's
// connection and feed, R and end-winding L per branch, the linkage scale of `sectors`.
HarmonicWinding harmonic_winding(const Case& c, const Assembler& assembler,
                                 const CoilRegions& coils, const BranchImpedance& impedance,
                                 int sectors);
// The induced cage in phasor form; gives the bars' regions of `model` the cage's conductivity.
// `bar_of_region`: each mesh region's bar in the sector, −1 elsewhere.
HarmonicCage harmonic_cage(const Assembler& assembler, const CageParameters& cage,
                           const std::vector<int>& bar_of_region, RegionModel& model);

// The positive sequence of `source` at slip s, its effective reluctivity iterated; the negative
// one (when there is one) at slip 2 − s on those reluctivities. `winding.source` is ignored.
struct SequenceFields {
  HarmonicState positive, negative;
  bool has_negative = false;
  Eigen::Vector3cd source_positive, source_negative;
};
SequenceFields solve_sequences(const Assembler& assembler, const RegionModel& model,
                               HarmonicWinding winding, const HarmonicCage* cage,
                               double omega_rad_per_s, double slip, const Eigen::Vector3cd& source,
                               const HarmonicSettings& settings = {});

// The sequence impedances Z = V/I per winding branch: the positive one at slip s, the negative
// one at slip 2 − s on the positive state (from the supply's own negative sequence, or, when it
// has none, from one more linear solve with a negative-sequence source of the positive one's
// size: the state is fixed, so its size does not matter).
struct SequenceImpedances {
  Complex positive_ohm{}, negative_ohm{};
  int probe_solves = 0;
};
SequenceImpedances sequence_impedances(const Assembler& assembler, const RegionModel& model,
                                       HarmonicWinding winding, const HarmonicCage* cage,
                                       double omega_rad_per_s, double slip,
                                       const SequenceFields& fields);

// One operating point from its sequences' fields: what the winding takes and the rotor gives.
// Per sequence the air-gap power (input less stator copper: the FE iron is lossless) and its
// torque ±P_ag/Ω_sync (the equivalent circuit's); Arkkio's stress of the held-rotor field beside.
struct HarmonicPoint {
  double slip = 0.0;
  Eigen::Vector3cd current_a = Eigen::Vector3cd::Zero(), voltage_v = Eigen::Vector3cd::Zero();
  Sequences current_seq{}, voltage_seq{};
  double torque_nm = 0.0, torque_positive_nm = 0.0, torque_negative_nm = 0.0;
  double maxwell_stress_nm = 0.0;
  double airgap_positive_w = 0.0, airgap_negative_w = 0.0;
  double input_w = 0.0, apparent_va = 0.0, copper_w = 0.0, mechanical_w = 0.0;
  double cage_bars_w = 0.0, cage_rings_w = 0.0, cage_forward_w = 0.0, cage_backward_w = 0.0;
  double bar_forward_rms_a = 0.0, bar_backward_rms_a = 0.0;  // the largest bar's
  double b_peak_tesla = 0.0;
  double efficiency_pct() const { return input_w > 0 ? 100.0 * mechanical_w / input_w : 0.0; }
  double power_factor() const { return apparent_va > 0 ? input_w / apparent_va : 0.0; }
  double current_rms_a() const;  // the positive sequence's RMS
};
struct PointContext {
  const MagnetostaticSystem* system = nullptr;
  const HarmonicWinding* winding = nullptr;
  const HarmonicCage* cage = nullptr;  // null without an induced cage
  const std::vector<int>* bar_of_region = nullptr;
  double omega_rad_per_s = 0.0, pole_pairs = 1.0, stack_m = 0.0;
};
// The context of the case `c` on `system` (the pointers are kept, not copied).
PointContext point_context(const Case& c, const MagnetostaticSystem& system,
                           const HarmonicWinding& winding, const HarmonicCage* cage,
                           const std::vector<int>& bar_of_region, double omega_rad_per_s);
HarmonicPoint evaluate_point(const PointContext& context, const SequenceFields& fields,
                             double slip);

}  // namespace gapflux
