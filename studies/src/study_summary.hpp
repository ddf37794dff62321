#pragma once
// The part of summary.json every study shares: case, mesh, winding, supply frequency.
#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh.hpp"
#include "postproc/summary.hpp"

namespace gapflux {

RunSummary common_summary(const Case& c, const Lamination& lamination, const Mesh& mesh,
                          std::size_t dofs);

}  // namespace gapflux
