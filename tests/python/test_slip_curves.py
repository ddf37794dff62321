"""Slip curves (kind = "slip_curves"): torque, current, power factor and efficiency against slip
from the time-harmonic model, read from summary.json and results.h5 (json, h5py).

Usage: test_slip_curves.py GAPFLUX EXAMPLES_DIR TMP_DIR
The invented pump motor (cases/examples/pump_4p36s_running.toml: saturated iron, die-cast
aluminium cage, 400 V star, rated slip 0.03) on a coarse first-order mesh, 8 points from
standstill to slip −0.02:
- energy conservation at every point (Poynting's theorem for the discrete field, whose iron is
  lossless; common practice, no source): the cage loss equals s × the air-gap power
  (input − stator copper), to 1e-6 relative;
- the torque is positive while motoring and negative past synchronous speed (the induction
  machine's torque–slip curve; common practice, no source), and rises from standstill to a
  breakdown before falling towards synchronous speed;
- the rated point equals the time-harmonic study of the same case at its slip (one solver; the
  curve's point starts its effective-reluctivity iteration from its neighbour's flux densities
  and both stop at a field change of 1e-4 per iteration, so to 1e-4; measured 2e-6);
- plausibility for a general-purpose cage motor (IEC 60034-12, design N; from memory, not
  checked against the standard's tables): starting torque 1.5–3.5 × rated, breakdown torque
  1.6–4 × rated, starting current 5–9 × rated (measured: 2.68, 3.71, 8.2);
- the curves in results.h5 equal summary.json's.
"""
import json
import os
import re
import shutil
import subprocess
import sys

import h5py
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)
os.makedirs(tmp)
sys.path.insert(0, os.path.dirname(__file__))
from cage_case import coarse_demo
from tally import check, finish

demo = coarse_demo(examples, "pump_4p36s_running.toml")
study = re.search(r"\[study\]\n.*?(?=\n\[output\])", demo, flags=re.S)
check(study is not None, "the demo case has no [study] table before [output]")


def run(name, table):
    path = os.path.join(tmp, name + ".toml")
    open(path, "w").write(demo[:study.start()] + table + demo[study.end():])
    out = os.path.join(tmp, name)
    r = subprocess.run([gapflux, "run", path, "--out", out], capture_output=True, text=True)
    check(r.returncode == 0, f"{name}: run failed ({r.returncode}): {r.stderr[-1500:]}")
    return out, json.load(open(os.path.join(out, "summary.json")))


out, s = run("curves", '[study]\nkind = "slip_curves"\nslip_from = 1.0\nslip_to = -0.02\n'
                       'points = 8\nslip = 0.03\n')
c = s["curves"]
slip = np.array(c["slip"])
torque = np.array(c["torque_nm"], dtype=float)
check(all(c["converged"]) and len(slip) == 8, f"curve points: {c['converged']}")
check(abs(slip[0] - 1.0) < 1e-12 and abs(slip[-1] + 0.02) < 1e-12, f"slips {slip}")

# Energy conservation per point: cage = s·(input − copper).
worst = 0.0
for k in range(len(slip)):
    gap = c["input_w"][k] - c["stator_copper_w"][k]
    worst = max(worst, abs(c["cage_w"][k] - slip[k] * gap) / max(abs(c["input_w"][k]), 1.0))
check(worst < 1e-6, f"cage loss against s × air-gap power: worst {worst:.2e} of the input")
print(f"energy at every point: cage = s·(input − copper) to {worst:.1e} of the input")

# The curve's shape.
check(all(torque[slip > 0] > 0) and torque[slip < 0][0] < 0,
      f"torque signs against slip: {list(zip(slip.round(3), torque.round(2)))}")
peak = int(np.argmax(np.where(slip > 0, torque, -np.inf)))
check(0 < peak < len(slip) - 2, f"the largest torque sits at slip {slip[peak]:.3f}, at an end")
check(s["breakdown"]["torque_nm"] >= torque[peak] - 1e-9 and s["breakdown"]["refined"],
      f"breakdown {s['breakdown']}")

# The rated point is the time-harmonic study at the same slip.
_, h = run("rated", '[study]\nkind = "time_harmonic"\nslip = 0.03\n')
for key, got, want in (("torque", s["rated"]["torque_nm"], h["torque"]["mean_nm"]),
                       ("current", s["rated"]["current_a"],
                        h["supply"]["current_sequence"]["positive_a"]),
                       ("power factor", s["rated"]["power_factor"], h["power"]["power_factor"])):
    check(abs(got / want - 1) < 1e-4, f"rated {key}: curves {got:.8g} vs time-harmonic {want:.8g}")

# Plausibility for design N (from memory).
start, rated = s["starting"], s["rated"]
tl, tb, il = start["torque_per_rated"], s["breakdown"]["torque_per_rated"], start["current_per_rated"]
check(1.5 <= tl <= 3.5, f"starting torque {tl:.2f} × rated")
check(1.6 <= tb <= 4.0, f"breakdown torque {tb:.2f} × rated")
check(5.0 <= il <= 9.0, f"starting current {il:.2f} × rated")
print(f"starting torque {start['torque_nm']:.1f} N·m ({tl:.2f} × rated {rated['torque_nm']:.1f}), "
      f"breakdown {s['breakdown']['torque_nm']:.1f} N·m ({tb:.2f} ×) at slip "
      f"{s['breakdown']['slip']:.3f}, starting current {start['current_a']:.1f} A ({il:.2f} × "
      f"{rated['current_a']:.2f} A); {s['solver']['linear_solves']} linear solves, "
      f"{s['solver']['solve_s']:.1f} s")

# results.h5 holds the same curves.
with h5py.File(os.path.join(out, "results.h5"), "r") as f:
    check(f.attrs["study"] in ("slip_curves", b"slip_curves"), f"study attribute {f.attrs['study']}")
    for name, key in (("slip", "slip"), ("torque", "torque_nm"),
                      ("current_positive_sequence", "current_a"), ("efficiency", "efficiency_pct")):
        v = f["curves/" + name][:].ravel()
        check(np.allclose(v, np.array(c[key], dtype=float), rtol=1e-12, atol=0),
              f"results.h5 curves/{name} differs from summary.json")

finish()
