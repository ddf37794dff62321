#pragma once
// A field snapshot drawn as an engineer expects to see a sector model: the stator sector with the
// rotor copy that faces it. The model holds one rotor sector, turned by the rotor angle; its
// images one sector angle apart carry the same field (times −1 per sector when antiperiodic).
// Each rotor triangle is drawn in the image that lies over the stator sector: turned back by a
// whole number m of sector angles, its A and B multiplied by (−1)^m when antiperiodic, B turned
// with it. A triangle on the sector edge is drawn on both sides of it.
#include <Eigen/Core>

#include "geometry/mesh.hpp"
#include "postproc/field_evaluation.hpp"
#include "postproc/vtu_writer.hpp"
#include "solver/assembly.hpp"

namespace gapflux {

// `current_density`: per assembler element, the induced current density in the bars (A/m²; the
// snapshot then carries a cell array "J"), or null.
FieldSnapshot make_field_snapshot(const Assembler& assembler, const Eigen::VectorXd& x,
                                  const Mesh& mesh, const ElementFields& fields,
                                  const std::vector<double>* current_density = nullptr);

}  // namespace gapflux
