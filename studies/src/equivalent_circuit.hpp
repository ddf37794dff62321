#pragma once
// The induction motor's per-phase equivalent circuit (stator R1 + jX1σ, magnetising jXm, rotor
// R2'/s + jX2σ' referred to the stator) extracted from field solutions as a no-load and a
// locked-rotor test extract it from a motor: the no-load impedance (s = 0, no rotor current)
// gives R1 + j(X1σ + Xm); the standstill impedance, with the leakage split X1σ = X2σ' (the usual
// equal split when nothing else is known; from memory), gives X1σ and R2'; at any other slip
// the rotor branch follows from that slip's impedance with X1σ and Xm held. Impedances are per
// winding branch (a star's phase, a delta's branch), positive sequence.
#include <complex>

namespace gapflux {

struct StatorBranches {
  double r1_ohm = 0.0, x1_leakage_ohm = 0.0, xm_ohm = 0.0;
};
struct RotorBranch {
  double r2_ohm = 0.0, x2_leakage_ohm = 0.0;  // referred to the stator, at one slip
};

// Throws std::runtime_error when the impedances admit no such circuit (X1σ not in (0, X0)).
StatorBranches stator_branches(double r1_ohm, std::complex<double> z_no_load_ohm,
                               std::complex<double> z_standstill_ohm);
RotorBranch rotor_branch(const StatorBranches& s, std::complex<double> z_ohm, double slip);
// The branch impedance the circuit gives at `slip` with this rotor branch.
std::complex<double> circuit_impedance(const StatorBranches& s, const RotorBranch& r, double slip);

}  // namespace gapflux
