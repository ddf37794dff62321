#pragma once
// Iron loss from the recorded field: per triangle, the DFT of B_x and B_y over one electrical
// period gives each time harmonic's peak per component; each counts as an alternating field of
// that peak at h·f in the material's Steinmetz/Bertotti model, and the losses add. Rotational
// loss is not modelled separately: for a rotating field this sum is the usual approximation and
// tends to underestimate it.
#include <vector>

#include "geometry/mesh.hpp"
#include "materials/library.hpp"

namespace gapflux {

struct IronLoss {
  std::vector<double> density_w_per_m3;  // per mesh triangle
  double stator_w = 0.0, rotor_w = 0.0;  // whole machine (stack length × sectors)
  double total_w() const { return stator_w + rotor_w; }
};

// `b_rows`: steps × triangles × 2 (B_x, B_y per triangle, each in the frame of its own side);
// `material[t]`: the triangle's material, nullptr off the iron.
IronLoss iron_loss(const Mesh& mesh, const std::vector<const Material*>& material,
                   const std::vector<double>& b_rows, int steps, double frequency_hz,
                   double stack_length_m, int sectors);

}  // namespace gapflux
