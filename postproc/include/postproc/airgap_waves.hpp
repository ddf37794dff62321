#pragma once
// The airgap field as waves: space harmonics of B_r(θ) per step, the space–time waves of
// B_r(θ, t) from a 2-D DFT over whole electrical periods, and the locus of the space
// fundamental. A wave B·cos(m·θ − h·ω·t − φ) (mechanical order m ≥ 0, time order h) turns
// forward (counter-clockwise, with the positive-sequence field) when m·h > 0 (design.md §4).
#include <complex>
#include <vector>

namespace gapflux {

// A quantity on the full airgap circle at θ_j = theta0 + j·2π/samples, one row per step: B_r
// (T) for the field's waves, σ_r (N/m²) for the force waves.
struct AirgapRecord {
  double theta0_rad = 0.0;
  int samples = 0;
  int steps = 0;
  std::vector<double> values;  // steps × samples, row-major, in the quantity's unit
};

// Sector samples → the full circle: B(θ + k·θ_s) = (±1)^k·B(θ), − for antiperiodic models.
std::vector<double> full_circle(const std::vector<double>& sector, int sectors, bool antiperiodic);

// Amplitude of each mechanical order 0 … samples/2 − 1 of one full-circle row.
std::vector<double> space_amplitudes(const double* row, int samples);

struct Wave {
  int space_order_mech = 0;
  double space_order_el = 0.0;  // m / p
  double time_order = 0.0;      // |h|, multiples of the supply frequency
  int direction = 0;            // +1 forward, −1 backward, 0 static (h = 0) or pulsating (m = 0)
  double amplitude = 0.0;       // in the record's unit (T for B_r, N/m² for σ_r)
  double phase_rad = 0.0;       // φ in B·cos(m·θ − h·ω·t − φ), h signed, t from 0
  double signed_time_order() const { return direction < 0 ? -time_order : time_order; }
};

// `record` holds exactly `periods` electrical periods of steps starting at t0_s. Waves whose
// amplitude exceeds floor_fraction × the largest are returned, largest first.
std::vector<Wave> space_time_waves(const AirgapRecord& record, int periods, double t0_s,
                                   double frequency_hz, int pole_pairs, double floor_fraction);

// The wave of (mechanical order, signed time order), or nullptr.
const Wave* find_wave(const std::vector<Wave>& waves, int order_mech, double signed_time_order);

// The space-fundamental phasor per step: (2/N)·Σ_j B_r(θ_j)·e^{−j·p·θ_j}. Its path over a period
// is the field's locus.
std::vector<std::complex<double>> space_fundamental(const AirgapRecord& record, int pole_pairs);

// From the forward and backward fundamental waves B_f, B_b: semi-axes B_f + B_b and
// |B_f − B_b|, axis ratio minor/major (1: circular), and the electrical angle of the major axis.
struct FieldLocus {
  double forward_tesla = 0.0, backward_tesla = 0.0;
  double major_tesla = 0.0, minor_tesla = 0.0, axis_ratio = 1.0;
  double major_axis_deg_el = 0.0;  // in [0, 180)
};
FieldLocus field_locus(const std::vector<Wave>& waves, int pole_pairs);

}  // namespace gapflux
