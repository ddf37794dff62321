#pragma once
// The winding's arrangement in the slots, by the star of slots with 60° phase belts
// (design.md §3; e.g. Pyrhönen, Jokinen, Hrabovcová, Design of Rotating Electrical Machines,
// ch. 2). Slot k (0-based) sits at electrical angle θ_k = p·(k + ½)·2π/Q. A coil side whose
// slot lies in belt [60°·m, 60°·(m + 1)) belongs to, in order m = 0…5: a+, c−, b+, a−, c+, b−.
// With currents out of the plane (+z) in the "+" sides, phase a's magnetic axis lies 90°
// electrical behind its "+" belt centre (at −60°), b's 120° ahead of a's and c's 240° ahead:
// a positive-sequence set turns the field counter-clockwise (forward, design.md §4).
// Double layer: the top layer of slot k follows its belt; the bottom layer of slot k is the
// return side of the coil that starts in the top layer of slot k − y.
#include <string>
#include <vector>

#include "cases/case.hpp"

namespace gapflux {

struct CoilSide {
  int slot = 0;   // 0-based
  int layer = 0;  // 0 top (airgap side), 1 bottom; single layer: 0
  int phase = 0;  // 0 a, 1 b, 2 c
  int sign = 1;   // +1: positive phase current flows out of the plane (+z)
};

struct WindingFactor {
  double order = 1;  // electrical space-harmonic order ν
  double kd = 0, kp = 0, kw = 0;
  bool slot_harmonic = false;
};

struct WindingLayout {
  int slots = 0, pole_pairs = 0, layers = 1, coil_pitch_slots = 1;
  int turns_per_coil = 0, parallel_paths = 1;
  std::vector<CoilSide> sides;  // slot-major, top layer first
  std::vector<WindingFactor> factors;
  double series_turns_per_phase = 0.0;
  double phase_axis_el_rad[3] = {0, 0, 0};  // magnetic axes, electrical angle

  const CoilSide& side(int slot, int layer) const { return sides[slot * layers + layer]; }
  // Whether the layout repeats after `slots_per_sector` slots with sign (−1)^antiperiodic.
  bool repeats(int slots_per_sector, bool antiperiodic) const;
};

// Throws InputError on stator.slots when Q and 2p admit no balanced three-phase winding.
WindingLayout build_winding_layout(const Case& c);

// k_w = |Σ sign·e^{jνθ}| / (sides) for phase a over all its sides; k_d over the top layer;
// k_p = k_w / k_d.
WindingFactor winding_factor(const WindingLayout& layout, double order);

const char* phase_name(int phase);

}  // namespace gapflux
