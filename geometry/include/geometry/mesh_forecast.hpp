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

// What accuracy mesh settings give, from the convergence study of the demo pump motor
// (bench/mesh_convergence.py, docs/performance.md): the largest difference from a converged mesh
// over its airgap harmonics, torque mean and ripple, flux linkage and (second order) the induced
// cage's currents, at the measured setting of the same order whose sizes are the next coarser.
struct MeshAccuracy {
  enum class Basis { measured, finer_than_measured, coarser_than_measured };
  double scale = 0.0;      // the coarsest of the sizes against the base sizes (below)
  double worst_pct = 0.0;  // measured, or the finest's (finer), or the coarsest's (coarser)
  Basis basis = Basis::measured;
};

struct MeshForecast {
  double triangles = 0.0;  // estimate over the modelled sector
  MeshAccuracy accuracy;
  std::vector<std::string> warnings;
};

// Base element sizes (mesh scale 1): half the airgap there, a third of the stator slot pitch at
// the bore in the iron; the band's nodes at the airgap size, the growth rate 0.2. The defaults
// are `default_mesh_scale` times them: the coarsest second-order setting whose results on the
// demo motor stay within 0.5 % of a converged mesh, and at every finer setting too.
inline constexpr double default_mesh_scale = 1.4;
inline constexpr double base_growth_rate = 0.2;
double base_airgap_size_m(const Lamination& lam);
double base_iron_size_m(const Lamination& lam);

inline constexpr double min_feature_m = 0.05e-3;
// Unknowns (about 2 per triangle at order 2, 0.5 at order 1): a whole run takes 2–5 KiB per
// unknown (docs/performance.md), so 4 million fill this machine kind's 24 GiB.
inline constexpr double unknowns_warned = 0.8e6;
inline constexpr double unknowns_refused = 4e6;

// Element size the mesher's size field gives at `distance_m` from the middle of the airgap.
double local_mesh_size_m(const Lamination& lam, const MeshSettings& s, double distance_m);

// The scale of the settings: the largest of airgap size, iron size and band pitch over their
// base values (the coarsest part of the mesh decides), times the growth rate over the base
// rate when it is faster.
double mesh_scale(const Lamination& lam, const MeshSettings& s);
MeshAccuracy estimate_mesh_accuracy(const Lamination& lam, const MeshSettings& s);

MeshForecast forecast_mesh(const Case& c, const Lamination& lam, const MeshSettings& s);

}  // namespace gapflux
