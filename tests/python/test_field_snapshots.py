"""Field snapshots: the time series opens in VTK's own reader and draws the rotor over the stator.

Usage: test_field_snapshots.py GAPFLUX EXAMPLES_DIR TMP_DIR
- fields.case (EnSight Gold) is read by VTK's vtkGenericEnSightReader (Debian's python3-vtk9):
  one time value per snapshot, and at each the same cells and the same A and B as the .vtu of
  that step read by meshio (Debian's python3-meshio), to single precision (EnSight Gold stores
  32-bit floats: 1e-6 relative);
- a sector model's rotor is drawn in the copy that faces the stator sector: at every snapshot the
  rotor cells' corners lie within the sector's angles (to one rotor cell's width at the edges) and
  they cover it; A is continuous across the band, so the largest jump of A between a rotor cell
  corner and the band cell corner at the same place is at round-off (the antiperiodic sign of the
  turned copies applied: (−1)^m per sector, design.md §2).
"""
import os
import shutil
import subprocess
import sys

import meshio
import numpy as np
from vtkmodules.util.numpy_support import vtk_to_numpy
from vtkmodules.vtkIOEnSight import vtkGenericEnSightReader

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)
os.makedirs(tmp)
sys.path.insert(0, os.path.dirname(__file__))
from small_run import small_case
from tally import check, finish

case = small_case(examples, tmp, fields_every=5, steps=24)
out = os.path.join(tmp, "run")
r = subprocess.run([gapflux, "run", case, "--out", out], capture_output=True, text=True)
check(r.returncode == 0, f"run failed: {r.stderr[-500:]}")
steps = list(range(0, 24, 5))

reader = vtkGenericEnSightReader()
reader.SetCaseFileName(os.path.join(out, "fields.case"))
reader.ReadAllVariablesOn()
reader.UpdateInformation()
times = reader.GetTimeSets().GetItem(0)
check(times.GetNumberOfTuples() == len(steps), f"{times.GetNumberOfTuples()} times, {len(steps)} snapshots")

sector = np.pi / 2  # 24 slots, 4 poles, smooth rotor: a quarter, antiperiodic
for k, step in enumerate(steps):
    reader.SetTimeValue(times.GetValue(k))
    reader.Update()
    block = reader.GetOutput().GetBlock(0)
    vtu = meshio.read(os.path.join(out, "fields", f"step_{step:05d}.vtu"))
    cells = np.concatenate([c.data for c in vtu.cells])
    check(block.GetNumberOfCells() == len(cells), f"step {step}: {block.GetNumberOfCells()} vs {len(cells)} cells")
    a_ens = vtk_to_numpy(block.GetPointData().GetArray("A"))
    b_ens = vtk_to_numpy(block.GetCellData().GetArray("B"))
    a_vtu = vtu.point_data["A"]
    b_vtu = np.column_stack([np.concatenate(vtu.cell_data["Bx"]), np.concatenate(vtu.cell_data["By"])])
    check(np.abs(a_ens - a_vtu).max() <= 1e-6 * np.abs(a_vtu).max(), f"step {step}: A differs")
    check(np.abs(b_ens[:, :2] - b_vtu).max() <= 1e-6 * np.abs(b_vtu).max(), f"step {step}: B differs")

    # The rotor over the stator sector.
    side = np.concatenate(vtu.cell_data["side"])
    pts = vtu.points[:, :2]
    angles = np.arctan2(pts[:, 1], pts[:, 0])
    rotor_cells = cells[side == 1][:, :3]
    rotor_pts = np.unique(rotor_cells.ravel())
    # Corner angles in (−π, π]: the sector is [0, π/2]; every rotor cell must reach into it.
    corner = angles[rotor_cells]
    inside = ((corner > -1e-9) & (corner < sector + 1e-9)).any(axis=1)
    check(inside.all(), f"step {step}: {np.count_nonzero(~inside)} rotor cells drawn off the stator sector")
    a_rot = angles[rotor_pts]
    check(a_rot.min() < 1e-6 and a_rot.max() > sector - 1e-6, f"step {step}: rotor does not cover the sector")
    # Continuity of A across the band's rotor-side circle: corners at the same place agree.
    band_pts = np.unique(cells[side == 2][:, :3].ravel())
    key = lambda i: (round(pts[i, 0] * 1e7), round(pts[i, 1] * 1e7))
    rotor_a = {key(i): a_vtu[i] for i in rotor_pts}
    jumps = [abs(rotor_a[key(i)] - a_vtu[i]) for i in band_pts if key(i) in rotor_a]
    check(len(jumps) > 10, f"step {step}: {len(jumps)} shared band corners")
    if jumps:
        check(max(jumps) <= 1e-9 * np.abs(a_vtu).max(), f"step {step}: A jumps by {max(jumps):.3e} across the band")

finish()
