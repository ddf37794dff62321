#include "study_summary.hpp"

#include <numbers>

#include "geometry/mesher.hpp"

namespace gapflux {

RunSummary common_summary(const Case& c, const Lamination& lamination, const Mesh& mesh,
                          std::size_t dofs) {
  RunSummary s;
  const MeshQuality quality = mesh_quality(mesh);
  s.case_name = c.machine.name;
  s.vertices = quality.vertices;
  s.triangles = quality.triangles;
  s.order = mesh.order;
  s.dofs = dofs;
  s.min_angle_deg = quality.min_angle_deg;
  s.sectors = mesh.symmetry.sectors;
  s.antiperiodic = mesh.symmetry.antiperiodic;
  const MeshAccuracy accuracy = resolve_mesh_settings(c, lamination).forecast.accuracy;
  s.mesh_scale = accuracy.scale;
  s.mesh_accuracy_pct = accuracy.worst_pct;
  s.mesh_accuracy_basis = accuracy.basis == MeshAccuracy::Basis::measured ? "measured"
                          : accuracy.basis == MeshAccuracy::Basis::finer_than_measured
                              ? "finer_than_measured"
                              : "coarser_than_measured";
  const WindingLayout& w = lamination.winding;
  s.slots = w.slots;
  s.poles = 2 * w.pole_pairs;
  s.layers = w.layers;
  s.coil_pitch_slots = w.coil_pitch_slots;
  s.factors = w.factors;
  s.series_turns_per_phase = w.series_turns_per_phase;
  for (int k = 0; k < 3; ++k)
    s.phase_axis_deg_el[k] = w.phase_axis_el_rad[k] * 180.0 / std::numbers::pi;
  s.frequency_hz = c.supply.frequency_hz;
  s.frequency_detected = c.supply.frequency_detected;
  if (c.supply.form != SupplyForm::waveform) {
    std::array<Phasor, 3> f;
    for (int k = 0; k < 3; ++k)
      f[k] = std::polar(c.supply.phases[k].rms, c.supply.phases[k].angle_rad);
    s.described_fundamental = f;
  }
  s.supply_form = c.supply.form == SupplyForm::phases     ? "phases"
                  : c.supply.form == SupplyForm::sequence ? "sequence"
                                                          : "waveform";
  s.bar_rms_a = c.rotor_currents.bar_rms_a;
  s.airgap_radius_m = 0.5 * (mesh.stator_ring.radius_m + mesh.rotor_ring.radius_m);
  return s;
}

}  // namespace gapflux
