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
// The rotor current (referred) the circuit draws from the branch voltage `v` (same units out).
std::complex<double> rotor_current(const StatorBranches& s, const RotorBranch& r, double slip,
                                   std::complex<double> v);

// A rotor branch that follows the slip and the rotor current between two extracted ones (rated
// and standstill), for a rotor whose leakage saturates (closed slots' bridges) and whose bars
// displace their current: R2' linear in √s (the deep bar's resistance grows about as the square
// root of the rotor frequency once the bar is deeper than the skin depth; from memory), X2σ' a
// power law in the rotor current, X2σ'(I) = X_rated·(I/I_rated)^−k with k from the two points
// (an interpolation of the leakage's saturation; common practice, no source). Outside the two
// points both are held at the nearer one's value.
struct SaturatingRotor {
  RotorBranch rated, standstill;
  double rated_slip = 0.0, standstill_slip = 1.0;
  double i2_rated = 0.0, i2_standstill = 0.0;  // |rotor current| at the two points
  double exponent = 0.0;                       // k
};
SaturatingRotor saturating_rotor(const StatorBranches& s, const RotorBranch& rated,
                                 double rated_slip, std::complex<double> v_rated,
                                 const RotorBranch& standstill, double standstill_slip,
                                 std::complex<double> v_standstill);
// The branch current the circuit with that rotor draws from `v` at `slip`: X2σ' and the rotor
// current it lets through found together (bisection on X2σ' between the two points' values).
std::complex<double> saturating_circuit_current(const StatorBranches& s, const SaturatingRotor& r,
                                                double slip, std::complex<double> v);

}  // namespace gapflux
