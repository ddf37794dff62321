#pragma once
// The short table `gapflux run` prints after a time-stepping study: unbalance metrics, sequence
// currents, the largest airgap waves with their direction, the field locus and the torque's
// largest harmonics.
#include <cstdio>

#include "postproc/baseline.hpp"
#include "postproc/run_analysis.hpp"
#include "postproc/saturation.hpp"
#include "postproc/summary.hpp"

namespace gapflux {

void print_analysis_table(std::FILE* out, const RunAnalysis& a, double torque_mean_nm,
                          double torque_ripple_pct);

// The zones with the highest peak |B| over the last period.
void print_saturation_table(std::FILE* out, const SaturationMap& s);

// The run against its balanced baseline: losses, torque, the zones and waves that grew.
// The cage's currents and losses and the power balance, when the run has them.
void print_cage_and_power(std::FILE* out, const RunSummary& s);

void print_baseline_table(std::FILE* out, const BaselineComparison& c);

}  // namespace gapflux
