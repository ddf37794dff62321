#pragma once
// What a time-stepping run's supply did, from its recorded steps: sequence content of the phase
// currents, flux linkages and EMFs per time harmonic; the current set's unbalance metrics; the
// airgap's space harmonics per step and averaged; its space–time waves with direction; the
// field locus; and the torque harmonics with their likely sources. Everything is computed over
// the last whole electrical periods of the retained steps (the analysis window).
#include <array>
#include <complex>
#include <string>
#include <vector>

#include "postproc/airgap_waves.hpp"
#include "postproc/harmonic_labels.hpp"
#include "postproc/results_file.hpp"
#include "postproc/sequences.hpp"

namespace gapflux {

struct RunRecord {
  double frequency_hz = 50.0;
  int steps_per_period = 0;
  int periods = 0;             // whole periods in the analysis window
  int first_step = 0;          // first step of the window
  std::vector<double> time_s;  // every finished step
  std::array<std::vector<double>, 3> current_a, flux_linkage_wb;  // every finished step
  AirgapRecord airgap;  // B_r, full circle, every finished step
  AirgapRecord force;   // σ_r = (B_r² − B_θ²)/(2μ0), full circle, every finished step
  std::vector<double> torque_nm;
  MachineOrders orders;
  // A voltage feed: the source's phase and line-to-line voltages, the line currents and the
  // voltage across each winding branch, every finished step (empty for a current feed).
  bool voltage_fed = false;
  std::array<std::vector<double>, 3> supply_voltage_v, line_voltage_v, line_current_a,
      winding_voltage_v;
  // An induced cage: the bar currents' wave of the pole-pair order in the stator's frame,
  // (2/N)·Σ_k i_k·e^{−jpθ_k} over the bars at their angles, every finished step (else empty).
  std::vector<std::complex<double>> cage_wave_a;
};

// The approach to periodic steady state: per whole electrical period from the first step, the
// largest change of a phase's fundamental flux-linkage phasor from the period before, and the
// largest DC part of a phase's flux linkage (what a start-up transient leaves, decaying with
// L/R), both in % of the largest fundamental amplitude; the change of the mean torque from the
// period before in % of the period's RMS torque; with a cage, the change of the magnitudes of its
// current wave's forward and backward parts (the wave turns at ±ω in the stator's frame, so a
// period's mean of wave·e^{∓jωt} settles even when the bars' own currents, at slip frequency, do
// not repeat each period) in % of the larger. Reached when every one of them is below the
// tolerance in the last period.
struct SteadyStateIndicator {
  std::vector<double> change_pct;         // one per period after the first
  std::vector<double> dc_pct;             // one per period
  std::vector<double> torque_change_pct;  // one per period after the first
  std::vector<double> cage_change_pct;    // one per period after the first; empty without a cage
  double tolerance_pct = 0.0;
  bool reached = false;
  // The last period's largest measure (the one the tolerance is held against).
  double last_worst_pct() const;
};
SteadyStateIndicator steady_state_indicator(const RunRecord& record, double tolerance_pct);

struct SpaceHarmonic {
  int order_mech = 0;
  double order_el = 0.0;
  double amplitude_tesla = 0.0;  // mean over the window
  std::string label;
};

struct LabelledWave {
  Wave wave;
  std::string label;
};

// A radial force (pressure) wave σ·cos(mode·θ − h·ω·t − φ) on the stator bore.
struct ForceWave {
  int mode = 0;  // circumferential order, mechanical
  double time_order = 0.0;
  double frequency_hz = 0.0;
  int direction = 0;  // +1 forward, −1 backward, 0 static or pulsating
  double amplitude_n_per_m2 = 0.0;
  bool low_mode = false;  // modes 0–4: the stator yoke's stiffness is lowest for these
};

struct RunAnalysis {
  int periods = 0;
  double window_start_s = 0.0;
  std::vector<HarmonicPhasors> current, flux_linkage, emf;
  UnbalanceMetrics current_unbalance;  // on the fundamental current phasors
  // A voltage feed: sequence content of the supply's phase and line voltages, of the line
  // currents and of the winding-branch voltages; unbalance of the supply voltages and of the
  // line currents.
  std::vector<HarmonicPhasors> supply_voltage, line_voltage, line_current, winding_voltage;
  UnbalanceMetrics voltage_unbalance, line_current_unbalance;
  std::vector<double> space_amplitude_tesla;  // steps × orders (every finished step)
  int space_orders = 0;
  std::vector<SpaceHarmonic> space_harmonics;  // above 0.2 % of the fundamental, by order
  std::vector<LabelledWave> waves;             // above 1e-4 of the largest, largest first
  FieldLocus locus;
  std::vector<std::complex<double>> fundamental_path;  // space-fundamental phasor per window step
  std::vector<TorqueHarmonic> torque_harmonics;        // largest first
  std::vector<ForceWave> force_waves;                  // above 1e-4 of the largest, largest first
  std::string note;                                    // why parts are missing, if they are
};

RunAnalysis analyse_run(const RunRecord& record);

// Writes the analysis/ group of results.h5 (docs/results.md).
void write_analysis(ResultsFile& file, const RunAnalysis& a);

}  // namespace gapflux
