#include "postproc/baseline.hpp"

#include "postproc/summary.hpp"

#include <algorithm>
#include <cmath>
#include <map>

namespace gapflux {

BaselineComparison compare_with_baseline(const RunSummary& run, const RunSummary& base) {
  BaselineComparison c;
  c.iron_w = run.iron_stator_w + run.iron_rotor_w;
  c.baseline_iron_w = base.iron_stator_w + base.iron_rotor_w;
  c.copper_w = run.copper_w;
  c.baseline_copper_w = base.copper_w;
  c.torque_mean_nm = run.torque_mean_nm;
  c.baseline_torque_mean_nm = base.torque_mean_nm;
  if (run.cage && base.cage) {
    c.cage = true;
    c.cage_w = run.cage->analysis.loss_w;
    c.baseline_cage_w = base.cage->analysis.loss_w;
    c.cage_backward_w = run.cage->analysis.loss_backward_w;
  }
  if (run.power && base.power) {
    c.efficiency_pct = run.power->efficiency_pct;
    c.baseline_efficiency_pct = base.power->efficiency_pct;
  }
  c.ripple_pct = run.torque_ripple_pct;
  c.baseline_ripple_pct = base.torque_ripple_pct;
  if (run.saturation && base.saturation) {
    std::map<std::string, double> base_peak;
    for (const SaturationZone& z : base.saturation->zones) base_peak[z.name] = z.peak_tesla;
    for (const SaturationZone& z : run.saturation->zones)
      c.zones.push_back({z.name, z.peak_tesla, base_peak.count(z.name) ? base_peak[z.name] : 0.0});
    std::stable_sort(c.zones.begin(), c.zones.end(), [](const auto& a, const auto& b) {
      return a.peak_tesla - a.baseline_peak_tesla > b.peak_tesla - b.baseline_peak_tesla;
    });
  }
  if (run.analysis && base.analysis) {
    std::vector<Wave> base_waves;
    for (const LabelledWave& x : base.analysis->waves) base_waves.push_back(x.wave);
    for (const LabelledWave& w : run.analysis->waves) {
      const Wave* b = find_wave(base_waves, w.wave.space_order_mech, w.wave.signed_time_order());
      c.added_waves.push_back({w.wave, w.label, b ? b->amplitude : 0.0});
    }
    std::stable_sort(c.added_waves.begin(), c.added_waves.end(), [](const auto& a, const auto& b) {
      return a.wave.amplitude - a.baseline_amplitude_tesla >
             b.wave.amplitude - b.baseline_amplitude_tesla;
    });
    if (c.added_waves.size() > 10) c.added_waves.resize(10);
  }
  return c;
}

}  // namespace gapflux
