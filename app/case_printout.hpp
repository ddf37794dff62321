#pragma once
// Human-readable printout of a resolved case: every value after defaults, in the units of the
// case file, and the derived quantities an engineer checks first.
#include <ostream>

#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh.hpp"
#include "geometry/mesher.hpp"

namespace gapflux {

void print_resolved_case(std::ostream& out, const Case& c, const Lamination& lam,
                         const MeshSettings& mesh);
void print_mesh_statistics(std::ostream& out, const Mesh& mesh, const MeshQuality& quality);

}  // namespace gapflux
