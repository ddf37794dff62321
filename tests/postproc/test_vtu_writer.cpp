// mesh.vtu read back with VTK's own reader.
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkFieldData.h>
#include <vtkNew.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>
#include <catch2/catch.hpp>

#include <map>

#include "cases/case_reader.hpp"
#include "geometry/lamination.hpp"
#include "geometry/mesher.hpp"
#include "postproc/vtu_writer.hpp"
#include "test_support.hpp"

using namespace gapflux;

TEST_CASE("mesh.vtu round trip through VTK's reader", "[postproc]") {
  const Case c = read_case_file(test::example("compressor_2p24s.toml"));
  const Lamination lam = build_lamination(c);
  const Mesh mesh = mesh_lamination(lam, resolve_mesh_settings(c, lam));
  const BandMesh band = build_moving_band(mesh, 0.0);
  const auto path = (test::temp_dir("vtu") / "mesh.vtu").string();
  write_mesh_vtu(path, mesh, &band);

  vtkNew<vtkXMLUnstructuredGridReader> reader;
  reader->SetFileName(path.c_str());
  reader->Update();
  vtkUnstructuredGrid* grid = reader->GetOutput();
  REQUIRE(grid != nullptr);
  CHECK(grid->GetNumberOfCells() ==
        static_cast<vtkIdType>(mesh.n_triangles() + band.elements.size()));
  CHECK(grid->GetCellType(0) == VTK_QUADRATIC_TRIANGLE);
  vtkDataArray* region = grid->GetCellData()->GetArray("region_id");
  REQUIRE(region != nullptr);
  std::map<int, std::size_t> written, read;
  for (std::size_t t = 0; t < mesh.n_triangles(); ++t)
    written[mesh.regions[mesh.triangle_region[t]].id]++;
  written[mesh.regions[mesh.region_index("moving_band")].id] += band.elements.size();
  for (vtkIdType i = 0; i < grid->GetNumberOfCells(); ++i)
    read[static_cast<int>(region->GetTuple1(i))]++;
  CHECK(read == written);
  // The id → name map: ids, and names as NUL-terminated bytes in the same order.
  vtkDataArray* ids = grid->GetFieldData()->GetArray("region_ids");
  vtkDataArray* names = grid->GetFieldData()->GetArray("region_names");
  REQUIRE(ids != nullptr);
  REQUIRE(names != nullptr);
  REQUIRE(ids->GetNumberOfTuples() == static_cast<vtkIdType>(mesh.regions.size()));
  std::vector<std::string> decoded(1);
  for (vtkIdType i = 0; i < names->GetNumberOfTuples(); ++i) {
    const char ch = static_cast<char>(names->GetTuple1(i));
    if (ch == '\0')
      decoded.emplace_back();
    else
      decoded.back() += ch;
  }
  decoded.pop_back();
  REQUIRE(decoded.size() == mesh.regions.size());
  for (std::size_t i = 0; i < mesh.regions.size(); ++i) {
    CHECK(static_cast<int>(ids->GetTuple1(static_cast<vtkIdType>(i))) == mesh.regions[i].id);
    CHECK(decoded[i] == mesh.regions[i].name);
  }
}
