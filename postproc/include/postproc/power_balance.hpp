#pragma once
// Where the power goes over the analysis window (design.md §2b): stator input Σ_k ⟨v_k·i_k⟩ (the
// winding branches' voltages and currents), stator copper, cage loss, air-gap power
// T·Ω_sync and mechanical power T·Ω_rotor; the FE iron is lossless, so iron loss (a
// post-processed estimate) enters only the efficiency η = P_mech/(P_in + P_iron), the
// summation-of-losses idea of IEC 60034-2-1 (from memory) without friction, windage or stray
// load loss. Two power factors: the arithmetic P_in/Σ_k V_k·I_k (RMS per branch) and the
// positive-sequence displacement factor cos(∠V1 − ∠I1).
#include <array>
#include <optional>
#include <vector>

#include "postproc/run_analysis.hpp"

namespace gapflux {

struct PowerRecord {
  double frequency_hz = 50.0;
  int pole_pairs = 1;
  double mechanical_speed_rad_s = 0.0;
  std::vector<double> torque_nm;                        // window steps
  std::array<std::vector<double>, 3> branch_current_a;  // window steps
  std::array<std::vector<double>, 3> branch_voltage_v;  // window steps: R·i + dΛ/dt
  double copper_w = 0.0, cage_w = 0.0, iron_w = 0.0;
  // B_r and B_θ on the mid-band circle over the whole circumference, each window step (steps ×
  // samples): the share of the torque that the fundamental's space order p carries.
  std::vector<std::vector<double>> airgap_b_r, airgap_b_theta;
};

struct PowerBalance {
  double slip = 0.0;
  double input_w = 0.0, copper_w = 0.0, cage_w = 0.0, airgap_w = 0.0, mechanical_w = 0.0;
  double iron_w = 0.0;
  double balance_residual_pct = 0.0;  // (P_in − P_cu − P_cage − P_mech)/P_in
  double efficiency_pct = 0.0;
  double power_factor = 0.0;         // arithmetic
  double displacement_factor = 0.0;  // positive sequence
  double slip_times_airgap_w = 0.0;  // s·P_ag
  // The fundamental's part: the torque of space order p alone (the Maxwell stress B_r·B_θ
  // summed order by order, ∫ B_r·B_θ dθ = π·Σ_ν Re{b_r,ν·b*_θ,ν}, its share of the total
  // applied to the Arkkio torque), its air-gap power and s times that — the cage loss the
  // fundamental forward field causes. The rest of the torque comes from space harmonics turning
  // at their own speeds.
  double fundamental_torque_nm = 0.0, fundamental_airgap_w = 0.0, slip_times_fundamental_w = 0.0;
};

// `analysis` supplies the fundamental phasors (winding voltage and current) for the
// displacement factor; `branch_voltage_phasors` the winding-branch voltage harmonics.
PowerBalance power_balance(const PowerRecord& record,
                           const std::vector<HarmonicPhasors>& branch_voltage_phasors,
                           const std::vector<HarmonicPhasors>& branch_current_phasors);

}  // namespace gapflux
