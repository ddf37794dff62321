#pragma once
// Before meshing: whether the lamination's thinnest features and the mesh sizes go together,
// and roughly how many triangles the mesh will have. A feature thinner than any punched
// lamination carries (below 0.05 mm) or a mesh far beyond what this machine can solve is refused
// (InputError naming the key); a feature much thinner than the elements around it, and a large
// mesh, get a warning naming the key to change.
#include <string>
#include <vector>

#include "cases/case.hpp"
#include "geometry/lamination.hpp"

namespace gapflux {

struct MeshSettings;

struct MeshForecast {
  double triangles = 0.0;  // estimate over the modelled sector
  std::vector<std::string> warnings;
};

inline constexpr double min_feature_m = 0.05e-3;
// Unknowns (about 2 per triangle at order 2, 0.5 at order 1): a whole run takes 2–5 KiB per
// unknown (docs/performance.md), so 4 million fill this machine kind's 24 GiB.
inline constexpr double unknowns_warned = 0.8e6;
inline constexpr double unknowns_refused = 4e6;

// Element size the mesher's size field gives at `distance_m` from the middle of the airgap.
double local_mesh_size_m(const Lamination& lam, const MeshSettings& s, double distance_m);

MeshForecast forecast_mesh(const Case& c, const Lamination& lam, const MeshSettings& s);

}  // namespace gapflux
