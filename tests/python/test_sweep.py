"""Sweeps on local worker processes: the expanded cases, the collected table, a sweep killed
midway and rerun, a bad value in the middle of a range, another sweep into the same folder, and
a lean run against a full one.

Usage: test_sweep.py GAPFLUX EXAMPLES_DIR TMP_DIR
The cases are the small smooth-rotor reference case (tests/python/small_run.py); its physics is
not what this checks. Case files are read back with Python's tomllib, the tables with the csv
module and h5py (Debian's python3-h5py), independently of gapflux's own readers.
"""
import csv
import json
import math
import os
import shutil
import signal
import subprocess
import sys
import time
import tomllib

import h5py

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)
os.makedirs(tmp)
from small_run import small_case
from tally import check, finish

base = small_case(examples, tmp, name="base.toml", steps=24)

SWEEP = """
[sweep]
base_case = "base.toml"
combine = "product"
outputs = ["torque.mean_nm", "supply.current_sequence.positive_a", "field.b_peak_tesla",
           "losses.copper_w", "mesh.dofs"]
workers = 2

[[sweep.vary]]
key = "supply.rms_a"
values = [8.0, 12.0]

[[sweep.vary]]
key = "study.slip"
range = { from = 0.02, to = 0.06, step = 0.02 }
"""
sweep = os.path.join(tmp, "sweep.toml")
open(sweep, "w").write(SWEEP)
out = os.path.join(tmp, "six")
r = subprocess.run([gapflux, "sweep", sweep, "--out", out], capture_output=True, text=True)
check(r.returncode == 0, f"6-case sweep: exit {r.returncode}: {r.stdout[-600:]} {r.stderr[-600:]}")

# 1. The expanded cases equal hand-written ones: the base with the two keys set by hand.
base_toml = tomllib.load(open(base, "rb"))
manifest = json.load(open(os.path.join(out, "manifest.json")))
expected = [(a, s) for a in (8.0, 12.0) for s in (0.02, 0.04, 0.06)]  # first key slowest
check(len(manifest["cases"]) == 6, f"{len(manifest['cases'])} cases, expected 6")
for case, (rms, slip) in zip(manifest["cases"], expected):
    hand = json.loads(json.dumps(base_toml))
    hand["supply"]["rms_a"] = rms
    hand["study"]["slip"] = slip
    got = tomllib.load(open(os.path.join(out, "cases", case["name"] + ".toml"), "rb"))
    # The range's values are the decimal ones (0.04, not 0.02 + 0.02 rounded differently).
    check(got == hand, f"{case['name']}: generated case differs from the hand-written one")
    check(case["values"] == {"supply.rms_a": rms, "study.slip": slip},
          f"{case['name']}: manifest values {case['values']}")

# 2. The table's values equal each case's own summary.json (CSV and HDF5 alike).
rows = list(csv.DictReader(open(os.path.join(out, "sweep.csv"))))
check(len(rows) == 6, f"sweep.csv has {len(rows)} rows")
check("torque.mean_nm [N*m]" in rows[0] and "supply.rms_a [A]" in rows[0],
      f"sweep.csv titles carry units: {list(rows[0])}")
h5 = h5py.File(os.path.join(out, "sweep.h5"), "r")
check(h5["outputs/torque.mean_nm"].attrs["units"].decode() == "N*m", "sweep.h5 units")
check(h5["parameters/study.slip"].attrs["units"].decode() == "1", "sweep.h5 slip units")


def summary_value(summary, path):
    node = summary
    for part in path.split("."):
        node = node[part]
    return node


for i, row in enumerate(rows):
    s = json.load(open(os.path.join(out, "runs", row["name"], "summary.json")))
    check(row["status"] == "finished", f"{row['name']}: status {row['status']}")
    for key in manifest["outputs"]:
        title = [t for t in row if t == key or t.startswith(key + " [")][0]
        want = summary_value(s, key)
        check(float(row[title]) == float(want), f"{row['name']} {key}: {row[title]} vs {want}")
        check(float(h5["outputs/" + key][i]) == float(want), f"sweep.h5 {row['name']} {key}")
h5.close()
# Lean by default: no per-step potentials, element B for the last period only, no snapshots.
run0 = os.path.join(out, "runs", rows[0]["name"])
with h5py.File(os.path.join(run0, "results.h5"), "r") as f:
    check("A" not in f["steps"], "a lean run keeps no per-step nodal potentials")
check(not os.path.exists(os.path.join(run0, "fields")), "a lean run writes no snapshots")

# The sweep's report page: each output against each varied key (5 × 2 plots) and the table.
source = os.path.dirname(os.path.dirname(os.path.abspath(examples)))
r = subprocess.run([os.path.join(source, "script", "report"), out], capture_output=True, text=True)
page = open(os.path.join(out, "sweep.html")).read() if r.returncode == 0 else ""
check(page.count("<img") == 10 and "case_0005" in page and "Cautions" in page,
      f"sweep report: {r.stderr[-300:]} ({page.count('<img')} plots)")

# 3. Rerun: nothing recomputed (summary files untouched), exit 0.
stamps = {r["name"]: os.stat(os.path.join(out, "runs", r["name"], "summary.json")).st_mtime_ns
          for r in rows}
r = subprocess.run([gapflux, "sweep", sweep, "--out", out], capture_output=True, text=True)
check(r.returncode == 0 and "6 finished already" in r.stdout, f"rerun: {r.stdout[-400:]}")
check(all(os.stat(os.path.join(out, "runs", n, "summary.json")).st_mtime_ns == t
          for n, t in stamps.items()), "a finished case was recomputed by the rerun")

# 4. Kill a sweep midway (SIGKILL: no chance to stop its workers) and rerun it.
killed = os.path.join(tmp, "killed")
open(sweep, "w").write(SWEEP.replace("workers = 2", "workers = 1"))
proc = subprocess.Popen([gapflux, "sweep", sweep, "--out", killed], stdout=subprocess.PIPE,
                        stderr=subprocess.STDOUT, text=True)
for line in proc.stdout:
    if line.startswith("[2/6]"):
        proc.send_signal(signal.SIGKILL)
        break
proc.wait()
# Its worker gets SIGTERM from the kernel (parent death), stops after its step: wait for it.
for _ in range(200):
    busy = subprocess.run(["pgrep", "-f", f"--out {killed}/runs"], capture_output=True).stdout
    if not busy:
        break
    time.sleep(0.1)
done_before = {n for n in os.listdir(os.path.join(killed, "runs"))
               if os.path.exists(os.path.join(killed, "runs", n, "summary.json"))
               and "failure" not in json.load(open(os.path.join(killed, "runs", n,
                                                                "summary.json")))["solver"]}
check(len(done_before) == 2, f"killed after 2 cases: {sorted(done_before)} finished")
stamps = {n: os.stat(os.path.join(killed, "runs", n, "summary.json")).st_mtime_ns
          for n in done_before}
r = subprocess.run([gapflux, "sweep", sweep, "--out", killed], capture_output=True, text=True)
check(r.returncode == 0, f"rerun of the killed sweep: {r.stdout[-600:]}")
check("2 finished already" in r.stdout, f"rerun skips the finished: {r.stdout[:300]}")
check(all(os.stat(os.path.join(killed, "runs", n, "summary.json")).st_mtime_ns == t
          for n, t in stamps.items()), "a finished case was recomputed after the kill")
rows_k = list(csv.DictReader(open(os.path.join(killed, "sweep.csv"))))
check(len(rows_k) == 6 and all(r["status"] == "finished" for r in rows_k),
      "the killed sweep's table is complete after the rerun")
for r_ in rows_k:
    s = json.load(open(os.path.join(killed, "runs", r_["name"], "summary.json")))
    check(float(r_["torque.mean_nm [N*m]"]) == s["torque"]["mean_nm"],
          f"killed sweep {r_['name']}: table = summary")

# 5. Another sweep into the same folder is refused; --replace runs it.
open(sweep, "w").write(SWEEP.replace("[8.0, 12.0]", "[9.0]"))
r = subprocess.run([gapflux, "sweep", sweep, "--out", out], capture_output=True, text=True)
check(r.returncode == 2 and "another sweep" in r.stderr, f"another sweep: {r.returncode} {r.stderr}")
check(len(os.listdir(os.path.join(out, "runs"))) == 6, "the refused sweep touched the runs")

# 6. A bad value in the middle of a range: refused before any case runs, naming the line and case.
bad = os.path.join(tmp, "bad.toml")
open(bad, "w").write("""[sweep]
base_case = "base.toml"

[[sweep.vary]]
key = "supply.rms_a"
values = [10.0]

[[sweep.vary]]
key = "supply.frequency_hz"
range = { from = 50.0, to = -50.0, count = 5 }
""")
bad_out = os.path.join(tmp, "bad")
r = subprocess.run([gapflux, "sweep", bad, "--out", bad_out], capture_output=True, text=True)
check(r.returncode == 2, f"bad range: exit {r.returncode}")
check("bad.toml:8" in r.stderr and "case_0002" in r.stderr and "supply.frequency_hz = 0" in r.stderr,
      f"bad range message names the line, the case and its value: {r.stderr}")
check(not os.path.exists(os.path.join(bad_out, "runs")) and
      not os.path.exists(os.path.join(bad_out, "cases")), "a refused sweep wrote cases or runs")
check(os.path.exists(os.path.join(bad_out, "refused_case_0002.toml")),
      "the refused case is kept for reading")

# 7. Bad sweep files: clear errors naming file, line and key.
for text, words in [
    ('[sweep]\nbase_case = "base.toml"\n', "sweep.vary"),
    ('[sweep]\nbase_case = "base.toml"\n[[sweep.vary]]\nkey = "supply.rms_a"\n'
     'range = { from = 1.0, to = 2.0, count = 1 }\n', "count"),
    ('[sweep]\nbase_case = "base.toml"\n[[sweep.vary]]\nkey = "supply.rms_a"\n'
     'range = { from = 1.0, to = 2.0, step = 0.3 }\n', "whole steps"),
    ('[sweep]\nbase_case = "base.toml"\ncombine = "zip"\n[[sweep.vary]]\nkey = "supply.rms_a"\n'
     'values = [1.0, 2.0]\n[[sweep.vary]]\nkey = "study.slip"\nvalues = [0.1]\n', "zip"),
    ('[sweep]\nbase_case = "base.toml"\n[[sweep.vary]]\nkey = "supply.rms_a"\n'
     'values = [1.0, "two"]\n', "one kind"),
    ('[sweep]\nbase_case = "missing.toml"\n[[sweep.vary]]\nkey = "a"\nvalues = [1]\n',
     "base_case"),
    ('[sweep]\nbase_case = "base.toml"\n[[sweep.vary]]\nkey = "supply.rms_amps"\n'
     'values = [1.0]\n', "rms_amps"),
]:
    open(bad, "w").write(text)
    r = subprocess.run([gapflux, "sweep", bad, "--out", bad_out + "2"], capture_output=True,
                       text=True)
    check(r.returncode == 2 and "bad.toml" in r.stderr and words in r.stderr,
          f"bad sweep file ({words}): exit {r.returncode}: {r.stderr.strip()}")

# 8. collect on a folder without a sweep.
r = subprocess.run([gapflux, "collect", tmp + "/nowhere"], capture_output=True, text=True)
check(r.returncode == 2 and "manifest.json" in r.stderr, f"collect without a sweep: {r.stderr}")

# 9. The example sweep (the full demo motor): every case checks; the job scripts are written.
example = os.path.join(os.path.dirname(examples), "sweeps", "pump_unbalance.toml")
ex_out = os.path.join(tmp, "example")
r = subprocess.run([gapflux, "sweep", example, "--out", ex_out, "--slurm", "--no-submit"],
                   capture_output=True, text=True)
check(r.returncode == 0 and "5 case(s)" in r.stdout, f"example sweep: {r.stdout} {r.stderr}")
check(os.path.exists(os.path.join(ex_out, "slurm", "array.sbatch")) and
      not os.path.exists(os.path.join(ex_out, "runs", "case_0000", "summary.json")),
      "--no-submit writes the job scripts and runs nothing")

# 10. A lean run gives the same summary as a full one; its file is smaller.
full_dir, lean_dir = os.path.join(tmp, "full"), os.path.join(tmp, "lean")
case = small_case(examples, tmp, name="one.toml", fields_every=4, steps=48)
for d, extra in ((full_dir, []), (lean_dir, ["--lean"])):
    r = subprocess.run([gapflux, "run", case, "--out", d] + extra, capture_output=True, text=True)
    check(r.returncode == 0, f"run {extra}: {r.stderr[-300:]}")
sf = json.load(open(os.path.join(full_dir, "summary.json")))
sl = json.load(open(os.path.join(lean_dir, "summary.json")))
for path in ("torque.mean_nm", "field.b_peak_tesla", "losses.iron_w", "saturation.peak_tesla"):
    a, b = summary_value(sf, path), summary_value(sl, path)
    check(a == b, f"lean {path} {b} vs full {a}")
size_full = os.path.getsize(os.path.join(full_dir, "results.h5"))
size_lean = os.path.getsize(os.path.join(lean_dir, "results.h5"))
check(size_lean < size_full, f"lean results.h5 {size_lean} B vs full {size_full} B")
with h5py.File(os.path.join(lean_dir, "results.h5"), "r") as f:
    check(f["steps/B"].shape[0] == 24 and "A" not in f["steps"],
          f"lean keeps element B for the last period only ({f['steps/B'].shape[0]} rows of 48)")
print(f"results.h5: full {size_full / 1e3:.0f} kB, lean {size_lean / 1e3:.0f} kB")
r = subprocess.run([gapflux, "run", case, "--out", lean_dir, "--resume"], capture_output=True,
                   text=True)
check(r.returncode == 2 and "--lean" in r.stderr, f"resuming a lean run without --lean: {r.stderr}")

finish()
