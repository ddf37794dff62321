#pragma once
// The parametric lamination: a case's stator and rotor turned into tagged 2-D pieces (outlines in
// metres) for one symmetry sector, plus the derived quantities an engineer checks first.
// Stator pieces are in the stator frame; rotor pieces in the rotor frame at rotor angle 0.
// Slot k (0-based) is centred at angle (k + ½)·2π/Q, so teeth are centred at k·2π/Q and the
// sector boundaries cut through tooth centres; bar j is centred at (j + ½)·2π/R.
#include <string>
#include <vector>

#include "cases/case.hpp"
#include "geometry/outline.hpp"
#include "geometry/winding_layout.hpp"

namespace gapflux {

enum class RegionKind {
  stator_iron,
  coil_side,
  slot_opening,
  airgap_stator,
  moving_band,
  airgap_rotor,
  rotor_iron,
  bar,
  bar_opening,
  shaft,
};

struct RegionTag {
  RegionKind kind = RegionKind::stator_iron;
  int index = -1;  // slot or bar number (0-based) for coil sides, openings, bars
  int layer = -1;  // coil sides: 0 = top (airgap side), 1 = bottom; −1 for single layer
  bool operator==(const RegionTag&) const = default;
};

std::string region_name(const RegionTag& tag);
bool is_rotor_side(RegionKind kind);
const char* to_string(RegionKind kind);

// One piece of the lamination. Pieces do not overlap, except that coil sides, openings and bars
// lie inside the iron pieces and win (higher priority) where they overlap.
struct Piece {
  RegionTag tag;
  int priority = 0;
  Outline outer;
  std::vector<Outline> holes;  // full-circle models only
};

// Which part of the machine a sector model holds and how the field continues past its edges:
// A(r, θ + sector_angle) = (−1)^antiperiodic · A(r, θ).
struct SectorSymmetry {
  int sectors = 1;  // sectors in the full machine; 1 = full model
  double sector_angle_rad = 0.0;
  bool antiperiodic = false;
  int slots_in_sector = 0;
  int bars_in_sector = 0;
};

struct SlotDimensions {
  double slot_pitch_at_bore_m = 0.0;  // arc length
  double tooth_width_min_m = 0.0;     // narrowest tooth body
  double slot_area_m2 = 0.0;          // opening + winding area of one slot
  double winding_area_m2 = 0.0;       // area available to conductors in one slot
  double coil_side_area_m2[2] = {0.0, 0.0};
  double yoke_height_m = 0.0;  // at the deepest point of a slot
  double tip_depth_m = 0.0;    // bore to the top of the winding area (tooth-tip zone)
};

struct BarDimensions {
  double bar_pitch_at_surface_m = 0.0;
  double bar_area_m2 = 0.0;
  double rotor_tooth_width_min_m = 0.0;
  double bar_top_radius_m = 0.0;     // outermost point of a bar
  double bar_bottom_radius_m = 0.0;  // innermost point of a bar
};

struct Lamination {
  double stator_outer_radius_m = 0.0;
  double bore_radius_m = 0.0;
  double band_outer_radius_m = 0.0;  // the band's stator-side circle
  double band_inner_radius_m = 0.0;  // the band's rotor-side circle
  double rotor_outer_radius_m = 0.0;
  double shaft_radius_m = 0.0;
  int slots = 0;
  int bars = 0;
  int poles = 0;
  int layers = 1;
  SectorSymmetry symmetry;
  SlotDimensions slot;
  BarDimensions bar;
  WindingLayout winding;
  std::vector<Piece> pieces;

  double airgap_m() const { return bore_radius_m - rotor_outer_radius_m; }
  double band_mid_radius_m() const { return 0.5 * (band_inner_radius_m + band_outer_radius_m); }
};

// Builds the pieces for the case's symmetry sector. Throws InputError (naming the key) when the
// dimensions cannot make a lamination: teeth or bridges of zero width, slots through the yoke,
// a rotor not smaller than the bore, a shaft cutting the bars, ...
Lamination build_lamination(const Case& c);

// The symmetry that the slot count, the bar count (0 for a smooth rotor) and the pole count share.
SectorSymmetry choose_symmetry(int slots, int bars, int poles, bool force_full);
// The largest such sector over which the winding layout also repeats (with the sector's sign).
SectorSymmetry choose_symmetry(int slots, int bars, int poles, bool force_full,
                               const WindingLayout& winding);

// Stator tooth whose centre is nearest to angle θ (stator frame), 0-based.
int stator_tooth_at(double theta_rad, int slots);

}  // namespace gapflux
