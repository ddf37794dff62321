#!/usr/bin/env python3
"""Mesh convergence of the demo pump motor: bench/cases/pump_mesh_study.toml (every current
imposed, 5th and 7th harmonic currents, 18 steps over three stator slot pitches) run at a series
of mesh settings, first and second order, every element size scaled by a factor x of the default
(airgap size = airgap / 2, iron size = stator slot pitch at the bore / 3; band nodes scaled with
the airgap size, kept a multiple of 252 so slot and bar pitches stay whole band pitches).

Per setting: the airgap's space harmonics (window mean of the amplitude of electrical orders 1,
5, 7, the rotor slot orders 13, 15 and the stator slot orders 17, 19), the torque's mean and
ripple (peak to peak over the mean), and the mean stator flux-linkage space vector |psi|; each
as its difference from the finest second-order setting ("converged"). Harmonics are compared in
% of the fundamental's amplitude (a small harmonic's own relative change says nothing of the
field), the rest in % of their own value.

Then the cage's induced currents, which the imposed run does not test: the voltage-fed demo
(cases/examples/pump_4p36s_voltage.toml) as a time-harmonic study at standstill (deep-bar
current displacement at 50 Hz) and at its rated slip, on the second-order settings: torque,
positive-sequence current and forward bar current, against the finest.

The last line names the coarsest setting that is within TOL % on every quantity of both parts
and stays so at every finer setting of its order (a setting that lands inside by chance between
two outside does not count). Figures, not assertions (docs/performance.md).

Usage: bench/mesh_convergence.py [--gapflux PATH] [--quick] [--tol PCT] [--out DIR]
  --quick  four settings instead of eleven and no time-harmonic part (about a tenth of the time)
Runs with OMP_NUM_THREADS as set (default: the machine's cores).
"""
import os
import re
import shutil

import h5py
import numpy as np

from bench_runs import here, parser, root, run_case

parser = parser(__doc__, "mesh_convergence")
parser.add_argument("--tol", type=float, default=0.5)
args = parser.parse_args()

# (order, x), coarsest first per order; the last second-order setting is the reference.
if args.quick:
    settings = [(1, 1.0), (2, 2.0), (2, 1.0), (2, 0.5)]
else:
    settings = [(1, 1.0), (1, 0.7), (1, 0.5), (1, 0.35),
                (2, 2.0), (2, 1.4), (2, 1.0), (2, 0.7), (2, 0.5), (2, 0.35), (2, 0.25)]
reference = max((s for s in settings if s[0] == 2), key=lambda s: -s[1])

stepping_case = open(os.path.join(here, "cases", "pump_mesh_study.toml")).read()
harmonic_case = re.sub(r"\[study\]\n(.*?)(?=\n\[)", "[study]\nkind = \"time_harmonic\"\nslip = SLIP\n",
                       open(os.path.join(root, "cases", "examples", "pump_4p36s_voltage.toml")).read(),
                       flags=re.S)
harmonic_settings = [] if args.quick else [s for s in settings if s[0] == 2 and s[1] >= 0.35]
airgap_mm = (136.0 - 135.1) / 2.0
slot_pitch_mm = np.pi * 136.0 / 36.0
pole_pairs = 2
orders_el = {"1": 1, "5": 5, "7": 7, "13 (rotor slot)": 13, "15 (rotor slot)": 15,
             "17 (stator slot)": 17, "19 (stator slot)": 19}
shutil.rmtree(args.out, ignore_errors=True)
os.makedirs(args.out)


def mesh_table(order, x):
    band = max(252, int(round(2016.0 / x / 252.0)) * 252)
    return (f"[mesh]\norder = {order}\nairgap_size_mm = {airgap_mm / 2.0 * x:.6g}\n"
            f"iron_size_mm = {slot_pitch_mm / 3.0 * x:.6g}\nband_nodes = {band}\n")


def run(name, text):
    out, summary, wall = run_case(args.gapflux, args.out, name, text, "mesh_convergence")
    print(f"ran {name}: {summary['mesh']['dofs']} DOFs, {wall:.1f} s", flush=True)
    return out, summary, wall


def with_mesh(text, order, x):
    return re.sub(r"\[mesh\]\n(.*?)(?=\n\[)", mesh_table(order, x), text, flags=re.S)


def stepping_values(order, x):
    out, summary, wall = run(f"p{order}_x{x:g}", with_mesh(stepping_case, order, x))
    with h5py.File(os.path.join(out, "results.h5")) as f:
        amplitude = f["analysis/space_harmonics/amplitude_per_step"][()].mean(axis=0)
        torque = f["steps/torque"][()].ravel()
        psi = f["steps/flux_linkage"][()]
    a = np.exp(2j * np.pi / 3)
    psi_vector = 2.0 / 3.0 * (psi[:, 0] + a * psi[:, 1] + a * a * psi[:, 2])
    values = {f"B{k}": amplitude[pole_pairs * n] for k, n in orders_el.items()}
    values["torque"] = torque.mean()
    values["ripple"] = (torque.max() - torque.min()) / torque.mean()
    values["psi"] = np.abs(psi_vector).mean()
    return summary["mesh"]["dofs"], wall, values


def harmonic_values(order, x):
    values, wall = {}, 0.0
    for label, slip in (("s1", 1.0), ("s0.03", 0.03)):
        text = with_mesh(harmonic_case.replace("SLIP", f"{slip:g}"), order, x)
        _, summary, seconds = run(f"th_{label}_p{order}_x{x:g}", text)
        wall += seconds
        values[f"T_{label}"] = summary["torque"]["mean_nm"]
        values[f"I1_{label}"] = summary["supply"]["current_sequence"]["positive_a"]
        values[f"Ibar_{label}"] = summary["cage"]["forward"]["bar_rms_a"]
    return summary["mesh"]["dofs"], wall, values


def table(title, rows, reference, relative_to_b1):
    """Prints the rows' differences from the reference row; returns {(order, x): worst %}."""
    ref = rows[reference]["values"]
    keys = list(ref.keys())
    print(f"\n{title}")
    print(f"reference (order {reference[0]}, x = {reference[1]:g}): " +
          ", ".join(f"{k} {v:.6g}" for k, v in ref.items()))
    print(f"{'order':>5} {'x':>5} {'dofs':>7} {'wall_s':>7} " +
          " ".join(f"{k.split(' ')[0]:>8}" for k in keys) + f" {'worst':>7}")
    worst = {}
    for setting, r in rows.items():
        d = []
        for k in keys:
            scale = ref["B1"] if relative_to_b1 and k.startswith("B") else ref[k]
            d.append(100.0 * (r["values"][k] - ref[k]) / scale)
        worst[setting] = max(abs(v) for v in d)
        print(f"{setting[0]:>5} {setting[1]:>5g} {r['dofs']:>7} {r['wall_s']:>7.1f} " +
              " ".join(f"{v:>8.3f}" for v in d) + f" {worst[setting]:>7.3f}")
    return worst


stepping = {}
for order, x in settings:
    dofs, wall, values = stepping_values(order, x)
    stepping[(order, x)] = {"dofs": dofs, "wall_s": wall, "values": values}
harmonic = {}
for order, x in harmonic_settings:
    dofs, wall, values = harmonic_values(order, x)
    harmonic[(order, x)] = {"dofs": dofs, "wall_s": wall, "values": values}

worst = table("imposed currents, 18 steps: differences in % (B5…B19 in % of B1)", stepping,
              reference, True)
if harmonic:
    finest = min(harmonic, key=lambda s: s[1])
    worst_h = table("induced cage, time-harmonic at s = 1 and s = 0.03: differences in %",
                    harmonic, finest, False)
    for s in worst:
        worst[s] = max(worst[s], worst_h.get(s, 0.0))

# A setting counts when it and every finer one of its order are within the tolerance.
coarsest = None
for order in sorted({s[0] for s in settings}):
    ladder = sorted((s for s in settings if s[0] == order and s != reference),
                    key=lambda s: s[1])
    ok = None
    for s in ladder:
        if worst[s] > args.tol:
            break
        ok = s
    if ok and (coarsest is None or stepping[ok]["dofs"] < stepping[coarsest]["dofs"]):
        coarsest = ok
if coarsest:
    print(f"\ncoarsest within {args.tol:g} % on every quantity, and every finer setting of its "
          f"order too: order {coarsest[0]}, x = {coarsest[1]:g} "
          f"({stepping[coarsest]['dofs']} DOFs)")
else:
    print(f"\nno setting but the reference is within {args.tol:g} % on every quantity")
