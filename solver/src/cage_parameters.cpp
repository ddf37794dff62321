#include "solver/cage_parameters.hpp"

#include <fmt/format.h>

#include <cmath>
#include <numbers>

namespace gapflux {
namespace {

constexpr double mm = 1e-3;
constexpr double mu0_h_per_m = 4.0e-7 * std::numbers::pi;
constexpr double ring_permeance_factor = 0.3;

}  // namespace

CageValues cage_values(const Case& c, const Lamination& lam, const RegionMaterials& materials) {
  const RotorSpec& r = c.rotor;
  const EndRingSpec& ring = r.ring;
  const SectorSymmetry& sym = lam.symmetry;
  CageValues v;
  v.temperature_c = r.cage_temperature_c;
  CageParameters& p = v.circuit;
  p.bars_total = lam.bars;
  p.bars = sym.bars_in_sector;
  p.sectors = sym.sectors;
  p.antiperiodic = sym.antiperiodic;
  p.stack_length_m = c.machine.stack_length_m;
  p.conductivity_s_per_m = materials.bars.conductivity_at(r.cage_temperature_c);
  v.ring_conductivity_s_per_m = materials.rings.conductivity_at(r.cage_temperature_c);
  const double bar_area = lam.bar.bar_area_m2;
  v.bar_dc_resistance_ohm = p.stack_length_m / (p.conductivity_s_per_m * bar_area);
  const double top = lam.bar.bar_top_radius_m, bottom = lam.bar.bar_bottom_radius_m;
  const double pole_pairs = c.machine.pole_pairs();
  const double half_angle = std::sin(std::numbers::pi * pole_pairs / lam.bars);

  v.ring_mean_diameter_m = ring.mean_diameter_m > 0.0 ? ring.mean_diameter_m : top + bottom;
  v.ring_radial_height_m = ring.radial_height_m > 0.0 ? ring.radial_height_m : top - bottom;
  const double balanced_area = bar_area / (2.0 * std::abs(half_angle));
  v.ring_axial_width_m =
      ring.axial_width_m > 0.0 ? ring.axial_width_m : balanced_area / v.ring_radial_height_m;
  v.ring_area_m2 = v.ring_radial_height_m * v.ring_axial_width_m;
  const double segment_length = std::numbers::pi * v.ring_mean_diameter_m / lam.bars;

  if (ring.segment_resistance_ohm > 0.0) {
    p.ring_segment_resistance_ohm = ring.segment_resistance_ohm;
    v.resistance_given = true;
  } else {
    // The ring joins the bars' ends: it must reach over them and carry at least a bar's current.
    const double inner = 0.5 * v.ring_mean_diameter_m - 0.5 * v.ring_radial_height_m;
    const double outer = 0.5 * v.ring_mean_diameter_m + 0.5 * v.ring_radial_height_m;
    const double tolerance = 1e-9;
    if (inner > bottom + tolerance || outer < top - tolerance)
      throw c.sources.error(
          ring.mean_diameter_m > 0.0 ? "rotor.ring.mean_diameter_mm"
                                     : "rotor.ring.radial_height_mm",
          fmt::format("the ring (radius {:.2f} to {:.2f} mm) does not reach over the bar ends "
                      "(radius {:.2f} to {:.2f} mm)",
                      inner / mm, outer / mm, bottom / mm, top / mm));
    if (outer > lam.rotor_outer_radius_m + tolerance)
      throw c.sources.error(
          "rotor.ring.radial_height_mm",
          fmt::format("the ring reaches beyond the rotor surface (radius {:.2f} mm > {:.2f} mm)",
                      outer / mm, lam.rotor_outer_radius_m / mm));
    if (v.ring_area_m2 < bar_area)
      throw c.sources.error(
          ring.axial_width_m > 0.0 ? "rotor.ring.axial_width_mm" : "rotor.ring.radial_height_mm",
          fmt::format("the ring's cross-section ({:.1f} mm²) is smaller than the bars it joins "
                      "({:.1f} mm²), though each segment carries about {:.2f} × a bar's current",
                      v.ring_area_m2 / (mm * mm), bar_area / (mm * mm),
                      1.0 / (2.0 * std::abs(half_angle))));
    p.ring_segment_resistance_ohm = segment_length / (v.ring_conductivity_s_per_m * v.ring_area_m2);
  }
  if (ring.segment_inductance_h >= 0.0) {
    p.ring_segment_inductance_h = ring.segment_inductance_h;
    v.inductance_given = true;
  } else {
    p.ring_segment_inductance_h = mu0_h_per_m * ring_permeance_factor * segment_length;
  }
  return v;
}

}  // namespace gapflux
