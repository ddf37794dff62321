#include "postproc/vtu_writer.hpp"

#include <vtkCellArray.h>
#include <vtkCellData.h>
#include <vtkDoubleArray.h>
#include <vtkFieldData.h>
#include <vtkIntArray.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkUnsignedCharArray.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridWriter.h>

#include <sstream>

#include "postproc/output_file.hpp"

namespace gapflux {
namespace {

// VTK renders the file into memory; our own checked writer puts it on disk whole (VTK's file
// output does not report a full disk).
void write_grid(const std::string& path, vtkUnstructuredGrid* grid) {
  vtkNew<vtkXMLUnstructuredGridWriter> writer;
  writer->WriteToOutputStringOn();
  writer->SetInputData(grid);
  writer->SetDataModeToBinary();
  if (writer->Write() != 1) throw OutputError(path, "VTK could not render the grid");
  write_file_whole(path, writer->GetOutputString());
}

}  // namespace

void write_mesh_vtu(const std::string& path, const Mesh& mesh, const BandMesh* band,
                    const std::vector<std::pair<std::string, std::vector<double>>>& cell_fields) {
  const int per = mesh.nodes_per_triangle();
  const int cell_type = mesh.order == 1 ? VTK_TRIANGLE : VTK_QUADRATIC_TRIANGLE;
  const int band_region = mesh.region_index("moving_band");
  const double rotor_angle = band ? band->rotor_angle_rad : 0.0;
  const Eigen::Rotation2Dd turn(rotor_angle);

  vtkNew<vtkPoints> points;
  points->SetDataTypeToDouble();
  for (std::size_t i = 0; i < mesh.nodes.size(); ++i) {
    const Vec2 p = mesh.node_on_rotor[i] ? Vec2(turn * mesh.nodes[i]) : mesh.nodes[i];
    points->InsertNextPoint(p.x(), p.y(), 0.0);
  }

  vtkNew<vtkUnstructuredGrid> grid;
  vtkNew<vtkIntArray> region_id, tooth, side;
  region_id->SetName("region_id");
  tooth->SetName("tooth_index");
  side->SetName("side");
  grid->Allocate(static_cast<vtkIdType>(mesh.n_triangles()));
  for (std::size_t t = 0; t < mesh.n_triangles(); ++t) {
    vtkIdType ids[6];
    for (int i = 0; i < per; ++i) ids[i] = mesh.triangles[t * per + i];
    grid->InsertNextCell(cell_type, per, ids);
    const MeshRegion& region = mesh.regions[mesh.triangle_region[t]];
    region_id->InsertNextValue(region.id);
    tooth->InsertNextValue(mesh.tooth_index[t]);
    side->InsertNextValue(is_rotor_side(region.tag.kind) ? 1 : 0);
  }
  if (band) {
    // Band corners get points of their own, at their position for this rotor angle.
    for (const BandElement& e : band->elements) {
      vtkIdType ids[6];
      for (int i = 0; i < per; ++i) {
        const Vec2& p = e.corners[i].position_m;
        ids[i] = points->InsertNextPoint(p.x(), p.y(), 0.0);
      }
      grid->InsertNextCell(cell_type, per, ids);
      region_id->InsertNextValue(band_region >= 0 ? mesh.regions[band_region].id : 0);
      tooth->InsertNextValue(-1);
      side->InsertNextValue(2);
    }
  }
  grid->SetPoints(points);
  grid->GetCellData()->AddArray(region_id);
  grid->GetCellData()->AddArray(tooth);
  grid->GetCellData()->AddArray(side);
  for (const auto& [name, values] : cell_fields) {
    vtkNew<vtkDoubleArray> arr;
    arr->SetName(name.c_str());
    for (std::size_t t = 0; t < mesh.n_triangles(); ++t) arr->InsertNextValue(values.at(t));
    if (band)
      for (std::size_t e = 0; e < band->elements.size(); ++e) arr->InsertNextValue(0.0);
    grid->GetCellData()->AddArray(arr);
  }

  vtkNew<vtkIntArray> ids;
  // Names as NUL-terminated UTF-8 bytes in region_ids order: plain numeric arrays that every
  // VTU reader understands (string arrays are not).
  vtkNew<vtkUnsignedCharArray> names;
  ids->SetName("region_ids");
  names->SetName("region_names");
  for (const MeshRegion& r : mesh.regions) {
    ids->InsertNextValue(r.id);
    for (char ch : r.name) names->InsertNextValue(static_cast<unsigned char>(ch));
    names->InsertNextValue(0);
  }
  grid->GetFieldData()->AddArray(ids);
  grid->GetFieldData()->AddArray(names);

  write_grid(path, grid);
}

}  // namespace gapflux

namespace gapflux {

void write_fields_vtu(const std::string& path, const FieldSnapshot& s) {
  const int per = s.order == 1 ? 3 : 6;
  const int cell_type = s.order == 1 ? VTK_TRIANGLE : VTK_QUADRATIC_TRIANGLE;
  vtkNew<vtkPoints> points;
  points->SetDataTypeToDouble();
  vtkNew<vtkDoubleArray> a;
  a->SetName("A");
  vtkNew<vtkUnstructuredGrid> grid;
  grid->Allocate(static_cast<vtkIdType>(s.nodes.size()));
  // Corners get points of their own: band and mesh triangles alike, no shared-node bookkeeping.
  for (std::size_t e = 0; e < s.nodes.size(); ++e) {
    vtkIdType ids[6];
    for (int i = 0; i < per; ++i) {
      const Vec2& p = s.nodes[e].x[i];
      ids[i] = points->InsertNextPoint(p.x(), p.y(), 0.0);
      a->InsertNextValue(s.corner_values[e][i]);
    }
    grid->InsertNextCell(cell_type, per, ids);
  }
  grid->SetPoints(points);
  grid->GetPointData()->AddArray(a);
  const auto add_cell = [&](const char* name, const std::vector<double>& values) {
    vtkNew<vtkDoubleArray> arr;
    arr->SetName(name);
    for (double v : values) arr->InsertNextValue(v);
    grid->GetCellData()->AddArray(arr);
  };
  std::vector<double> bx, by;
  for (const Vec2& b : s.b_tesla) {
    bx.push_back(b.x());
    by.push_back(b.y());
  }
  add_cell("Bx", bx);
  add_cell("By", by);
  add_cell("B_abs", s.b_abs_tesla);
  add_cell("mu_r", s.mu_r);
  if (!s.current_density.empty()) add_cell("J", s.current_density);
  vtkNew<vtkIntArray> region;
  region->SetName("region_id");
  for (int r : s.region_id) region->InsertNextValue(r);
  grid->GetCellData()->AddArray(region);
  vtkNew<vtkIntArray> side;
  side->SetName("side");
  for (int v : s.side) side->InsertNextValue(v);
  grid->GetCellData()->AddArray(side);
  write_grid(path, grid);
}

void write_pvd(const std::string& path, const std::vector<std::pair<double, std::string>>& files) {
  std::ostringstream out;
  out << "<?xml version=\"1.0\"?>\n<VTKFile type=\"Collection\" version=\"0.1\">\n  <Collection>\n";
  out.precision(17);
  for (const auto& [time, file] : files)
    out << "    <DataSet timestep=\"" << time << "\" part=\"0\" file=\"" << file << "\"/>\n";
  out << "  </Collection>\n</VTKFile>\n";
  write_file_whole(path, out.str());
}

}  // namespace gapflux
