#pragma once
// One time-stepping study: at each step the supply gives the winding currents, the rotor turns,
// the band is re-triangulated and the nonlinear field is solved from the previous step's
// solution (warm start). Each finished step is appended to results.h5
// and the file flushed, so a killed run keeps every finished step; `resume` continues from the
// last one. run() shows the stages: set up, step loop (solve, post-process, write), summary.
#include <Eigen/Core>
#include <memory>
#include <string>

#include "cases/case.hpp"
#include "cases/case_fingerprint.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "materials/library.hpp"
#include "postproc/field_evaluation.hpp"
#include "postproc/losses.hpp"
#include "postproc/results_file.hpp"
#include "postproc/run_analysis.hpp"
#include "postproc/saturation.hpp"
#include "postproc/summary.hpp"
#include "solver/cage_circuit.hpp"
#include "solver/cage_parameters.hpp"
#include "solver/circuit.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver/time_grid.hpp"
#include "solver/winding_resistance.hpp"
#include "solver/winding_sources.hpp"
#include "studies/run_folder.hpp"
#include "studies/study.hpp"

namespace gapflux {

// fields/step_NNNNN.vtu, relative to the run folder.
std::string snapshot_file(int step);

class TransientStudy {
 public:
  // `use`: what to do with a folder that holds an earlier run (RunFolder).
  // `c`: the case as read from `case_path` (whose text is the run's fingerprint).
  TransientStudy(std::string case_path, Case c, std::string out_dir, FolderUse use,
                 OutputDetail detail);
  // Throws InputError, NumericalError (after saving the finished steps), OutputError (a write
  // failed or the disk is full: the file keeps the steps written before), Interrupted.
  void run();
  // Replaces the case's supply (the balanced baseline of --baseline); before run().
  void override_supply(const SupplySpec& supply) { supply_override_ = supply; }
  // After run(): what summary.json holds, and where.
  const RunSummary& summary() const { return summary_; }
  std::string summary_path() const;

 private:
  void set_up();
  int open_results();  // returns the first step to compute
  int resume_results(const std::string& path);
  void check_fingerprint() const;  // resuming: the stored run must have the same settings
  // Disk room for step n's writes, from the last steps' measured sizes; throws OutputError.
  void ensure_room_for_step(int n) const;
  void warn_if_run_will_not_fit() const;
  std::uint64_t estimated_step_bytes() const;
  std::uint64_t estimated_snapshot_bytes() const;
  void measure_step_bytes(std::uint64_t file_bytes_before, bool snapshot);
  void drop_unfinished_rows();  // rows of steps/ past steps_done
  void step(int n);
  // A voltage feed: the start-up history from the linear steady state (before the first step).
  void start_circuit(MagnetostaticSystem& system, const RegionModel& model,
                     const Eigen::MatrixXd& coupling, const std::vector<double>& bar_density,
                     const NewtonSettings& settings);
  void write_fields(int n, const MagnetostaticSystem& system, const ElementFields& fields);
  // The cage with induced currents (transient_cage.cpp).
  bool cage_wanted() const {
    return case_.rotor.kind == RotorKind::cage && case_.rotor.bar_currents == BarCurrents::induced;
  }
  void set_up_cage();
  // Creates the cage's circuit on the first step's system, with the field it is switched on in
  // (or, resuming, the stored history).
  // `cold`: the bars carry no current at first; otherwise the caller sets the history.
  void start_cage(MagnetostaticSystem& system, const RegionModel& model,
                  const NewtonSettings& settings, bool cold = true);
  // start = "time_harmonic": field, cage and winding history from the time-harmonic solution
  // (transient_harmonic_start.cpp); before the first step's circuits are set up.
  void start_from_harmonic(MagnetostaticSystem& system, const RegionModel& model);
  void add_eddy_currents(RegionModel& model) const;
  void write_cage_step(const MagnetostaticSystem& system,
                       double rotor_angle_rad);  // rows of steps/ and bar_density_
  std::vector<double> bar_triangle_areas() const;
  // The cage's currents and losses and the power balance over the analysis window.
  void cage_and_power_summary(RunSummary& s, int done) const;
  // Peak |B| and time over the threshold per triangle over the last period, written to
  // results.h5 (saturation/) and saturation.vtu.
  // `b_rows`: steps/B as read (the finished steps' rows from `first_row_step` on).
  SaturationMap saturation_over_last_period(int done, const std::vector<double>& b_rows,
                                            int first_row_step);
  // The first step whose element fields are kept (lean: the last period's only).
  // A run that may stop when settled does not know its last period ahead: it keeps them all.
  int first_b_step() const {
    return detail_ == OutputDetail::lean && !case_.study.stop_when_settled
               ? std::max(0, grid_.steps - grid_.steps_per_period)
               : 0;
  }
  // A field snapshot is written after step n.
  bool snapshot_at(int n) const {
    return detail_ == OutputDetail::full && n % case_.output.fields_every == 0;
  }
  RunRecord read_record(int done) const;  // the finished steps, for the analysis
  // What the steady-state indicator reads (time, flux linkage, torque, cage wave) into `r`; and
  // a record of only that, lighter than read_record's.
  void read_settle_rows(int done, RunRecord& r) const;
  RunRecord settle_record(int done) const;
  // study.stop_when_settled: after a whole period (from the second on), whether the steady-state
  // indicator is within its tolerance; if so the analysis window becomes that period.
  bool settled_after_step(int n);
  void finish(const std::string& failure);

  std::string case_path_, out_dir_;
  FolderUse folder_use_ = FolderUse::fresh;
  OutputDetail detail_ = OutputDetail::full;
  std::unique_ptr<RunFolder> folder_;
  Case case_;
  CaseFingerprint fingerprint_;
  RegionMaterials materials_;
  Lamination lamination_;
  Mesh mesh_;
  CoilRegions coils_;
  TimeGrid grid_;
  int airgap_samples_ = 0;
  IronLoss iron_loss_;
  std::optional<SupplySpec> supply_override_;
  std::unique_ptr<WindingCircuit> circuit_;  // voltage feed only
  std::unique_ptr<CageCircuit> cage_;        // induced bar currents only
  CageValues cage_values_;
  std::vector<int> bar_of_region_;   // per mesh region: its bar in the sector, −1 elsewhere
  Eigen::VectorXd x_before_;         // the cage's newest history value before the step
  std::vector<double> bar_density_;  // per assembler element of the last step: J in the bars
  BranchImpedance impedance_;
  WindingResistance winding_r_;  // the phase resistance and end-winding data, once per run
  RunSummary summary_;
  std::unique_ptr<ResultsFile> h5_;
  Eigen::VectorXd x_last_;  // the last step's solution (warm start)
  // The last step's system, kept while the rotor stays at its angle (locked rotor).
  std::unique_ptr<MagnetostaticSystem> system_;
  double system_angle_rad_ = 0.0;
  std::array<double, 3> psi_last_{0, 0, 0};
  bool have_last_ = false;
  int shift_last_ = 0;         // band shift of the last step
  int settled_at_period_ = 0;  // stop_when_settled: the period that settled (0: none yet)
  int start_iterations_ = 0;   // linear solves of the time-harmonic start
  double start_s_ = 0.0;
  int newton_total_ = 0;
  int factorizations_total_ = 0;
  int cg_total_ = 0;
  int newton_last_ = 0;
  int factorizations_last_ = 0;
  int steps_done_ = 0;
  double wall_start_s_ = 0.0;
  double set_up_s_ = 0.0, mesh_s_ = 0.0;  // for summary.json
  bool mesh_from_cache_ = false;
  std::vector<std::pair<double, int>> snapshot_steps_;  // (time, step) of each field snapshot
  // Bytes the last step added to results.h5 and the last snapshot's size (the disk-room guard).
  std::uint64_t step_bytes_ = 0, snapshot_bytes_ = 0;
};

}  // namespace gapflux
