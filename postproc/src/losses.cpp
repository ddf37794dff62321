#include "postproc/losses.hpp"

#include <cmath>

#include "postproc/spectrum.hpp"

namespace gapflux {

IronLoss iron_loss(const Mesh& mesh, const std::vector<const Material*>& material,
                   const std::vector<double>& b_rows, int steps, double frequency_hz,
                   double stack_length_m, int sectors) {
  const std::size_t nt = mesh.n_triangles();
  IronLoss loss;
  loss.density_w_per_m3.assign(nt, 0.0);
  std::vector<double> series(static_cast<std::size_t>(steps));
  for (std::size_t t = 0; t < nt; ++t) {
    const Material* m = material[t];
    if (!m || !m->iron_loss.available()) continue;
    double w_per_kg = 0.0;
    for (int c = 0; c < 2; ++c) {
      for (int n = 0; n < steps; ++n)
        series[n] = b_rows[(static_cast<std::size_t>(n) * nt + t) * 2 + c];
      const std::vector<double> peak = amplitude_spectrum(series);  // bin h: order h (one period)
      const std::size_t last = peak.size() - (steps % 2 == 0 ? 1 : 0);
      for (std::size_t h = 1; h < last; ++h)
        w_per_kg += specific_iron_loss_w_per_kg(m->iron_loss, h * frequency_hz, peak[h]);
    }
    loss.density_w_per_m3[t] = w_per_kg * m->density_kg_per_m3;
    const double w =
        loss.density_w_per_m3[t] * std::abs(triangle_area(mesh, t)) * stack_length_m * sectors;
    const RegionKind kind = mesh.regions[mesh.triangle_region[t]].tag.kind;
    (kind == RegionKind::rotor_iron ? loss.rotor_w : loss.stator_w) += w;
  }
  return loss;
}

}  // namespace gapflux
