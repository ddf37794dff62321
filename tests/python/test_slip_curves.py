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
- the curves in results.h5 equal summary.json's, and the report draws them (one PNG, cautions);
- the equivalent circuit (no-load and standstill impedances, X1σ = X2σ' at standstill): with
  linear iron and a resistive cage (no saturation, little current displacement) the circuit
  with the rated point's rotor branch gives the field's torque at three slips between rated and
  breakdown within 3 % (the classical circuit is exact for such a machine; induction-machine
  theory, e.g. Pyrhönen, Jokinen, Hrabovcová ch. 7, from memory; measured to 5e-6); on the
  saturated demo its rotor branch shows current displacement and the closed slots' saturating
  bridges: R2' higher and X2σ' lower at standstill than at rated slip (common practice, no
  source; measured 0.441 against 0.389 Ω and 0.640 against 2.344 Ω). With its rated rotor
  branch held constant the saturated demo's circuit falls 16–46 % short of the field's torque
  between rated and breakdown (printed: what constant parameters cost there). The circuit whose
  rotor branch follows slip and rotor current between the two extracted ones (R2' linear in √s,
  X2σ' a power law in I2'; equivalent_circuit.hpp) is held to the issue's 3 % at the three
  slips, on the saturated demo and on linear iron (it uses only the rated and standstill
  extractions; measured −0.99 %, −0.31 %, +0.52 % on the demo, 2e-5 linear).
"""
import base64
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
from cage_case import cage_case, coarse_demo
from report_page import report_page
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
        check(np.allclose(v, np.array(c[key], dtype=float), rtol=1e-12, atol=0, equal_nan=True),
              f"results.h5 curves/{name} differs from summary.json")
    for name, key in (("impedance_positive_sequence", "impedance_positive_ohm"),
                      ("impedance_negative_sequence", "impedance_negative_ohm")):
        z = f["curves/" + name][:]
        check(z.shape == (len(slip), 2) and np.allclose(np.hypot(z[:, 0], z[:, 1]),
                                                        np.array(c[key], dtype=float), rtol=1e-12),
              f"results.h5 curves/{name} differs from summary.json")

# Sequence impedances: at standstill both sequences meet the same rotor (slip 1 = 2 − 1) on the
# same state, so Z2 = Z1 there (the slip transformation; common practice, no source), to 1e-6.
z1 = np.array(c["impedance_positive_ohm"], dtype=float)
z2 = np.array(c["impedance_negative_ohm"], dtype=float)
a1 = np.array(c["impedance_positive_angle_deg"], dtype=float)
a2 = np.array(c["impedance_negative_angle_deg"], dtype=float)
check(abs(z2[0] / z1[0] - 1) < 1e-6 and abs(a2[0] - a1[0]) < 1e-4,
      f"standstill: Z2 {z2[0]:.6f} Ω ∠{a2[0]:.4f}° vs Z1 {z1[0]:.6f} Ω ∠{a1[0]:.4f}°")
print(f"sequence impedances: standstill Z1 {z1[0]:.4f} Ω ∠{a1[0]:.2f}°, Z2 {z2[0]:.4f} Ω; near "
      f"synchronism (s {slip[-2]:.3f}) Z1 {z1[-2]:.3f} Ω, Z2 {z2[-2]:.4f} Ω ∠{a2[-2]:.2f}°")

# The report draws the curves (postproc/report/make_report.py, matplotlib): one embedded PNG
# that decodes, and the cautions on the page.
code, stderr, page = report_page(out)
check(code == 0, f"report failed: {stderr[-800:]}")
if page is not None:
    images = re.findall(r"base64,([A-Za-z0-9+/=]+)", page)
    check(len(images) == 1 and base64.b64decode(images[0])[:8] == b"\x89PNG\r\n\x1a\n",
          f"report: {len(images)} images")
    check("Cautions" in page and "licensed practice" in page, "report: no cautions")

# The equivalent circuit.
e = s["equivalent_circuit"]
check("xm_ohm" in e, f"no equivalent circuit: {e}")
if "xm_ohm" in e:
    st, ra = e["standstill"], e["rated"]
    check(st["r2_ohm"] > ra["r2_ohm"], f"R2' at standstill {st['r2_ohm']:.4f} Ω vs rated {ra['r2_ohm']:.4f} Ω")
    check(st["x2_leakage_ohm"] < ra["x2_leakage_ohm"],
          f"X2σ' at standstill {st['x2_leakage_ohm']:.4f} Ω vs rated {ra['x2_leakage_ohm']:.4f} Ω")
    print(f"demo circuit: R1 {e['r1_ohm']:.4f}, X1σ {e['x1_leakage_ohm']:.4f}, Xm {e['xm_ohm']:.3f} Ω; "
          f"R2' {st['r2_ohm']:.4f} / {ra['r2_ohm']:.4f} Ω, X2σ' {st['x2_leakage_ohm']:.4f} / "
          f"{ra['x2_leakage_ohm']:.4f} Ω (standstill / rated); torque with the rated branch: " +
          ", ".join(f"s {c['slip']:.3f}: {c['torque_circuit_nm']:.1f} vs {c['torque_field_nm']:.1f} N·m"
                    for c in e["torque_checks"]))
    check(len(e["torque_checks"]) == 3, f"demo circuit checks: {e['torque_checks']}")
    for c in e["torque_checks"]:
        off = c["torque_saturating_circuit_nm"] / c["torque_field_nm"] - 1
        check(abs(off) < 0.03, f"demo: saturating circuit's torque at slip {c['slip']:.3f} "
              f"{c['torque_saturating_circuit_nm']:.2f} vs field {c['torque_field_nm']:.2f} N·m "
              f"({100 * off:+.2f} %)")
        print(f"demo: saturating circuit's torque at slip {c['slip']:.3f} "
              f"{c['torque_saturating_circuit_nm']:.2f} vs field {c['torque_field_nm']:.2f} N·m "
              f"({100 * off:+.2f} %)")

linear = cage_case(examples, os.path.join(tmp, "linear.toml"), slip=0.03, periods=2)
text = re.sub(r"\[study\]\n.*?(?=\n\[output\])",
              '[study]\nkind = "slip_curves"\npoints = 6\nslip = 0.03\n', open(linear).read(), flags=re.S)
open(linear, "w").write(text)
r = subprocess.run([gapflux, "run", linear, "--out", os.path.join(tmp, "linear")], capture_output=True,
                   text=True)
check(r.returncode == 0, f"linear slip curves failed ({r.returncode}): {r.stderr[-1500:]}")
linear_summary = json.load(open(os.path.join(tmp, "linear", "summary.json")))
el = linear_summary["equivalent_circuit"]
checks = el.get("torque_checks", [])
check(len(checks) == 3, f"linear circuit checks: {checks}")
for c in checks:
    off = c["torque_saturating_circuit_nm"] / c["torque_field_nm"] - 1
    check(abs(off) < 0.03, f"linear: saturating circuit's torque at slip {c['slip']:.3f} "
          f"{c['torque_saturating_circuit_nm']:.4f} vs field {c['torque_field_nm']:.4f} N·m "
          f"({100 * off:+.3f} %)")
    off = c["torque_circuit_nm"] / c["torque_field_nm"] - 1
    check(abs(off) < 0.03, f"linear: circuit torque at slip {c['slip']:.3f} {c['torque_circuit_nm']:.4f} "
          f"vs field {c['torque_field_nm']:.4f} N·m ({100 * off:+.3f} %)")
    print(f"linear: circuit torque at slip {c['slip']:.3f} {c['torque_circuit_nm']:.4f} vs field "
          f"{c['torque_field_nm']:.4f} N·m ({100 * off:+.4f} %)")

# With linear iron the negative sequence at slip s is the positive sequence at slip 2 − s (the
# state does not depend on the field; Fortescue and the slip transformation, common practice,
# no source): the curve's Z2 at its fifth slip against a time-harmonic study at 2 − s, to 1e-6.
lc = linear_summary["curves"]
s5 = lc["slip"][4]
at = linear.replace("linear.toml", "linear_2ms.toml")
open(at, "w").write(re.sub(r"\[study\]\n.*?(?=\n\[output\])",
                           f'[study]\nkind = "time_harmonic"\nslip = {2.0 - s5!r}\n', text,
                           flags=re.S))
r = subprocess.run([gapflux, "run", at, "--out", os.path.join(tmp, "linear_2ms")],
                   capture_output=True, text=True)
check(r.returncode == 0, f"time-harmonic at 2 − s failed ({r.returncode}): {r.stderr[-1500:]}")
zp = json.load(open(os.path.join(tmp, "linear_2ms", "summary.json")))["supply"][
    "positive_sequence_impedance"]
z2 = lc["impedance_negative_ohm"][4]
check(abs(z2 / zp["ohm"] - 1) < 1e-6 and abs(lc["impedance_negative_angle_deg"][4] - zp["angle_deg"]) < 1e-4,
      f"linear: Z2 at slip {s5:.3f} {z2:.6f} Ω vs Z1 at slip {2 - s5:.3f} {zp['ohm']:.6f} Ω")
print(f"linear: Z2 at slip {s5:.3f} {z2:.6f} Ω ∠{lc['impedance_negative_angle_deg'][4]:.3f}° vs "
      f"Z1 at slip {2 - s5:.3f} {zp['ohm']:.6f} Ω ∠{zp['angle_deg']:.3f}°")

finish()
