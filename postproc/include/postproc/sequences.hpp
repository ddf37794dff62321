#pragma once
// Symmetrical components (Fortescue 1918) and the supply unbalance metrics of design.md §4, and
// the time-harmonic phasors of three-phase series sampled over whole periods.
// Phasors are RMS, with the angle of the cosine referred to t = 0: x(t) = √2·|X|·cos(hωt + ∠X).
#include <array>
#include <complex>
#include <vector>

namespace gapflux {

using Phasor = std::complex<double>;

struct SequenceSet {
  Phasor zero, positive, negative;
};

// [X0, X1, X2] = (1/3)·[[1,1,1],[1,α,α²],[1,α²,α]]·[Xa, Xb, Xc], α = e^{j2π/3}.
SequenceSet fortescue(const std::array<Phasor, 3>& abc);

// All in %: VUF = |X2|/|X1| (IEC); LVUR = max deviation of the phase-to-phase magnitudes
// |Xa − Xb|, |Xb − Xc|, |Xc − Xa| from their mean, over the mean (NEMA MG-1, from memory);
// PVUR = the same on the phase magnitudes (IEEE, from memory).
struct UnbalanceMetrics {
  double vuf_pct = 0.0, lvur_pct = 0.0, pvur_pct = 0.0;
};
UnbalanceMetrics unbalance_metrics(const std::array<Phasor, 3>& abc);

struct HarmonicPhasors {
  double order = 1.0;  // multiples of the fundamental
  std::array<Phasor, 3> abc;
  SequenceSet sequences;
};

// `series[k]` holds phase k at t_n = t0 + n·T/steps_per_period over `periods` whole periods.
// Orders are k/periods for DFT bin k; every order whose largest phase exceeds
// `floor_fraction` × the largest fundamental is kept, the fundamental always.
std::vector<HarmonicPhasors> three_phase_harmonics(const std::array<std::vector<double>, 3>& series,
                                                   int periods, double t0_s, double frequency_hz,
                                                   double floor_fraction);

// The entry of `order` (within 1e-9), or nullptr.
const HarmonicPhasors* find_order(const std::vector<HarmonicPhasors>& harmonics, double order);

}  // namespace gapflux
