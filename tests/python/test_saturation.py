"""Saturation zones from the finite-element results, read with h5py and meshio (Debian's
python3-h5py, python3-meshio).

Usage: test_saturation.py GAPFLUX EXAMPLES_DIR TMP_DIR
The invented 4-pole, 24-slot reference stator (open radial slots, smooth rotor, M400-50A-class
iron), rotor locked, one period of 24 steps, 30 A balanced and then with phase a raised to 33 A:
- the raise lifts the teeth's peak |B| most around phase a's magnetic axis: the increase-weighted
  mean electrical angle of the teeth (axes are lines, so angles are doubled for the mean) lies
  within half a slot pitch (15° el) of phase a's axis from the winding layout (design.md §4: a
  phase's airgap field peaks on its axis, 90° el from its coil sides; the check reads the field,
  not a rule);
- the same case with linear iron (μr = 1000) reports no area above the threshold (a linear
  material has no knee), and with a case threshold of 0.3 T it does;
- the balanced case run with --baseline is compared with itself: every difference (losses,
  torque, zone peaks, waves) vanishes to 1e-9 relative (its baseline supply is rebuilt from the
  run's positive-sequence phasor, exact to round-off);
- the report (postproc/report/make_report.py, matplotlib) renders for the balanced run with its
  baseline: every embedded image decodes to a non-empty PNG, and the cautions are on the page;
- saturation.vtu holds peak_B per cell equal to results.h5's, read with meshio;
- the copper loss is 3·I²·R with the summary's phase resistance for the balanced 30 A (I²R;
  the resistance itself is checked by hand in tests/postproc/test_losses.cpp), and the iron loss
  is positive in stator and rotor (the locked rotor sees the full-frequency field).
"""
import base64
import json
import os
import re
import shutil
import subprocess
import sys

import h5py
import meshio
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)  # each run starts from an empty scratch folder
os.makedirs(tmp)
from reference_case import COARSE_MESH, LINEAR_IRON, locked_study, reference_without_supply
from tally import check, finish

base = reference_without_supply(examples)
study = COARSE_MESH + locked_study(24)
linear = LINEAR_IRON


def run(name, supply, extra="", flags=()):
    case = os.path.join(tmp, name + ".toml")
    open(case, "w").write(base + supply + extra + study)
    out = os.path.join(tmp, name)
    shutil.rmtree(out, ignore_errors=True)
    r = subprocess.run([gapflux, "run", case, "--out", out, *flags], capture_output=True, text=True)
    check(r.returncode == 0, f"{name}: run failed ({r.returncode}): {r.stderr[-2000:]}")
    return out, json.load(open(os.path.join(out, "summary.json")))


def teeth(summary):
    return {z["tooth"]: z for z in summary["saturation"]["regions"]
            if z["name"].startswith("stator tooth ") and "tip" not in z["name"]}


balanced_dir, balanced = run("balanced", "[supply]\nrms_a = 30.0\n", flags=("--baseline",))
raised_dir, raised = run("raised", "[supply]\nrms_a = 30.0\n[supply.phases]\na = { rms_a = 33.0 }\n")
p = balanced["winding"]["poles"] // 2
axis_a = np.radians(balanced["winding"]["phase_axis_deg_el"][0])
t0, t1 = teeth(balanced), teeth(raised)
z = 0j
for k, zone in t0.items():
    rise = t1[k]["peak_tesla"] - zone["peak_tesla"]
    z += max(rise, 0.0) * np.exp(2j * p * np.radians(zone["angle_deg"]))
mean_angle = np.angle(z) / 2
miss = np.degrees(abs(np.angle(np.exp(2j * (mean_angle - axis_a))) / 2))
check(miss < 15.0, f"the teeth rise most {miss:.1f}° el away from phase a's axis")
print(f"raised phase a: teeth rise most at {np.degrees(mean_angle) % 180:.1f}° el, "
      f"phase a axis {np.degrees(axis_a) % 180:.1f}° el (off by {miss:.1f}°)")
# The case must reach the steel's nonlinear range for the check above to mean anything: past
# the built-in grades' knee (1.20–1.22 T, where the differential permeability has fallen to a
# tenth of its largest). The default threshold is deep saturation (differential μr 10: 1.78–1.83
# T for the built-in grades), and the zones report area-weighted percentiles beside the peak.
check(balanced["saturation"]["peak_tesla"] > 1.25, "the steel case does not pass its knee")
check(1.7 < balanced["saturation"]["threshold_tesla"] < 1.9,
      f"default threshold {balanced['saturation']['threshold_tesla']} T is not deep saturation")
for zone in balanced["saturation"]["regions"]:
    check(zone["median_tesla"] <= zone["p95_tesla"] <= zone["peak_tesla"],
          f"{zone['name']}: median, p95 and peak out of order")

with h5py.File(os.path.join(balanced_dir, "results.h5"), "r") as f:
    peak = f["saturation/peak_B"][...]
    check(f["saturation/peak_B"].attrs["units"] in (b"T", "T"), "units of saturation/peak_B")
vtu = meshio.read(os.path.join(balanced_dir, "saturation.vtu"))
cells = np.concatenate([np.asarray(c) for c in vtu.cell_data["peak_B"]])
check(cells.shape == peak.shape and np.allclose(cells, peak, rtol=0, atol=1e-12),
      "saturation.vtu peak_B differs from results.h5")

b = balanced["baseline"]
for key in ("iron_w", "copper_w", "total_w"):
    v = b["losses"][key]
    check(abs(v["change"]) <= 1e-9 * abs(v["baseline"]), f"baseline {key} change {v}")
check(abs(b["torque"]["mean_nm"]["change"]) <= 1e-9 * abs(b["torque"]["mean_nm"]["baseline"]) + 1e-12,
      f"baseline torque change {b['torque']['mean_nm']}")
worst = max([abs(z["change_tesla"]) for z in b["saturation"]] +
            [abs(w["amplitude_tesla"] - w["baseline_amplitude_tesla"]) for w in b["added_waves"]])
check(worst < 1e-9, f"a balanced case differs from itself by {worst} T")
check(abs(b["supply"]["rms_a"] - 30.0) < 1e-9, f"baseline current {b['supply']}")

losses = balanced["losses"]
r = losses["copper"]["phase_resistance_ohm"]
check(abs(losses["copper_w"] - 3 * 30.0 ** 2 * r) < 1e-9 * losses["copper_w"],
      f"copper loss {losses['copper_w']} W vs 3·I²·R = {3 * 30.0 ** 2 * r} W")
check(losses["iron_stator_w"] > 0 and losses["iron_rotor_w"] > 0, f"iron losses {losses}")

script = os.path.join(os.path.dirname(os.path.abspath(examples)), "..", "postproc", "report",
                      "make_report.py")
rep = subprocess.run([sys.executable, script, balanced_dir], capture_output=True, text=True)
check(rep.returncode == 0, f"report failed: {rep.stderr[-2000:]}")
page = open(os.path.join(balanced_dir, "report.html")).read()
images = re.findall(r'src="data:image/png;base64,([^"]+)"', page)
check(len(images) >= 7, f"the report holds {len(images)} images, expected at least 7")
for data in images:
    png = base64.b64decode(data)
    check(png[:8] == b"\x89PNG\r\n\x1a\n" and len(png) > 1000, "an embedded image is not a PNG")
check("Cautions" in page and "licensed" in page, "the report lacks its cautions")

_, lin = run("linear", "[supply]\nrms_a = 30.0\n", linear)
over = max(z["area_fraction_over"] for z in lin["saturation"]["regions"])
check(over == 0.0, f"a linear case reports {over} of a zone above the threshold")
_, low = run("linear_low", "[supply]\nrms_a = 30.0\n",
             linear + "\n[output]\nsaturation_threshold_tesla = 0.3\n")
over = max(z["area_fraction_over"] for z in low["saturation"]["regions"])
check(over > 0.0, "a 0.3 T case threshold marks no area")
finish()
