"""A time-stepping run killed with SIGKILL keeps every finished step; --resume completes it and
the result equals an uninterrupted run.

Usage: test_kill_resume.py GAPFLUX EXAMPLES_DIR TMP_DIR
The killed file is read with h5py (Debian's python3-h5py). The resumed run restarts Newton from
the saved solution without the two-step predictor, so it agrees with the uninterrupted one to
solver tolerance (1e-6 relative on the torque), not bit for bit.
"""
import os
import shutil
import signal
import subprocess
import sys

import h5py
import json
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)  # each run starts from an empty scratch folder
os.makedirs(tmp)
from processes import run_and_kill
from tally import check, finish


text = open(os.path.join(examples, "compressor_2p24s.toml")).read()
text = text.replace("band_nodes = 1560", "band_nodes = 720\nairgap_size_mm = 0.3\niron_size_mm = 4.0")
text = text.replace("[mesh]", "[study]\nkind = \"time_stepping\"\nsteps_per_period = 24\nperiods = 0.5\n"
                    "motion = \"slip\"\nslip = 0.05\n\n[output]\nfields_every = 4\n\n[mesh]")
case = os.path.join(tmp, "stepping.toml")
open(case, "w").write(text)

whole, killed = os.path.join(tmp, "whole"), os.path.join(tmp, "killed")
for d in (whole, killed):
    shutil.rmtree(d, ignore_errors=True)

run = subprocess.run([gapflux, "run", case, "--out", whole], capture_output=True, text=True)
check(run.returncode == 0, f"uninterrupted run failed: {run.stderr}")

# Kill once three steps have been reported (the log line follows the step's flush).
status = run_and_kill([gapflux, "run", case, "--out", killed], 3)
check(status == -signal.SIGKILL, f"the run was not killed (exit {status})")

with h5py.File(os.path.join(killed, "results.h5"), "r") as f:
    done = int(f.attrs["steps_done"])
    check(done >= 3, f"steps_done = {done} after three reported steps")
    rows = f["steps/torque"].shape[0]
    check(rows >= done, f"{rows} torque rows for {done} finished steps")
    check(f["steps/A"].shape[0] >= done, "fewer field rows than finished steps")
    check(f["steps/A"].attrs["units"] in (b"Wb/m", "Wb/m"), "units of steps/A")

run = subprocess.run([gapflux, "run", case, "--out", killed, "--resume"], capture_output=True, text=True)
check(run.returncode == 0, f"resume failed: {run.stderr}")
check("resuming at step" in run.stderr, "resume did not say where it started")

with h5py.File(os.path.join(whole, "results.h5"), "r") as a, h5py.File(os.path.join(killed, "results.h5"), "r") as b:
    check(int(b.attrs["steps_done"]) == int(a.attrs["steps_done"]) == 12, "steps_done after resume")
    ta, tb = a["steps/torque"][:, 0], b["steps/torque"][:, 0]
    check(ta.shape == tb.shape, f"torque rows {ta.shape} vs {tb.shape}")
    if ta.shape == tb.shape:
        scale = np.abs(ta).max()
        check(np.abs(ta - tb).max() <= 1e-6 * scale + 1e-12, f"torque differs: {np.abs(ta - tb).max()}")
    pa, pb = a["steps/flux_linkage"][...], b["steps/flux_linkage"][...]
    check(pa.shape == pb.shape and np.abs(pa - pb).max() <= 1e-6 * np.abs(pa).max(), "flux linkages differ")
    check(np.allclose(a["steps/time"][...], b["steps/time"][...], rtol=0, atol=1e-15), "times differ")
    # The solver's totals in summary.json count the whole run, not only the resumed part.
    sa = json.load(open(os.path.join(whole, "summary.json")))["solver"]
    sb = json.load(open(os.path.join(killed, "summary.json")))["solver"]
    for key, rows in [("newton_iterations", "steps/newton_iterations"),
                      ("newton_factorizations", "steps/newton_factorizations")]:
        total = int(round(float(b[rows][...].sum())))
        check(sb[key] == total, f"resumed summary {key} {sb[key]} vs its steps' sum {total}")
        check(sb[key] == sa[key], f"resumed summary {key} {sb[key]} vs uninterrupted {sa[key]}")
    check(0 < sb["newton_factorizations"] <= sb["newton_iterations"], "factorisations out of range")
pvd = open(os.path.join(killed, "fields.pvd")).read()
check(pvd.count("<DataSet") == 3, f"fields.pvd lists {pvd.count('<DataSet')} files, expected 3")

finish()
