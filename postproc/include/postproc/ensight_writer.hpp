#pragma once
// The field snapshots as one time series that VTK's own readers open (vtkGenericEnSightReader,
// in every VTK build; ParaView and VisIt read it too): the EnSight Gold "C Binary" layout, an
// openly documented format. fields.case lists the steps; each step writes its own geometry (the
// band is re-triangulated and the rotor turns, so the mesh changes) and its variables into
// fields/ensight/. EnSight Gold stores single precision: the .vtu files keep the doubles.
#include <string>
#include <utility>
#include <vector>

#include "postproc/vtu_writer.hpp"

namespace gapflux {

// Writes fields/ensight/<name>.<step, 5 digits> for the geometry and the variables A (per node),
// B (vector per element), B_abs, mu_r, region_id and side (per element), and J when the snapshot
// has it. `dir` is the run folder.
void write_ensight_step(const std::string& dir, int step, const FieldSnapshot& snapshot);

// (Re)writes DIR/fields.case for the snapshots written so far: (time, step) pairs;
// `current_density`: the steps carry J.
void write_ensight_case(const std::string& dir, const std::vector<std::pair<double, int>>& steps,
                        bool current_density = false);

}  // namespace gapflux
