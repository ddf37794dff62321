// TransientStudy, the cage with induced bar currents: its set-up from the case, its start (the
// bars switched on in the field the stator makes at the start), the eddy term of each step and
// the rows each step adds to results.h5.
#include <fmt/format.h>

#include <cmath>
#include <complex>
#include <numbers>

#include "transient_study.hpp"

namespace gapflux {

void TransientStudy::set_up_cage() {
  cage_values_ = cage_values(case_, lamination_, materials_);
  bar_of_region_.assign(mesh_.regions.size(), -1);
  for (std::size_t r = 0; r < mesh_.regions.size(); ++r)
    if (mesh_.regions[r].tag.kind == RegionKind::bar)
      bar_of_region_[r] = mesh_.regions[r].tag.index;
}

void TransientStudy::start_cage(MagnetostaticSystem& system, const RegionModel& model,
                                const NewtonSettings& settings, bool cold) {
  std::vector<double> areas;
  Eigen::MatrixXd coupling =
      bar_coupling(system.assembler(), bar_of_region_, cage_values_.circuit.bars, areas);
  cage_ = std::make_unique<CageCircuit>(cage_values_.circuit, std::move(coupling), areas,
                                        case_.study.time_scheme);
  if (steps_done_ > 0) {
    // Resuming: the last two fields and ring currents.
    std::vector<Eigen::VectorXd> x, ring;
    for (const char* name : {"restart/x", "restart/x_previous"})
      if (h5_->exists(name)) {
        const std::vector<double> v = h5_->read(name);
        x.push_back(Eigen::Map<const Eigen::VectorXd>(v.data(), static_cast<long>(v.size())));
      }
    const std::vector<double> rows = h5_->read("steps/ring_current");
    const int n = cage_values_.circuit.bars;
    for (int back = 1; back <= std::min(2, steps_done_); ++back)
      ring.push_back(Eigen::Map<const Eigen::VectorXd>(rows.data() + (steps_done_ - back) * n, n));
    cage_->set_history(x, ring);
    return;
  }
  // A cold start: the bars are switched on in the field the stator makes at the start without
  // them (a voltage feed's start-up has just solved it), so they carry no current at first; the
  // cage's own transient then decays with the rotor's time constant.
  if (cold) {
    if (!circuit_) system.solve(model, settings);
    cage_->set_history({system.x()}, {});
  }
  // What the cage is, once per run: its circuit values and its bar triangles' areas.
  const CageParameters& c = cage_values_.circuit;
  h5_->write("cage/bar_triangle_area", bar_triangle_areas(), "m^2");
  h5_->write("cage/ring_segment",
             std::vector<double>{c.ring_segment_resistance_ohm, c.ring_segment_inductance_h},
             "ohm, H");
  h5_->attribute("cage/ring_segment", "conductivity_s_per_m",
                 cage_values_.ring_conductivity_s_per_m);
  h5_->attribute("cage/ring_segment", "resistance_given",
                 static_cast<long>(cage_values_.resistance_given));
  h5_->attribute("cage/ring_segment", "inductance_given",
                 static_cast<long>(cage_values_.inductance_given));
  h5_->attribute("cage/bar_triangle_area", "bar_conductivity_s_per_m", c.conductivity_s_per_m);
  h5_->attribute("cage/bar_triangle_area", "temperature_c", cage_values_.temperature_c);
}

std::vector<double> TransientStudy::bar_triangle_areas() const {
  std::vector<double> out;
  const int per = mesh_.nodes_per_triangle();
  for (std::size_t t = 0; t < mesh_.n_triangles(); ++t) {
    if (bar_of_region_[mesh_.triangle_region[t]] < 0) continue;
    const Vec2 a = mesh_.nodes[mesh_.triangles[t * per]],
               b = mesh_.nodes[mesh_.triangles[t * per + 1]],
               c = mesh_.nodes[mesh_.triangles[t * per + 2]];
    // Straight-sided area: bars are meshed finely enough that the curved edges' share is small;
    // it only weighs the loss shares, not the cage loss itself.
    out.push_back(0.5 * std::abs((b - a).x() * (c - a).y() - (b - a).y() * (c - a).x()));
  }
  return out;
}

void TransientStudy::add_eddy_currents(RegionModel& model) const {
  model.eddy_s_per_m.assign(mesh_.regions.size(), 0.0);
  for (std::size_t r = 0; r < mesh_.regions.size(); ++r)
    if (bar_of_region_[r] >= 0) model.eddy_s_per_m[r] = cage_values_.circuit.conductivity_s_per_m;
  model.eddy_rate = cage_->rate(grid_.dt_s);
  model.eddy_history = &cage_->eddy_history();
}

void TransientStudy::write_cage_step(const MagnetostaticSystem& system, double rotor_angle_rad) {
  const CageCircuit::StepResult& r = cage_->last();
  const BarFieldResult bars = bar_field(system.assembler(), bar_of_region_, system.x(), *cage_);
  bar_density_ = bars.current_density_a_per_m2;
  const int sectors = mesh_.symmetry.sectors;
  // Both rings alike: each segment's loss twice.
  const double ring_w = sectors * 2.0 * cage_values_.circuit.ring_segment_resistance_ohm *
                        r.ring_current_a.squaredNorm();
  const auto row = [](const Eigen::VectorXd& v) {
    return std::vector<double>(v.data(), v.data() + v.size());
  };
  h5_->append_row("steps/bar_current", row(r.bar_current_a), "A");
  // The bar currents' wave of the pole-pair order in the stator's frame (the steady-state
  // measure): bar k of the sector sits at (k + ½)·2π/bars + the rotor's angle.
  const CageParameters& c = cage_values_.circuit;
  const int p = case_.machine.pole_pairs();
  std::complex<double> wave = 0.0;
  for (int k = 0; k < c.bars; ++k) {
    const double theta = (k + 0.5) * 2.0 * std::numbers::pi / c.bars_total + rotor_angle_rad;
    wave += r.bar_current_a[k] * std::polar(2.0 / c.bars, -p * theta);
  }
  h5_->append_row("steps/cage_wave", {wave.real(), wave.imag()}, "A");
  h5_->append_row("steps/bar_voltage", row(r.bar_voltage_v), "V");
  h5_->append_row("steps/ring_current", row(r.ring_current_a), "A");
  h5_->append_row("steps/cage_loss", {sectors * bars.loss_w, ring_w}, "W");
  // The bar triangles' current density (mesh triangles come first among the elements).
  std::vector<double> density;
  for (std::size_t t = 0; t < mesh_.n_triangles(); ++t)
    if (bar_of_region_[mesh_.triangle_region[t]] >= 0) density.push_back(bar_density_[t]);
  h5_->append_row("steps/bar_density", density, "A/m^2");
}

}  // namespace gapflux
