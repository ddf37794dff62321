#pragma once
// One time-harmonic study: the motor in its steady state at the supply's fundamental, the rotor
// held at one position, the cage at the case's slip (solver/harmonic_field.hpp). An unbalanced
// supply is split into its sequences (Fortescue): the positive one is solved at slip s with the
// effective reluctivity iterated to convergence, the negative one at slip 2 − s on that same
// reluctivity state, and the two are added. run() shows the steps: set up, solve, write output.
#include <Eigen/Core>
#include <memory>
#include <nlohmann/json_fwd.hpp>
#include <string>

#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh.hpp"
#include "materials/library.hpp"
#include "postproc/summary.hpp"
#include "solver/cage_parameters.hpp"
#include "solver/harmonic_field.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver/winding_sources.hpp"
#include "studies/run_folder.hpp"
#include "supply_sequences.hpp"

namespace gapflux {

class HarmonicStudy {
 public:
  HarmonicStudy(std::string case_path, Case c, std::string out_dir, FolderUse use);
  // Throws InputError (bad input) or NumericalError.
  void run();
  const RunSummary& summary() const { return summary_; }  // after run()

 private:
  void set_up();
  void solve();
  void write_output();
  PointContext point_context() const;
  // kind = "slip_curves" (slip_curves.cpp): the points from slip_from to slip_to, each started
  // from its neighbour's flux densities, and the standstill and rated points.
  void solve_curves();
  void write_curves();
  // summary.json's equivalent_circuit (equivalent_circuit.hpp) from the no-load, standstill and
  // rated points, with its torque against the field's at the check slips.
  void add_equivalent_circuit(nlohmann::json& j) const;
  struct CurvePoint;
  CurvePoint solve_point(double slip, const std::vector<double>& start_b_peak,
                         std::vector<double>& b_peak);

  std::string case_path_, out_dir_;
  FolderUse folder_use_ = FolderUse::fresh;
  std::unique_ptr<RunFolder> folder_;
  Case case_;
  Lamination lamination_;
  Mesh mesh_;
  RegionMaterials materials_;
  RegionModel model_;
  CoilRegions coils_;
  std::unique_ptr<MagnetostaticSystem> system_;
  HarmonicWinding winding_;
  std::optional<CageValues> cage_values_;
  std::unique_ptr<HarmonicCage> cage_;
  std::vector<int> bar_of_region_;
  double slip_ = 0.0, omega_ = 0.0;
  Eigen::Vector3cd source_;  // the supply's fundamental, per branch
  Eigen::Vector3cd source_positive_, source_negative_;
  HarmonicState positive_, negative_;
  bool has_negative_ = false;
  RunSummary summary_;
  double wall_start_s_ = 0.0, set_up_s_ = 0.0, mesh_s_ = 0.0, solve_s_ = 0.0;
  bool mesh_from_cache_ = false;
  // Slip curves: one entry per point (converged or not), and the standstill and rated points.
  struct CurvePoint {
    HarmonicPoint point;
    SequenceImpedances impedance;  // Z1(s), Z2 = Z(2 − s) on the positive state
    bool converged = false;
    int iterations = 0;
    std::string failure;
  };
  std::vector<CurvePoint> curve_;
  std::optional<CurvePoint> standstill_, rated_, no_load_;
  std::vector<CurvePoint> circuit_checks_;  // between rated and breakdown (the circuit's check)
};

}  // namespace gapflux
