// TransientStudy, the cage with induced bar currents: its set-up from the case, its start (the
// bars switched on in the field the stator makes at the start), the eddy term of each step and
// the rows each step adds to results.h5.
#include <fmt/format.h>

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
                                const NewtonSettings& settings) {
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
  if (!circuit_) system.solve(model, settings);
  cage_->set_history({system.x()}, {});
}

void TransientStudy::add_eddy_currents(RegionModel& model) const {
  model.eddy_s_per_m.assign(mesh_.regions.size(), 0.0);
  for (std::size_t r = 0; r < mesh_.regions.size(); ++r)
    if (bar_of_region_[r] >= 0) model.eddy_s_per_m[r] = cage_values_.circuit.conductivity_s_per_m;
  model.eddy_rate = cage_->rate(grid_.dt_s);
  model.eddy_history = &cage_->eddy_history();
}

void TransientStudy::write_cage_step(const MagnetostaticSystem& system) {
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
  h5_->append_row("steps/bar_voltage", row(r.bar_voltage_v), "V");
  h5_->append_row("steps/ring_current", row(r.ring_current_a), "A");
  h5_->append_row("steps/cage_loss", {sectors * bars.loss_w, ring_w}, "W");
}

}  // namespace gapflux
