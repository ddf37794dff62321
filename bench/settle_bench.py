#!/usr/bin/env python3
"""The way to the steady state: the running demo (cases/examples/pump_4p36s_running.toml: cage,
saturated iron, voltage feed, 108 steps per period) started cold and from the time-harmonic
solution, each with stop_when_settled and at most PERIODS periods. Prints per start the periods
run, the wall time, the per-period mean torque, and the ratio of the two walls. Figures, not
assertions (docs/performance.md).

Usage: bench/settle_bench.py [--gapflux PATH] [--quick] [--periods N] [--record] [--out DIR]
  --quick    a first-order mesh at 72 steps per period (about a tenth of the time)
  --periods  the most periods each run may take (default 10)
  --record   also run the time-harmonic start for all PERIODS without stopping: the per-period
             torque of periods 1…PERIODS, once
Runs with OMP_NUM_THREADS as set (default: the machine's cores).
"""
import os
import re
import shutil
import sys

import h5py

from bench_runs import parser, root, run_case

parser = parser(__doc__, "settle_bench")
parser.add_argument("--periods", type=int, default=10)
parser.add_argument("--record", action="store_true")
args = parser.parse_args()
if args.periods < 3:
    sys.exit("settle_bench: --periods must be 3 or more")

case = open(os.path.join(root, "cases", "examples", "pump_4p36s_running.toml")).read()
if args.quick:
    case = re.sub(r"\[mesh\]\n(.*?)(?=\n\[)",
                  "[mesh]\norder = 1\nband_nodes = 1008\nairgap_size_mm = 0.45\n", case, flags=re.S)
    case = re.sub(r"steps_per_period = 108.*\n.*\n", "steps_per_period = 72\n", case)
case = case.replace("fields_every = 12", "fields_every = 100000")
case = re.sub(r"\nperiods = 3\n", f"\nperiods = {args.periods}\n", case)
case = re.sub(r"\ndiscard_periods = 2.*\n", f"\ndiscard_periods = {args.periods - 1}\n", case)
shutil.rmtree(args.out, ignore_errors=True)
os.makedirs(args.out)


def run(name, extra):
    out, s, wall = run_case(args.gapflux, args.out, name,
                            case.replace("slip = 0.03", "slip = 0.03" + extra), "settle_bench")
    with h5py.File(os.path.join(out, "results.h5"), "r") as f:
        spp = int(f.attrs["steps_per_period"])
        torque = f["steps/torque"][:, 0]
    means = [torque[q * spp:(q + 1) * spp].mean() for q in range(len(torque) // spp)]
    return {"wall": wall, "summary": s, "means": means}


runs = {}
for name, extra in (("cold", "\nstop_when_settled = true"),
                    ("time_harmonic", '\nstart = "time_harmonic"\nstop_when_settled = true')):
    runs[name] = run(name, extra)
print(f"settle bench ({'quick: P1, 72 steps/period' if args.quick else 'demo: P2, 108 steps/period'}"
      f", at most {args.periods} periods, OMP_NUM_THREADS={os.environ.get('OMP_NUM_THREADS', 'unset')})")
print(f"{'start':>14} {'periods':>8} {'settled':>8} {'wall s':>8} {'start s':>8} {'torque N·m':>11}"
      "  per-period mean torque")
for name, r in runs.items():
    s = r["summary"]
    stop = s["steady_state"].get("stopped_when_settled", {})
    print(f"{name:>14} {stop.get('periods_run', 0):>8} {str(stop.get('settled')):>8} "
          f"{r['wall']:>8.1f} {s['solver'].get('start_harmonic_s', 0.0):>8.1f} "
          f"{s['torque']['mean_nm']:>11.4f}  " + " ".join(f"{v:.3f}" for v in r["means"]))
print(f"wall, time-harmonic start / cold start: {runs['time_harmonic']['wall'] / runs['cold']['wall']:.3f}")
if args.record:
    r = run("record", '\nstart = "time_harmonic"')
    last = r["means"][-1]
    print(f"time-harmonic start, all {args.periods} periods ({r['wall']:.1f} s): per-period mean "
          "torque, and its difference from the last period's:")
    for q, v in enumerate(r["means"]):
        print(f"  period {q + 1:>2}: {v:.4f} N·m ({100 * (v / last - 1):+.2f} %)")
