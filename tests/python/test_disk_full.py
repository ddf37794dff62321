"""A run whose output disk fills: it stops with exit 1 and a message naming the file, results.h5
keeps exactly the steps written before (every per-step dataset has steps_done rows, equal to an
uninterrupted run's), and --resume after space is freed completes the run.

Usage: test_disk_full.py GAPFLUX EXAMPLES_DIR TMP_DIR
A real full disk: a small tmpfs mounted for the test (needs root, as CI runs; without the right
to mount, the check reports itself skipped with exit 77). Read back with h5py (Debian's
python3-h5py). The disk is filled by another process while the run steps (the way a shared disk
fills on a plant server), so the stop comes either from the check of free space before each step
or from a write that failed inside a step; both must leave the same consistent file. A static run
on a full disk leaves no half-written results.h5.
"""
import os
import shutil
import subprocess
import sys

import h5py
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
os.makedirs(tmp, exist_ok=True)
sys.path.insert(0, os.path.dirname(__file__))
from small_run import small_case
from tally import check, finish

disk = os.path.join(tmp, "disk")
if os.path.ismount(disk):
    subprocess.run(["umount", disk])
shutil.rmtree(disk, ignore_errors=True)
os.makedirs(disk)
mounted = subprocess.run(["mount", "-t", "tmpfs", "-o", "size=40M", "tmpfs", disk],
                         capture_output=True, text=True)
if mounted.returncode != 0:
    print(f"SKIP: cannot mount a tmpfs for a full disk ({mounted.stderr.strip()})")
    sys.exit(77)


def fill(path):
    """Fills the disk that holds `path` to the last byte."""
    with open(path, "wb") as f:
        block = b"\0" * 65536
        try:
            while True:
                f.write(block)
                f.flush()
        except OSError:
            pass
    try:
        with open(path, "ab") as f:  # the last partial block
            while True:
                f.write(b"\0")
                f.flush()
    except OSError:
        pass


try:
    case = small_case(examples, tmp)
    whole = os.path.join(tmp, "whole")
    shutil.rmtree(whole, ignore_errors=True)
    r = subprocess.run([gapflux, "run", case, "--out", whole], capture_output=True, text=True)
    check(r.returncode == 0, f"reference run failed: {r.stderr}")
    with h5py.File(os.path.join(whole, "results.h5"), "r") as f:
        torque_whole = f["steps/torque"][:, 0]
        a_whole = f["steps/A"][...]

    # The disk fills while the run steps.
    out, filler = os.path.join(disk, "run"), os.path.join(disk, "filler")
    proc = subprocess.Popen([gapflux, "run", case, "--out", out], stdout=subprocess.DEVNULL,
                            stderr=subprocess.PIPE, text=True)
    for line in proc.stderr:
        if line.startswith("step 3/"):
            fill(filler)
            break
    err = proc.stderr.read()
    proc.wait()
    check(proc.returncode == 1, f"exit {proc.returncode} on a full disk (1 expected): {err[-400:]}")
    check("cannot write" in err and out in err, f"the message names the file: {err[-400:]}")
    check("terminate" not in err and "Traceback" not in err, "an uncaught failure")
    with h5py.File(os.path.join(out, "results.h5"), "r") as f:
        done = int(f.attrs["steps_done"])
        rows = {k: f["steps/" + k].shape[0] for k in f["steps"]}
        check(3 <= done < 24, f"steps_done = {done}")
        check(all(n == done for n in rows.values()), f"rows past steps_done = {done}: {rows}")
        a = f["steps/A"][...]
        check(np.array_equal(a, a_whole[:done]), "the kept steps differ from the uninterrupted run")
        check(bool(np.all(np.abs(a).max(axis=1) > 0)), "a kept step holds zeros")

    # Space freed: --resume completes the run.
    os.remove(filler)
    r = subprocess.run([gapflux, "run", case, "--out", out, "--resume"], capture_output=True,
                       text=True)
    check(r.returncode == 0, f"resume after freeing space failed: {r.stderr[-400:]}")
    with h5py.File(os.path.join(out, "results.h5"), "r") as f:
        t = f["steps/torque"][:, 0]
        check(int(f.attrs["steps_done"]) == 24, "steps_done after the resume")
        check(t.shape == torque_whole.shape and
              np.abs(t - torque_whole).max() <= 1e-6 * np.abs(torque_whole).max(),
              "resumed torque differs from the uninterrupted run (1e-6)")

    # A static run on a disk that is already full: no results.h5 under its name.
    shutil.rmtree(out)
    fill(filler)
    static_out = os.path.join(disk, "static")
    r = subprocess.run([gapflux, "run", os.path.join(examples, "reference_radial_4p24s.toml"),
                        "--out", static_out], capture_output=True, text=True)
    check(r.returncode == 1, f"static run on a full disk: exit {r.returncode}: {r.stderr[-300:]}")
    check("cannot write" in r.stderr, f"static run's message: {r.stderr[-300:]}")
    left = [n for n in os.listdir(static_out) if n.endswith(".partial")] if os.path.isdir(static_out) else []
    check(not left, f"half-written files left: {left}")
    check(not os.path.exists(os.path.join(static_out, "results.h5")) or
          h5py.is_hdf5(os.path.join(static_out, "results.h5")), "a broken results.h5")
finally:
    subprocess.run(["umount", disk])

finish()
