#pragma once
// The field at one frequency with the rotor held at one position (design.md §2: phasors
// X(t) = Re{X̂·e^{jωt}}, amplitudes, not RMS). The classical slip transformation brings the cage,
// which meets the forward field at s·ω in its own frame, into the stator's frame at ω: its eddy
// term and its rings' reactance take s·ω. Iron enters through an effective reluctivity per
// element (Material::effective_reluctivity of the peak of the element's rotating or alternating
// flux density), updated from the solution until it settles.
//
// With n field unknowns x̂, the sector's bar voltages û and the winding's branch currents î:
//   (K(ν_eff) + jωsσ·M)·x̂ − (σ/ℓ)·C·û = C_w·î            field (cage_circuit.hpp's conventions)
//   P·û = jωsσ·Cᵀx̂,  P = G + D·Dᵀ/(2·Z_r),  Z_r = R_r + jωs·L_r                   cage
//   Tᵀê = Tᵀ·(R + jωL_end)·T·î_l + jω·k·Tᵀ·C_wᵀ·x̂,  î = T·î_l,  k = ℓ·sectors    voltage feed
// The sparse part is complex symmetric (not Hermitian, so not for CHOLMOD): UMFPACK factorises
// it. The bar voltages and loop currents are then solved on small dense systems built from the
// factor's responses to C's and C_w's columns, which also holds at s = 0 (no induced current).
#include <Eigen/Core>
#include <complex>
#include <memory>
#include <vector>

#include "cases/case.hpp"
#include "solver/assembly.hpp"
#include "solver/cage_circuit.hpp"
#include "solver/circuit.hpp"

namespace gapflux {

using Complex = std::complex<double>;

class SparseLu;

// A0 = K(ν) + jωs·σ·M over `assembler`'s elements (ν per element, σ per region from the
// model's eddy_s_per_m), factorised: the field's response to loads, circuits left open.
class HarmonicOperator {
 public:
  HarmonicOperator(const Assembler& assembler, const RegionModel& model);
  ~HarmonicOperator();
  HarmonicOperator(const HarmonicOperator&) = delete;
  HarmonicOperator& operator=(const HarmonicOperator&) = delete;
  // Assembles and factorises for these reluctivities and ω·s (the pattern's analysis is kept).
  // Throws NumericalError when the matrix is singular.
  void factorize(const std::vector<double>& reluctivity, double omega_slip);
  Eigen::MatrixXcd solve(const Eigen::MatrixXcd& load) const;

 private:
  const Assembler& assembler_;
  const RegionModel& model_;
  std::unique_ptr<SparseLu> lu_;
};

struct HarmonicWinding {
  Eigen::MatrixXd coupling;  // n × 3, coil_coupling(): the load per ampere in each branch
  Connection connection = Connection::star;
  BranchImpedance impedance;   // R and end-winding L per branch (voltage feed)
  double linkage_scale = 0.0;  // ψ = scale·C_wᵀx: stack length × sectors
  bool voltage_fed = false;
  // Complex amplitudes: the branch source voltages (V) when voltage-fed, else the branch
  // currents (A).
  Eigen::Vector3cd source = Eigen::Vector3cd::Zero();
};

struct HarmonicCage {
  CageParameters parameters;
  Eigen::MatrixXd coupling;  // n × bars, bar_coupling()
  std::vector<double> bar_area_m2;
};

struct HarmonicSettings {
  int max_iterations = 60;
  // Settled when an iteration changes the field by less than this (‖Δx̂‖/‖x̂‖).
  double field_tolerance = 1e-4;
  // Each iteration moves the flux density the reluctivities are taken at this fraction of the
  // way towards the new solution's peak |B|.
  double relaxation = 0.5;
  // The peak |B| per element the first reluctivities are taken at (a neighbouring solution's, to
  // start near it); empty: 1 T everywhere.
  std::vector<double> initial_b_peak_tesla;
};

struct HarmonicState {
  Eigen::VectorXcd x;                 // the field's DOFs (Wb/m)
  Eigen::Vector3cd branch_current_a;  // winding branches
  Eigen::Vector3cd branch_voltage_v;  // across each branch: (R + jωL_end)·î + jω·ψ̂
  Eigen::Vector3cd flux_linkage_wb;   // ψ̂ from the field
  Eigen::VectorXcd bar_current_a;     // per bar of the sector, rotor frame at s·ω
  Eigen::VectorXcd bar_voltage_v;     // û
  Eigen::VectorXcd ring_current_a;    // per segment, front ring from bar k to bar k+1
  std::vector<double> reluctivity;    // ν_eff per assembler element (m/H)
  std::vector<double> b_peak_tesla;   // the peak of |B(t)| at each element's centroid
  int iterations = 0;                 // linear solves made
  bool converged = false;
  double reluctivity_change = 0.0;  // largest |Δ ln ν_eff| the last solution asks for
  double field_change = 0.0;        // ‖Δx̂‖/‖x̂‖ of the last iteration
  double omega_rad_per_s = 0.0, slip = 0.0;
};

// Solves for the winding's source at frequency ω and slip s. `model` gives the material and σ
// (eddy_s_per_m, bars only) per region; the sources in it are ignored (the winding's enter
// through `winding`). With `fixed_reluctivity` (one value per element, e.g. another sequence's
// state) the solve is linear and is made once. Throws NumericalError when the factorisation
// fails.
HarmonicState solve_harmonic(const Assembler& assembler, const RegionModel& model,
                             const HarmonicWinding& winding, const HarmonicCage* cage,
                             double omega_rad_per_s, double slip, const HarmonicSettings& settings,
                             const std::vector<double>* fixed_reluctivity = nullptr);

// The peak over a period of |Re{B̂·e^{jωt}}| for a complex flux density B̂ = (B̂x, B̂y): the
// major semi-axis of the ellipse B(t) traces.
double ellipse_peak(const Eigen::Vector2cd& b);

// Mean torque over a period (N·m, whole machine, counter-clockwise): Arkkio's integral is
// bilinear in the field, so its mean for x(t) = Re{x̂·e^{jωt}} is ½·(T(Re x̂) + T(Im x̂)) — done
// by the caller with arkkio_torque_nm; here the same for the cage's Joule loss (W, whole
// machine): bars ½·∫|Ĵ|²/σ dS·ℓ, rings ½·2·R_seg·Σ|î_r|².
struct HarmonicCageLoss {
  double bars_w = 0.0, rings_w = 0.0;
  std::vector<double>
      bar_current_density_amplitude;  // |Ĵ| per assembler element (A/m²), 0 off bars
};
HarmonicCageLoss harmonic_cage_loss(const Assembler& assembler,
                                    const std::vector<int>& bar_of_region, const HarmonicCage& cage,
                                    const HarmonicState& state);

}  // namespace gapflux
