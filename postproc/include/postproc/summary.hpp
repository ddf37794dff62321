#pragma once
// summary.json: the stable keys of design.md §5 that exist so far, plus extras (the only file
// that sees the JSON library is summary.cpp).
#include <array>
#include <string>
#include <vector>

#include <optional>

#include "geometry/winding_layout.hpp"
#include "postproc/baseline.hpp"
#include "postproc/cage_analysis.hpp"
#include "postproc/power_balance.hpp"
#include "postproc/run_analysis.hpp"
#include "postproc/saturation.hpp"

namespace gapflux {

struct RunSummary {
  std::string case_name;
  // mesh
  std::size_t vertices = 0, triangles = 0, dofs = 0;
  int order = 2;
  double min_angle_deg = 0.0;
  double mesh_scale = 0.0;          // the sizes over the base sizes (geometry/mesh_forecast)
  double mesh_accuracy_pct = 0.0;   // what the demo's convergence study measured there
  std::string mesh_accuracy_basis;  // measured, finer_than_measured, coarser_than_measured
  int sectors = 1;
  bool antiperiodic = false;
  // winding
  int slots = 0, poles = 0, layers = 1, coil_pitch_slots = 0;
  std::vector<WindingFactor> factors;
  double series_turns_per_phase = 0.0;
  std::array<double, 3> phase_axis_deg_el{0, 0, 0};  // magnetic axes of a, b, c
  // supply at the instant solved
  double frequency_hz = 0.0, time_s = 0.0, rotor_angle_deg = 0.0;
  std::array<double, 3> phase_current_a{0, 0, 0};
  // results
  std::array<double, 3> flux_linkage_wb{0, 0, 0};
  double energy_j = 0.0, coenergy_j = 0.0;
  double airgap_radius_m = 0.0;
  double b_peak_tesla = 0.0;
  // time stepping (steps > 1)
  bool time_stepping = false;
  double dt_s = 0.0, mechanical_speed_rpm = 0.0, slip = 0.0;
  int steps_per_period = 0, discarded_steps = 0, band_pitches_per_step = -1;
  bool torque_available = false;
  double torque_mean_nm = 0, torque_min_nm = 0, torque_max_nm = 0, torque_ripple_pct = 0;
  std::vector<std::pair<double, double>> torque_harmonics;  // (order in multiples of f, amplitude)
  double bar_rms_a = 0.0;                                   // imposed rotor currents, 0 if none
  // Time stepping: sequences, waves, locus, attribution; saturation and losses over the last
  // electrical period.
  std::optional<RunAnalysis> analysis;
  std::optional<SaturationMap> saturation;
  bool losses_available = false;
  double iron_stator_w = 0.0, iron_rotor_w = 0.0;
  double copper_w = 0.0, phase_resistance_ohm = 0.0, end_winding_length_m = 0.0;
  double conductor_temperature_c = 0.0;
  bool end_winding_estimated = false;
  std::optional<BaselineComparison> baseline;  // with --baseline
  // The cage with induced currents, and the power balance over the analysis window.
  struct CageInfo {
    CageAnalysis analysis;
    double temperature_c = 0.0, bar_conductivity_s_per_m = 0.0;
    double ring_segment_resistance_ohm = 0.0, ring_segment_inductance_h = 0.0;
    bool ring_resistance_given = false, ring_inductance_given = false;
    double ring_mean_diameter_m = 0.0, ring_area_m2 = 0.0;
  };
  std::optional<CageInfo> cage;
  std::optional<PowerBalance> power;
  // A voltage feed's negative-sequence impedance V2/I2 (phase, fundamental; Ω, angle) and the
  // current unbalance over the voltage unbalance.
  std::optional<std::complex<double>> negative_sequence_impedance_ohm;
  double unbalance_amplification = 0.0;
  double torque_2f_nm = 0.0;
  // Voltage feed: the circuit and the approach to steady state.
  bool voltage_fed = false;
  std::string connection, time_scheme, voltage_basis;
  bool resistance_given = false;
  double end_inductance_h = 0.0;
  bool end_inductance_estimated = false;
  std::optional<SteadyStateIndicator> steady_state;  // time stepping
  std::string supply_form;                           // "phases", "sequence" or "waveform"
  // The fundamental phasors as described (RMS), for the unbalance of a static study; unset for
  // a measured table, which only a time-stepping run analyses.
  std::optional<std::array<Phasor, 3>> described_fundamental;
  bool frequency_detected = false;
  // solver
  int steps = 0, newton_iterations = 0;
  int newton_factorizations = 0;  // of the iterations, those with a new factor
  int cg_iterations = 0;          // on earlier factors
  bool converged = false;
  double wall_s = 0.0;
  double set_up_s = 0.0;  // from the study's start to its first solve (case, mesh, system)
  double mesh_s = 0.0;    // of which the mesh (read from the cache or made)
  bool mesh_from_cache = false;
  // Time stepping: "cold" or "time_harmonic" (study.start), and for the latter the linear solves
  // and seconds its harmonic solution took.
  std::string start;
  int start_harmonic_solves = 0;
  double start_harmonic_s = 0.0;
  // What that time-harmonic solution predicted (fundamental only; winding branch currents' RMS
  // sequences, the bars' forward and backward RMS, the cage's loss), shown beside what the
  // stepping gave.
  struct HarmonicPrediction {
    double slip = 0.0, torque_nm = 0.0;
    double current_positive_a = 0.0, current_negative_a = 0.0;
    double bar_forward_rms_a = 0.0, bar_backward_rms_a = 0.0, cage_w = 0.0;
  };
  std::optional<HarmonicPrediction> start_prediction;
  // study.stop_when_settled: whether it was asked, the period that settled (0: none did), the
  // periods run and the most allowed.
  bool settled_stop = false;
  int settled_at_period = 0, periods_run = 0;
  double periods_allowed = 0.0;
  std::vector<double> residual_history;
  std::vector<double> step_history;  // line-search factor of each Newton step
  std::string failure;               // empty when the run succeeded
};

void write_summary_json(const std::string& path, const RunSummary& s);

}  // namespace gapflux
