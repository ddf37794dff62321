// Case → tagged pieces of one symmetry sector, with the derived dimensions.
#include "geometry/lamination.hpp"

#include <fmt/format.h>

#include <cmath>
#include <numbers>
#include <numeric>

#include "slot_builders.hpp"

namespace gapflux {
namespace {

constexpr double mm = 1e-3;
constexpr double two_pi = 2.0 * std::numbers::pi;

// Priority: pieces inside the iron (coils, openings, bars) win over the iron they overlap.
constexpr int iron_priority = 10;
constexpr int inner_priority = 50;

// Iron ring (or disk when r_inner is 0) for the sector, as a piece.
Piece ring_piece(RegionTag tag, double r_inner, double r_outer, const SectorSymmetry& sym) {
  Piece p;
  p.tag = tag;
  p.priority = iron_priority;
  if (sym.sectors > 1) {
    p.outer = annular_sector(r_inner, r_outer, 0.0, sym.sector_angle_rad);
  } else {
    p.outer = circle(Vec2::Zero(), r_outer);
    if (r_inner > 0.0) p.holes.push_back(circle(Vec2::Zero(), r_inner));
  }
  return p;
}

}  // namespace

SectorSymmetry choose_symmetry(int slots, int bars, int poles, bool force_full) {
  SectorSymmetry s;
  s.sectors = force_full ? 1 : std::gcd(std::gcd(slots, poles), bars > 0 ? bars : poles);
  s.sector_angle_rad = two_pi / s.sectors;
  // The sector spans poles/sectors pole pitches; each pole pitch flips the sign of A.
  s.antiperiodic = ((poles / s.sectors) % 2) == 1;
  s.slots_in_sector = slots / s.sectors;
  s.bars_in_sector = bars / s.sectors;
  return s;
}

SectorSymmetry choose_symmetry(int slots, int bars, int poles, bool force_full,
                               const WindingLayout& winding) {
  const SectorSymmetry widest = choose_symmetry(slots, bars, poles, force_full);
  for (int n = widest.sectors; n > 1; --n) {
    if (widest.sectors % n != 0) continue;
    SectorSymmetry s = widest;
    s.sectors = n;
    s.sector_angle_rad = two_pi / n;
    s.antiperiodic = ((poles / n) % 2) == 1;
    s.slots_in_sector = slots / n;
    s.bars_in_sector = bars / n;
    if (winding.repeats(s.slots_in_sector, s.antiperiodic)) return s;
  }
  return choose_symmetry(slots, bars, poles, true);
}

int stator_tooth_at(double theta_rad, int slots) {
  const double pitch = two_pi / slots;
  const long k = std::lround(theta_rad / pitch);
  return static_cast<int>(((k % slots) + slots) % slots);
}

bool is_rotor_side(RegionKind kind) {
  switch (kind) {
    case RegionKind::airgap_rotor:
    case RegionKind::rotor_iron:
    case RegionKind::bar:
    case RegionKind::bar_opening:
    case RegionKind::shaft:
      return true;
    default:
      return false;
  }
}

const char* to_string(RegionKind kind) {
  switch (kind) {
    case RegionKind::stator_iron:
      return "stator_iron";
    case RegionKind::coil_side:
      return "coil_side";
    case RegionKind::slot_opening:
      return "slot_opening";
    case RegionKind::airgap_stator:
      return "airgap_stator_side";
    case RegionKind::moving_band:
      return "moving_band";
    case RegionKind::airgap_rotor:
      return "airgap_rotor_side";
    case RegionKind::rotor_iron:
      return "rotor_iron";
    case RegionKind::bar:
      return "bar";
    case RegionKind::bar_opening:
      return "bar_opening";
    case RegionKind::shaft:
      return "shaft";
  }
  return "?";
}

std::string region_name(const RegionTag& tag) {
  switch (tag.kind) {
    case RegionKind::coil_side:
      if (tag.layer < 0) return fmt::format("coil_s{:02d}", tag.index + 1);
      return fmt::format("coil_s{:02d}_{}", tag.index + 1, tag.layer == 0 ? "top" : "bottom");
    case RegionKind::slot_opening:
      return fmt::format("slot_opening_s{:02d}", tag.index + 1);
    case RegionKind::bar:
      return fmt::format("bar_r{:02d}", tag.index + 1);
    case RegionKind::bar_opening:
      return fmt::format("bar_opening_r{:02d}", tag.index + 1);
    default:
      return to_string(tag.kind);
  }
}

Lamination build_lamination(const Case& c) {
  const auto& src = c.sources;
  Lamination lam;
  lam.stator_outer_radius_m = 0.5 * c.stator.outer_diameter_m;
  lam.bore_radius_m = 0.5 * c.stator.bore_diameter_m;
  lam.rotor_outer_radius_m = 0.5 * c.rotor.outer_diameter_m;
  lam.shaft_radius_m = 0.5 * c.rotor.shaft_diameter_m;
  lam.slots = c.stator.slots;
  lam.bars = c.rotor.kind == RotorKind::cage ? c.rotor.bars : 0;
  lam.poles = c.machine.poles;
  lam.layers = c.winding.layers;

  const double gap = lam.bore_radius_m - lam.rotor_outer_radius_m;
  if (gap <= 0.0)
    throw src.error("rotor.outer_diameter_mm",
                    fmt::format("the rotor ({:.3f} mm) must be smaller than the stator bore "
                                "({:.3f} mm)",
                                c.rotor.outer_diameter_m / mm, c.stator.bore_diameter_m / mm));
  if (gap < 0.01 * mm)
    throw src.error(
        "rotor.outer_diameter_mm",
        fmt::format("the airgap ({:.4f} mm) is below 0.01 mm; no motor is built so", gap / mm));
  // The gap in thirds: stator-side air, the moving band, rotor-side air.
  lam.band_inner_radius_m = lam.rotor_outer_radius_m + gap / 3.0;
  lam.band_outer_radius_m = lam.rotor_outer_radius_m + 2.0 * gap / 3.0;

  lam.winding = build_winding_layout(c);
  lam.symmetry = choose_symmetry(lam.slots, lam.bars, lam.poles, c.mesh.symmetry == Symmetry::full,
                                 lam.winding);
  const SectorSymmetry& sym = lam.symmetry;

  // Stator: iron ring, then each slot of the sector rotated into place.
  const SlotShapes slot = build_stator_slot(c);
  lam.slot = slot.dims;
  lam.pieces.push_back(
      ring_piece({RegionKind::stator_iron}, lam.bore_radius_m, lam.stator_outer_radius_m, sym));
  for (int k = 0; k < sym.slots_in_sector; ++k) {
    const double angle = (k + 0.5) * two_pi / lam.slots;
    if (!slot.opening.empty())
      lam.pieces.push_back(
          {{RegionKind::slot_opening, k}, inner_priority, rotated(slot.opening, angle), {}});
    for (std::size_t layer = 0; layer < slot.coil_sides.size(); ++layer) {
      const int layer_id = slot.coil_sides.size() == 1 ? -1 : static_cast<int>(layer);
      lam.pieces.push_back({{RegionKind::coil_side, k, layer_id},
                            inner_priority,
                            rotated(slot.coil_sides[layer], angle),
                            {}});
    }
  }
  lam.pieces.push_back(
      ring_piece({RegionKind::airgap_stator}, lam.band_outer_radius_m, lam.bore_radius_m, sym));

  // Rotor, in its own frame.
  lam.pieces.push_back(ring_piece({RegionKind::airgap_rotor}, lam.rotor_outer_radius_m,
                                  lam.band_inner_radius_m, sym));
  lam.pieces.push_back(
      ring_piece({RegionKind::rotor_iron}, lam.shaft_radius_m, lam.rotor_outer_radius_m, sym));
  if (lam.bars > 0) {
    const BarShapes bar = build_rotor_bar(c);
    lam.bar = bar.dims;
    for (int j = 0; j < sym.bars_in_sector; ++j) {
      const double angle = (j + 0.5) * two_pi / lam.bars;
      lam.pieces.push_back({{RegionKind::bar, j}, inner_priority, rotated(bar.bar, angle), {}});
      if (!bar.opening.empty())
        lam.pieces.push_back(
            {{RegionKind::bar_opening, j}, inner_priority, rotated(bar.opening, angle), {}});
    }
  }
  if (lam.shaft_radius_m > 0.0)
    lam.pieces.push_back(ring_piece({RegionKind::shaft}, 0.0, lam.shaft_radius_m, sym));
  return lam;
}

}  // namespace gapflux
