"""What happens to an output folder when runs collide, repeat, change or are stopped.

Usage: test_output_integrity.py GAPFLUX EXAMPLES_DIR TMP_DIR
Read back with h5py (Debian's python3-h5py). Each check is a property of the outputs, not of
the physics:
- two runs into one folder at once: the second is refused (exit 1, the message names the
  folder) and the first ends with a whole, readable results.h5;
- the same --out twice: refused (exit 2, naming the files found) unless --replace, which removes
  the earlier run's files (stale snapshots, saturation map, report) before writing;
- --resume with a changed case: refused with exit 2, naming the key and both values; the
  stored file is untouched; --resume into an empty folder says it starts afresh;
- SIGTERM and SIGINT: the run stops after the step in hand with exit 143 / 130, says where,
  and results.h5 holds exactly steps_done rows in every per-step dataset; --resume completes it
  to the uninterrupted run's torque (1e-6 relative: the resumed warm start differs only within
  the Newton tolerance);
- --out naming a file, a folder given as the case: exit 2 with a message naming it.
"""
import json
import os
import shutil
import signal
import subprocess
import sys
import time

import h5py
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)  # each run starts from an empty scratch folder
os.makedirs(tmp)
sys.path.insert(0, os.path.dirname(__file__))
from small_run import small_case
from tally import check, finish

case = small_case(examples, tmp)


def run(*args):
    return subprocess.run([gapflux, "run", *args], capture_output=True, text=True)


def fresh(name):
    d = os.path.join(tmp, name)
    shutil.rmtree(d, ignore_errors=True)
    return d


def rows_match_steps_done(path):
    with h5py.File(path, "r") as f:
        done = int(f.attrs["steps_done"])
        rows = {k: f["steps/" + k].shape[0] for k in f["steps"]}
    return done, all(r == done for r in rows.values()), rows


# The uninterrupted reference.
whole = fresh("whole")
r = run(case, "--out", whole)
check(r.returncode == 0, f"reference run failed: {r.stderr}")
with h5py.File(os.path.join(whole, "results.h5"), "r") as f:
    torque_whole = f["steps/torque"][:, 0]
    check(len(f.attrs["case_fingerprint"]) == 16, "results.h5 carries the case fingerprint")
    check(f.attrs["program_version"] != "", "results.h5 carries the program version")

# 1. Two runs into one folder at once.
shared = fresh("shared")
first = subprocess.Popen([gapflux, "run", case, "--out", shared], stdout=subprocess.DEVNULL,
                         stderr=subprocess.PIPE, text=True)
for line in first.stderr:
    if line.startswith("step 2/"):
        break
second = run(case, "--out", shared, "--replace")
rest = first.stderr.read()
first.wait()
check(second.returncode == 1, f"second run into a busy folder: exit {second.returncode}")
check("in use" in second.stderr and shared in second.stderr,
      f"the refusal names the folder: {second.stderr.strip()}")
check(first.returncode == 0, f"the first run failed beside the refused one: {rest[-500:]}")
done, consistent, rows = rows_match_steps_done(os.path.join(shared, "results.h5"))
check(done == 24 and consistent, f"the first run's file after the refusal: {done} done, {rows}")

# 2. The same --out twice; --replace clears the earlier run's files.
again = run(case, "--out", whole)
check(again.returncode == 2, f"a second run into a used folder: exit {again.returncode}")
check("results.h5" in again.stderr and "--replace" in again.stderr,
      f"the refusal names the files and the way out: {again.stderr.strip()}")
stale = [os.path.join(whole, "report.html"), os.path.join(whole, "fields", "step_00008.vtu")]
for p in stale:
    open(p, "w").write("stale")
keep = os.path.join(whole, "notes.txt")  # not ours: must survive
open(keep, "w").write("the user's own file")
replaced = run(case, "--out", whole, "--replace")
check(replaced.returncode == 0, f"--replace failed: {replaced.stderr}")
check(not any(os.path.exists(p) for p in stale), "stale outputs of the earlier run remain")
check(os.path.exists(keep), "--replace removed a file that no run writes")

# 3. --resume with a changed case; --resume into an empty folder.
changed = small_case(examples, tmp, name="changed.toml", slip=0.06)
with h5py.File(os.path.join(whole, "results.h5"), "r") as f:
    before = f["steps/torque"][...].copy()
r = run(changed, "--out", whole, "--resume")
check(r.returncode == 2, f"resume with a changed slip: exit {r.returncode}")
check("study.slip: 0.05 → 0.06" in r.stderr, f"the refusal names the change: {r.stderr.strip()}")
with h5py.File(os.path.join(whole, "results.h5"), "r") as f:
    check(np.array_equal(f["steps/torque"][...], before), "a refused resume changed the file")
empty = fresh("empty")
r = run(case, "--out", empty, "--resume")
check(r.returncode == 0 and "starting afresh" in r.stderr,
      f"resume into an empty folder: exit {r.returncode}, {r.stderr[-300:]}")

# 4. SIGTERM and SIGINT stop after the step in hand; --resume completes the run.
for sig, code in ((signal.SIGTERM, 143), (signal.SIGINT, 130)):
    d = fresh(f"stopped_{sig.name}")
    proc = subprocess.Popen([gapflux, "run", case, "--out", d], stdout=subprocess.PIPE,
                            stderr=subprocess.PIPE, text=True)
    for line in proc.stderr:
        if line.startswith("step 5/"):
            proc.send_signal(sig)
            break
    err = proc.stderr.read()
    proc.wait()
    check(proc.returncode == code, f"{sig.name}: exit {proc.returncode}, expected {code}")
    check(f"interrupted by {sig.name}" in err, f"{sig.name}: no word of where it stopped: {err[-300:]}")
    done, consistent, rows = rows_match_steps_done(os.path.join(d, "results.h5"))
    check(5 <= done < 24 and consistent, f"{sig.name}: {done} steps done, rows {rows}")
    s = json.load(open(os.path.join(d, "summary.json")))
    check(not s["solver"]["converged"] and "interrupted" in s["solver"]["failure"],
          f"{sig.name}: summary.json does not say it was interrupted")
    r = run(case, "--out", d, "--resume")
    check(r.returncode == 0, f"{sig.name}: resume failed: {r.stderr[-300:]}")
    with h5py.File(os.path.join(d, "results.h5"), "r") as f:
        t = f["steps/torque"][:, 0]
        check(t.shape == torque_whole.shape and
              np.abs(t - torque_whole).max() <= 1e-6 * np.abs(torque_whole).max(),
              f"{sig.name}: resumed torque differs from the uninterrupted run")

# 5. Paths that are not what they should be.
r = run(case, "--out", case)
check(r.returncode == 2 and "is a file" in r.stderr, f"--out naming a file: {r.stderr.strip()}")
r = run(tmp, "--out", fresh("dir_as_case"))
check(r.returncode == 2 and "is a folder" in r.stderr, f"a folder as the case: {r.stderr.strip()}")

finish()
