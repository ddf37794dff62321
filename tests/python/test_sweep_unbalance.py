"""A sweep of supply voltage unbalance on the demo motor (cases/examples/pump_4p36s_voltage.toml,
invented; its cage's currents induced), coarse mesh: as the voltage unbalance factor rises from 0
to about 5 % with the positive sequence held, the negative-sequence current, the current
unbalance, the cage loss and its backward-wave share rise with it, each strictly.

Usage: test_sweep_unbalance.py GAPFLUX EXAMPLES_DIR TMP_DIR
Why they must rise: the negative-sequence voltage meets the motor's small negative-sequence
impedance (≈ the locked-rotor one), so I2 ≈ V2/Z2 grows with V2, and the rotor's backward wave at
(2 − s)·f adds I2²-proportional cage loss (common practice, no source; the NEMA MG1 derating for
unbalance rests on the same fact, from memory). The table is read with the csv module.
"""
import csv
import os
import re
import shutil
import subprocess
import sys

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)
os.makedirs(tmp)
from tally import check, finish

demo = open(os.path.join(examples, "pump_4p36s_voltage.toml")).read()
demo = re.sub(r"\[mesh\]\n(.*?)(?=\n\[)", "[mesh]\norder = 1\nband_nodes = 1008\nairgap_size_mm = 0.45\n",
              demo, flags=re.S)
demo = re.sub(r"steps_per_period = 108.*\n", "steps_per_period = 24\n", demo)
demo = re.sub(r"\nperiods = 3\n", "\nperiods = 2\n", demo)
demo = re.sub(r"discard_periods = 2.*\n", "discard_periods = 1\n", demo)
demo = demo.replace("fields_every = 12", "fields_every = 100000")
# The balanced bus as the base: the sweep lowers one line voltage.
demo = re.sub(r"\[supply\.phases\].*?(?=\n\[mesh\])", "", demo, flags=re.S)
open(os.path.join(tmp, "demo.toml"), "w").write(demo)
open(os.path.join(tmp, "sweep.toml"), "w").write("""
[sweep]
base_case = "demo.toml"
combine = "zip"
outputs = ["supply.unbalance.vuf_pct", "supply.voltage_sequence.positive_v",
           "supply.current_sequence.negative_a", "supply.current_unbalance.vuf_pct",
           "power.cage_w", "cage.backward.loss_w"]

# One line voltage falls as another rises: the positive sequence stays (the mean of the three
# line voltages is 400 V throughout), so only the unbalance changes.
[[sweep.vary]]
key = "supply.phases.bc.rms_v"
range = { from = 400.0, to = 382.0, count = 3 }

[[sweep.vary]]
key = "supply.phases.ca.rms_v"
range = { from = 400.0, to = 418.0, count = 3 }
""")
out = os.path.join(tmp, "sweep")
r = subprocess.run([gapflux, "sweep", os.path.join(tmp, "sweep.toml"), "--out", out],
                   capture_output=True, text=True)
check(r.returncode == 0, f"sweep: {r.stdout[-800:]} {r.stderr[-800:]}")
rows = list(csv.DictReader(open(os.path.join(out, "sweep.csv"))))
check(len(rows) == 3, f"{len(rows)} rows")


def column(prefix):
    title = [t for t in rows[0] if t.startswith(prefix)][0]
    return [float(r[title]) if r[title] else float("nan") for r in rows]


vuf = column("supply.unbalance.vuf_pct")
i2 = column("supply.current_sequence.negative_a")
cuf = column("supply.current_unbalance.vuf_pct")
cage = column("power.cage_w")
backward = column("cage.backward.loss_w")
v1 = column("supply.voltage_sequence.positive_v")
check(max(v1) - min(v1) < 0.005 * max(v1), f"the positive sequence is held: {v1}")
for name, values in (("voltage unbalance", vuf), ("negative-sequence current", i2),
                     ("current unbalance", cuf), ("cage loss", cage),
                     ("the backward wave's cage loss", backward)):
    check(all(b > a for a, b in zip(values, values[1:])),
          f"{name} does not rise strictly with the unbalance: {values}")
check(vuf[0] < 0.05 and 4.0 < vuf[-1] < 6.5, f"the swept VUF spans 0 to ~5 %: {vuf}")
print("VUF %:", " ".join(f"{v:.2f}" for v in vuf))
print("I2 A:", " ".join(f"{v:.3f}" for v in i2))
print("current unbalance %:", " ".join(f"{v:.2f}" for v in cuf))
print("cage loss W:", " ".join(f"{v:.1f}" for v in cage))
print("backward cage loss W:", " ".join(f"{v:.1f}" for v in backward))
finish()
