#pragma once
// Shapes of one stator slot and one rotor bar in a local frame whose +x axis is the slot (bar)
// centre line and whose origin is the machine centre. Each builder checks that its dimensions
// make a real lamination and throws InputError naming the key otherwise.
#include <vector>

#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "geometry/outline.hpp"

namespace gapflux {

struct SlotShapes {
  Outline opening;                  // empty when the winding reaches the bore
  std::vector<Outline> coil_sides;  // one per layer, top (airgap side) first
  SlotDimensions dims;
};

struct BarShapes {
  Outline bar;
  Outline opening;  // semi-open bars only
  BarDimensions dims;
};

SlotShapes build_stator_slot(const Case& c);
BarShapes build_rotor_bar(const Case& c);

}  // namespace gapflux
