#pragma once
// The supply's fundamental as phasors, its sequences (Fortescue) and their time-harmonic fields:
// what the time-harmonic study reports and what time stepping may start from.
#include <Eigen/Core>
#include <complex>

#include "cases/case.hpp"
#include "solver/harmonic_field.hpp"

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

// The positive sequence of `source` at slip s, its effective reluctivity iterated; the negative
// one (when there is one) at slip 2 − s on those reluctivities. `winding.source` is ignored.
struct SequenceFields {
  HarmonicState positive, negative;
  bool has_negative = false;
  Eigen::Vector3cd source_positive, source_negative;
};
SequenceFields solve_sequences(const Assembler& assembler, const RegionModel& model,
                               HarmonicWinding winding, const HarmonicCage* cage,
                               double omega_rad_per_s, double slip, const Eigen::Vector3cd& source);

}  // namespace gapflux
