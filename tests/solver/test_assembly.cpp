// Properties of the assembled system: constants in the stiffness null space before the
// constraints, the Jacobian equal to the residual's derivative, symmetry.
#include <catch2/catch.hpp>

#include <Eigen/Sparse>
#include <numbers>

#include "cases/case_reader.hpp"
#include "geometry/mesher.hpp"
#include "solver/assembly.hpp"
#include "solver/magnetostatic_system.hpp"
#include "solver/region_model.hpp"
#include "solver/winding_sources.hpp"
#include "test_support.hpp"

using namespace gapflux;

namespace {

Eigen::SparseMatrix<double> full_matrix(const Assembler& a) {
  std::vector<Eigen::Triplet<double>> t;
  for (int col = 0; col < a.n_dofs(); ++col)
    for (int k = a.column_starts()[col]; k < a.column_starts()[col + 1]; ++k) {
      const int row = a.row_indices()[k];
      t.emplace_back(row, col, a.values()[k]);
      if (row != col) t.emplace_back(col, row, a.values()[k]);
    }
  Eigen::SparseMatrix<double> m(a.n_dofs(), a.n_dofs());
  m.setFromTriplets(t.begin(), t.end());
  return m;
}

struct Demo {
  Case c;
  Lamination lam;
  Mesh mesh;
  RegionMaterials materials;
};

Demo demo() {
  Demo d;
  d.c = read_case_file(test::example("compressor_2p24s.toml"));
  d.lam = build_lamination(d.c);
  d.mesh = mesh_lamination(d.lam, resolve_mesh_settings(d.c, d.lam));
  d.materials = resolve_region_materials(d.c);
  return d;
}

}  // namespace

TEST_CASE("stiffness: constants in the null space before constraints", "[solver]") {
  // The weak form ∫ν∇N_i·∇A has ∇(constant) = 0: K·1 = 0 (common practice, no source).
  const Demo d = demo();
  DofMap identity;
  identity.n_dofs = static_cast<int>(d.mesh.nodes.size());
  for (int i = 0; i < identity.n_dofs; ++i) {
    identity.dof_of_node.push_back(i);
    identity.sign_of_node.push_back(1.0);
  }
  Assembler assembler(build_element_records(d.mesh, nullptr, identity), identity.n_dofs);
  const RegionModel model = make_region_model(d.mesh, d.materials, {});
  assembler.assemble(Eigen::VectorXd::Zero(identity.n_dofs), model, true);
  const auto k = full_matrix(assembler);
  const Eigen::VectorXd ones = Eigen::VectorXd::Ones(identity.n_dofs);
  const double scale = k.diagonal().cwiseAbs().maxCoeff();
  CHECK((k * ones).cwiseAbs().maxCoeff() < 1e-10 * scale);
}

TEST_CASE("Jacobian equals the residual's derivative on a saturated state", "[solver]") {
  const Demo d = demo();
  const CoilRegions coils = coil_regions(d.mesh, d.lam.winding);
  const RegionModel model =
      make_region_model(d.mesh, d.materials, region_current_density(coils, {12.0, -6.0, -6.0}));
  MagnetostaticSystem system(d.mesh, 0.0);
  NewtonSettings settings;
  settings.max_iterations = 4;  // a state part-way, saturated
  try {
    system.solve(model, settings);
  } catch (const NumericalError&) {
  }
  const Eigen::VectorXd x = system.x();
  Assembler& a = system.assembler();
  a.assemble(x, model, true);
  const auto k = full_matrix(a);
  CHECK((Eigen::MatrixXd(k.topLeftCorner(200, 200)) -
         Eigen::MatrixXd(k.topLeftCorner(200, 200)).transpose())
            .norm() == 0.0);
  Eigen::VectorXd v = Eigen::VectorXd::Random(a.n_dofs());
  const double h = 1e-7 * x.norm() / v.norm();
  a.assemble(x + h * v, model, false);
  const Eigen::VectorXd plus = a.residual();
  a.assemble(x - h * v, model, false);
  const Eigen::VectorXd minus = a.residual();
  const Eigen::VectorXd fd = (plus - minus) / (2 * h);
  const Eigen::VectorXd kv = k * v;
  // Central differences err by O(h²) plus rounding; 1e-6 relative separates them from any
  // missing Jacobian term by orders of magnitude.
  CHECK((fd - kv).norm() < 1e-6 * kv.norm());
}
