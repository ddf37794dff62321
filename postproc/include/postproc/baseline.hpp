#pragma once
// The run compared with the same motor on a balanced, harmonic-free supply of the same
// positive-sequence fundamental: peak |B| per zone, losses, torque, and the airgap waves the
// disturbance adds.
#include <string>
#include <vector>

#include "postproc/airgap_waves.hpp"

namespace gapflux {

struct ZoneChange {
  std::string name;
  double peak_tesla = 0.0, baseline_peak_tesla = 0.0;
};

struct AddedWave {
  Wave wave;
  std::string label;
  double baseline_amplitude_tesla = 0.0;
};

struct BaselineComparison {
  std::string baseline_dir;
  // The baseline's set (phase a): RMS current, or RMS phase voltage for a voltage feed.
  double fundamental_rms = 0.0, fundamental_angle_deg = 0.0;
  bool voltage_fed = false;
  double iron_w = 0, baseline_iron_w = 0, copper_w = 0, baseline_copper_w = 0;
  // With an induced cage: its loss (and the backward field's share), and the efficiency.
  bool cage = false;
  double cage_w = 0, baseline_cage_w = 0, cage_backward_w = 0;
  double efficiency_pct = 0, baseline_efficiency_pct = 0;
  double torque_mean_nm = 0, baseline_torque_mean_nm = 0;
  double ripple_pct = 0, baseline_ripple_pct = 0;
  std::vector<ZoneChange> zones;       // every zone, largest increase first
  std::vector<AddedWave> added_waves;  // largest increases first, at most 10
  double total_w() const { return iron_w + copper_w + cage_w; }
  double baseline_total_w() const { return baseline_iron_w + baseline_copper_w + baseline_cage_w; }
};

struct RunSummary;
BaselineComparison compare_with_baseline(const RunSummary& run, const RunSummary& baseline);

}  // namespace gapflux
