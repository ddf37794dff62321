"""A sweep as a Slurm job array on a throw-away single-node cluster (script/slurm-cluster, from
Debian's slurm-wlm and munge): four cases, two tasks at a time, collected by the dependent job;
the table equals the same sweep run by local workers. The cluster is stopped afterwards, also
when a check fails.

Usage: test_sweep_slurm.py GAPFLUX EXAMPLES_DIR TMP_DIR
Exits 77 (skipped) when the Slurm daemons are not installed or the test does not run as root.
"""
import csv
import os
import shutil
import subprocess
import sys
import time

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)
os.makedirs(tmp)
from small_run import small_case
from tally import check, finish

source = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
cluster_script = os.path.join(source, "script", "slurm-cluster")
if os.geteuid() != 0 or not shutil.which("slurmctld") or not shutil.which("munged"):
    print("skipped: needs root and Debian's slurm-wlm and munge (script/deps)")
    sys.exit(77)

small_case(examples, tmp, name="base.toml", steps=24)
SWEEP = """
[sweep]
base_case = "base.toml"
outputs = ["torque.mean_nm", "supply.current_sequence.positive_a", "losses.copper_w"]
threads_per_case = 1

[[sweep.vary]]
key = "supply.rms_a"
values = [8.0, 10.0, 12.0, 14.0]

[slurm]
throttle = 2
"""
sweep = os.path.join(tmp, "sweep.toml")
open(sweep, "w").write(SWEEP)

cluster = os.path.join(tmp, "cluster")
r = subprocess.run([cluster_script, "start", cluster], capture_output=True, text=True)
check(r.returncode == 0, f"cluster start: {r.stdout} {r.stderr}")
env = dict(os.environ, SLURM_CONF=os.path.join(cluster, "slurm.conf"))
try:
    on_slurm = os.path.join(tmp, "slurm")
    r = subprocess.run([gapflux, "sweep", sweep, "--out", on_slurm, "--slurm"],
                       capture_output=True, text=True, env=env)
    check(r.returncode == 0 and "submitted: array job" in r.stdout,
          f"submit: {r.returncode} {r.stdout} {r.stderr}")
    script = open(os.path.join(on_slurm, "slurm", "array.sbatch")).read()
    check("#SBATCH --array=0-3%2" in script, "one task per case, two at a time")
    # At most two tasks run at once: sample the queue while the array runs.
    most_running = 0
    deadline = time.time() + 600
    while time.time() < deadline:
        q = subprocess.run(["squeue", "-h", "-o", "%j %T"], capture_output=True, text=True,
                           env=env).stdout.split("\n")
        running = sum(1 for line in q if line.startswith("gapflux-sweep RUNNING"))
        most_running = max(most_running, running)
        if not any(line.strip() for line in q):
            break
        time.sleep(0.5)
    check(time.time() < deadline, "the array and its collect job did not end in 10 minutes")
    check(1 <= most_running <= 2, f"{most_running} tasks ran at once (throttle 2)")
    table = os.path.join(on_slurm, "sweep.csv")
    check(os.path.exists(table), "the collect job wrote sweep.csv")

    local = os.path.join(tmp, "local")
    r = subprocess.run([gapflux, "sweep", sweep, "--out", local], capture_output=True, text=True)
    check(r.returncode == 0, f"local sweep: {r.stdout[-400:]} {r.stderr[-400:]}")
    if os.path.exists(table):
        a = list(csv.reader(open(table)))
        b = list(csv.reader(open(os.path.join(local, "sweep.csv"))))
        check(len(a) == 5 and all(row[2] == "finished" for row in a[1:]),
              f"slurm table: {a}")
        check(a == b, f"the Slurm sweep's table differs from the local one:\n{a}\n{b}")
finally:
    r = subprocess.run([cluster_script, "stop", cluster], capture_output=True, text=True)
    check(r.returncode == 0, f"cluster stop: {r.stdout} {r.stderr}")
    left = subprocess.run(["pgrep", "-f", cluster], capture_output=True, text=True).stdout
    check(not left.strip(), f"daemons left running: {left}")

finish()
