"""`gapflux run` outputs read with independent readers: results.h5 with h5py, the field VTU with
meshio, summary.json with json (Debian's python3-h5py, python3-meshio).

Usage: test_run_outputs.py GAPFLUX EXAMPLES_DIR TMP_DIR
Checks: every dataset has a `units` attribute; shapes agree with the mesh; the airgap samples
are uniform on the mid-band circle; phase a, at its peak current, links the most flux; the VTU holds one cell per element with its fields;
summary.json carries the stable keys; a run stopped by its iteration limit exits 3 and still
leaves readable files.
"""
import json
import os
import shutil
import subprocess
import sys

import h5py
import meshio
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)  # each run starts from an empty scratch folder
os.makedirs(tmp)
from tally import check, finish


case = os.path.join(examples, "compressor_2p24s.toml")
out = os.path.join(tmp, "run_compressor")
run = subprocess.run([gapflux, "run", case, "--out", out], capture_output=True, text=True)
check(run.returncode == 0, f"run failed ({run.returncode}): {run.stderr}")

with h5py.File(os.path.join(out, "results.h5"), "r") as f:
    datasets = []
    f.visititems(lambda name, obj: datasets.append((name, obj)) if isinstance(obj, h5py.Dataset) else None)
    check(len(datasets) >= 15, f"only {len(datasets)} datasets")
    for name, d in datasets:
        check("units" in d.attrs, f"dataset {name} has no units attribute")
    nodes = f["mesh/nodes"][...]
    tri = f["mesh/triangles"][...]
    check(nodes.shape[1] == 2 and tri.shape[1] == 6, f"mesh shapes {nodes.shape} {tri.shape}")
    check(f["field/A"].shape == (nodes.shape[0],), "A is not one value per node")
    check(f["field/B"].shape == (tri.shape[0], 2), "B is not one vector per triangle")
    check(f["field/B_abs"].shape == (tri.shape[0],), "B_abs shape")
    b = f["field/B"][...]
    check(np.allclose(np.hypot(b[:, 0], b[:, 1]), f["field/B_abs"][...], rtol=1e-12), "|B| differs from B")
    check(tri.max() < nodes.shape[0] and tri.min() >= 0, "triangle node index out of range")
    theta = f["airgap/theta"][...]
    d_theta = np.diff(theta)
    check(np.allclose(d_theta, d_theta[0], rtol=1e-12, atol=0), "airgap samples not uniform")
    check(abs(theta[-1] + d_theta[0] / 2 - np.pi) < 1e-9, "samples do not cover the half-model sector")
    psi = f["winding/flux_linkage"][...]
    current = f["winding/phase_current"][...]
    # At t = 0 phase a carries the peak current; its flux linkage is the largest and positive.
    check(np.argmax(psi) == 0 and psi[0] > 0 and current[0] > 0, f"flux linkages {psi}")
    check(f.attrs["converged"] == 1 and f.attrs["steps_done"] == 1, "root attributes")
    names = [n.decode() if isinstance(n, bytes) else n for n in f["mesh/region_names"][...]]
    check("stator_iron" in names and "moving_band" in names, "region names")

summary = json.load(open(os.path.join(out, "summary.json")))
check(summary["schema"] == "gapflux-summary/1", "schema")
for key in ["vertices", "triangles", "order", "dofs", "min_angle_deg"]:
    check(key in summary["mesh"], f"summary.mesh.{key} missing")
# The compressor's default sizes: scale 1.4 of the base (its band of 1560 nodes is finer), the
# convergence study's figure there (geometry/src/mesh_forecast.cpp).
check(abs(summary["mesh"]["scale"] - 1.4) < 1e-9 and summary["mesh"]["accuracy_pct"] == 0.249
      and summary["mesh"]["accuracy_basis"] == "measured", f"mesh accuracy {summary['mesh']}")
for key in ["slots", "poles", "layers", "coil_pitch_slots", "factors"]:
    check(key in summary["winding"], f"summary.winding.{key} missing")
for key in ["steps", "newton_iterations", "newton_factorizations", "cg_iterations", "wall_s"]:
    check(key in summary["solver"], f"summary.solver.{key} missing")
check(summary["winding"]["factors"][0]["order"] == 1, "first winding factor is not the fundamental")
# The residual history ends with the converged value, below the tolerance (default 1e-8).
history = summary["solver"]["residual_history"]
check(len(history) == summary["solver"]["newton_iterations"] + 1,
      f"{len(history)} residuals for {summary['solver']['newton_iterations']} iterations")
check(history[-1] < 1e-8 <= history[0], f"history does not end converged: {history[-3:]}")
with h5py.File(os.path.join(out, "results.h5"), "r") as f:
    check(np.allclose(f["solver/relative_residual"][...], history, rtol=1e-12),
          "results.h5's residual history differs from summary.json's")

vtu = meshio.read(os.path.join(out, "fields", "step_00000.vtu"))
cells = sum(len(c.data) for c in vtu.cells)
check(cells == summary["mesh"]["triangles"] + 2 * 1560 // 2, f"VTU has {cells} cells")
for name in ["Bx", "By", "B_abs", "mu_r", "region_id"]:
    check(name in vtu.cell_data, f"VTU cell field {name} missing")
check("A" in vtu.point_data, "VTU point field A missing")
pvd = open(os.path.join(out, "fields.pvd")).read()
check("fields/step_00000.vtu" in pvd, "fields.pvd does not list the step")

# The report of a static run, and of folders that hold no run: a page, or one clear line.
make_report = os.path.join(os.path.dirname(__file__), "..", "..", "postproc", "report", "make_report.py")
rep = subprocess.run([sys.executable, make_report, out], capture_output=True, text=True)
check(rep.returncode == 0, f"static report failed: {rep.stderr[-500:]}")
page = open(os.path.join(out, "report.html")).read() if rep.returncode == 0 else ""
for part in ("<h2>Field</h2>", "<h2>Airgap field</h2>", "Saturation at this instant"):
    check(part in page, f"static report lacks {part}")
for folder in (os.path.join(tmp, "no_such_folder"), tmp):
    rep = subprocess.run([sys.executable, make_report, folder], capture_output=True, text=True)
    check(rep.returncode != 0 and "Traceback" not in rep.stderr and folder in rep.stderr,
          f"report on {folder}: exit {rep.returncode}, {rep.stderr.strip()[-300:]}")

# A static study honours imposed bar currents: the field changes with them (it used to ignore
# them while summary.json said they were imposed).
imposed = open(case).read().replace("bars = 20\n", "bars = 20\nbar_currents = \"imposed\"\n", 1)
imposed = imposed.replace("[supply]", "[rotor_currents]\nbar_rms_a = 150.0\nangle_deg = 160.0\n\n[supply]", 1)


def run_text(text, name):
    """Writes `text` as TMP/NAME.toml and runs it into TMP/run_NAME; returns the folder."""
    path, folder = os.path.join(tmp, name + ".toml"), os.path.join(tmp, "run_" + name)
    open(path, "w").write(text)
    r = subprocess.run([gapflux, "run", path, "--out", folder], capture_output=True, text=True)
    check(r.returncode == 0, f"{name}: run failed: {r.stderr[-400:]}")
    return folder


imposed_out = run_text(imposed, "imposed")
si = json.load(open(os.path.join(imposed_out, "summary.json")))
change = abs(si["field"]["energy_j"] - summary["field"]["energy_j"]) / summary["field"]["energy_j"]
check(change > 0.01, f"imposed bar currents changed the stored energy by only {100 * change:.3f} %")
check(si["rotor_currents"]["bar_rms_a"] == 150.0, "the imposed set is not reported")
check("static study" in summary["rotor_currents"]["note"], "a static study's induced cage is not explained")

# A time-stepping run's summary: real figures over time, nothing that belongs to one instant.
ts_text = open(case).read().replace(
    "[mesh]", "[study]\nkind = \"time_stepping\"\nsteps_per_period = 24\nperiods = 0.25\n"
    "motion = \"slip\"\nslip = 0.05\n\n[output]\nfields_every = 100\n\n[mesh]")
ts_out = run_text(ts_text, "stepping")
ts = json.load(open(os.path.join(ts_out, "summary.json")))
with h5py.File(os.path.join(ts_out, "results.h5"), "r") as f:
    b = f["steps/B"][...].reshape(f["steps/B"].shape[0], -1, 2)
    peak = np.hypot(b[..., 0], b[..., 1]).max()
    psi_last = f["steps/flux_linkage"][-1]
check(abs(ts["field"]["b_peak_tesla"] - peak) <= 1e-12 * peak, f"b_peak {ts['field']['b_peak_tesla']} vs {peak}")
check(np.allclose(ts["field"]["flux_linkage_wb"], psi_last, rtol=1e-12), "flux linkage of the last step")
check("energy_j" not in ts["field"] and "coenergy_j" not in ts["field"], "energies reported as zeros")
check("instant" not in ts["supply"], "a one-instant supply block in a time-stepping summary")
check(ts["study"].get("band_pitches_per_step", 1) > 0, "band_pitches_per_step = -1 reported")

# A run cut short by its iteration limit: exit code 3, files written, marked unconverged.
text = open(case).read().replace("[mesh]", "[solver]\nmax_iterations = 1\n\n[mesh]")
short_case = os.path.join(tmp, "short.toml")
open(short_case, "w").write(text)
short_out = os.path.join(tmp, "run_short")
run = subprocess.run([gapflux, "run", short_case, "--out", short_out], capture_output=True, text=True)
check(run.returncode == 3, f"iteration limit gave exit code {run.returncode}")
check("did not converge" in run.stderr, "no diagnostic on stderr")
with h5py.File(os.path.join(short_out, "results.h5"), "r") as f:
    check(f.attrs["converged"] == 0 and f.attrs["steps_done"] == 0, "unconverged run not marked")
    check(len(f["solver/relative_residual"][...]) >= 1, "iteration history missing")
short_summary = json.load(open(os.path.join(short_out, "summary.json")))
check("failure" in short_summary["solver"], "summary has no failure text")

finish()
