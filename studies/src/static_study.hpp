#pragma once
// One static (one-instant) study: the case's rotor fixed at its angle, the winding currents at
// the case's instant, the nonlinear field solved, the results written. run() shows the steps:
// set up, solve, write output. The object owns everything the run needs.
#include <Eigen/Core>
#include <array>
#include <memory>
#include <string>

#include "cases/case.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesh.hpp"
#include "geometry/mesher.hpp"
#include "geometry/moving_band.hpp"
#include "materials/library.hpp"
#include "postproc/summary.hpp"
#include "solver/assembly.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver/newton.hpp"
#include "solver/winding_sources.hpp"
#include "studies/run_folder.hpp"

namespace gapflux {

class StaticStudy {
 public:
  // `c`: the case as read from `case_path` (which names it in messages).
  StaticStudy(std::string case_path, Case c, std::string out_dir, FolderUse use);
  // Throws InputError (bad input) or NumericalError (after writing what exists).
  void run();
  const RunSummary& summary() const { return summary_; }  // after run()

 private:
  void set_up();
  void solve_and_write();  // solve, then write output (also after a numerical failure)
  void solve();
  void write_output(const std::string& failure);

  std::string case_path_, out_dir_;
  FolderUse folder_use_ = FolderUse::fresh;
  std::unique_ptr<RunFolder> folder_;
  Case case_;
  Lamination lamination_;
  MeshSettings mesh_settings_;
  Mesh mesh_;
  RegionMaterials materials_;
  RegionModel model_;
  CoilRegions coils_;
  std::array<double, 3> phase_current_a_{0, 0, 0};
  std::unique_ptr<MagnetostaticSystem> system_;
  NewtonReport report_;
  RunSummary summary_;
  double wall_start_s_ = 0.0;
  double set_up_s_ = 0.0, mesh_s_ = 0.0;  // for summary.json
  bool mesh_from_cache_ = false;
};

}  // namespace gapflux
