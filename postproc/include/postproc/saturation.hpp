#pragma once
// Where the iron saturates over one electrical period: per triangle the peak |B| and the time
// spent above the saturation threshold, and a table of zones — each stator tooth body, its tip
// and the yoke behind it (by tooth index, with the tooth's angle and the phase whose magnetic
// axis is nearest), the rotor teeth, the rotor bridges and tips above the bars, the rotor yoke —
// with their peak |B| and the area fraction above the threshold.
#include <string>
#include <utility>
#include <vector>

#include "geometry/lamination.hpp"
#include "geometry/mesh.hpp"

namespace gapflux {

struct SaturationZone {
  std::string name;
  int tooth = -1;             // stator zones: the tooth index (0-based), else −1
  double angle_deg = 0.0;     // stator zones: mechanical angle of the tooth centre
  std::string nearest_phase;  // stator zones: "a", "b" or "c"
  double area_m2 = 0.0;       // in the model (sector)
  double peak_tesla = 0.0;    // of the zone's triangles' peaks (one triangle may set it)
  double median_tesla = 0.0;  // area-weighted median of the triangles' peaks
  double p95_tesla = 0.0;     // area-weighted 95th percentile: 5 % of the area lies above
  double area_fraction_over = 0.0;
  double threshold_tesla = 0.0;  // 0 when the zone's material is linear
};

struct SaturationMap {
  std::vector<double> peak_tesla;   // per mesh triangle, over the period
  std::vector<double> time_over_s;  // per mesh triangle: time above its threshold in the period
  std::vector<int> zone;            // per mesh triangle: index into zones, −1 off the iron
  std::vector<SaturationZone> zones;
  double peak_tesla_overall = 0.0;
};

// The value below which the fraction q of the total area lies ((value, area) pairs).
double area_percentile(std::vector<std::pair<double, double>> value_area, double q);

// `b_abs_rows`: |B| per mesh triangle for each step of one electrical period (steps × triangles,
// row-major) at step `dt_s`; `threshold_tesla`: per triangle, 0 where the material is linear.
SaturationMap saturation_map(const Mesh& mesh, const Lamination& lamination,
                             const std::vector<double>& b_abs_rows, int steps, double dt_s,
                             const std::vector<double>& threshold_tesla);

}  // namespace gapflux
