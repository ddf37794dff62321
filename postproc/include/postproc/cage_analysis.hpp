#pragma once
// What the cage did over the analysis window, from the recorded steps: the bar and ring
// currents, the waves they form in the rotor frame — the forward field's at slip frequency s·f
// and the backward (negative-sequence) field's at (2 − s)·f — and the cage loss with the shares
// of the two (design.md §2b).
//   Bar k sits at θ'_k = (k + ½)·2π/R in the rotor frame. The forward wave is
//   i_k = Re{F·e^{j(sωt − pθ'_k)}}, the backward one Re{B·e^{j((2 − s)ωt + pθ'_k)}}; both are
//   fitted to all bars and steps of the window by least squares. The loss shares come from the
//   same two frequencies fitted to each bar triangle's current density over the window,
//   P = Σ_e S_e·|Ĵ_e|²/(2σ)·ℓ·sectors, and to each ring segment's current, 2·R_seg·|Î|²/2 per
//   segment and sector; what remains of the cage loss (slot harmonics, what is left of the start,
//   the centroid's difference from the quadrature) is reported as the rest.
#include <vector>

namespace gapflux {

struct CageRecord {
  double slip = 0.0, frequency_hz = 50.0;
  int pole_pairs = 1, bars_total = 1, sectors = 1;
  double conductivity_s_per_m = 0.0, stack_length_m = 0.0, ring_segment_resistance_ohm = 0.0;
  std::vector<double> time_s;                       // the window's steps
  std::vector<std::vector<double>> bar_current_a;   // per step: each bar of the sector
  std::vector<std::vector<double>> ring_current_a;  // per step: each segment of the sector
  std::vector<std::vector<double>> loss_w;          // per step: bars, rings (whole machine)
  std::vector<std::vector<double>> bar_density;     // per step: each bar triangle's J (A/m²)
  std::vector<double> bar_triangle_area_m2;
};

struct CageAnalysis {
  double bar_rms_a = 0.0;   // RMS over the window and the sector's bars
  double ring_rms_a = 0.0;  // over the segments
  double ring_to_bar = 0.0, ring_to_bar_balanced = 0.0;  // the latter 1/(2·sin(πp/R))
  double forward_hz = 0.0, backward_hz = 0.0;
  double forward_bar_rms_a = 0.0, backward_bar_rms_a = 0.0;
  double loss_bars_w = 0.0, loss_rings_w = 0.0, loss_w = 0.0;
  double loss_forward_w = 0.0, loss_backward_w = 0.0, loss_rest_w = 0.0;
};

CageAnalysis analyse_cage(const CageRecord& record);

}  // namespace gapflux
