#pragma once
// The full machine made from copies of a sector mesh, turned by whole sector angles, with the
// sector-edge nodes of neighbouring copies merged. Both then discretise the same field, so a
// sector solve and a full solve can be compared node for node (design.md §2).
#include "geometry/mesh.hpp"

namespace gapflux {

// Slot and bar indices in region tags continue across copies (copy k adds k·slots_in_sector).
Mesh replicate_to_full(const Mesh& sector);

}  // namespace gapflux
