"""Time stepping started from the time-harmonic solution, and stopped when settled (results.h5
and summary.json read with h5py and json).

Usage: test_steady_start.py GAPFLUX EXAMPLES_DIR TMP_DIR
The invented pump motor at its rated slip (cases/examples/pump_4p36s_running.toml: saturated
iron, die-cast aluminium cage, voltage-fed), on a coarse first-order mesh at 72 steps per period.
The reference is the same case started cold and run for six periods, its mean over periods 4–6:
a start changes only the way to the steady state, not the state (common practice, no source;
the per-period mean torque of the settled run still wanders by about ±0.5 % as the bars pass the
slots, measured here, so a 1 % tolerance):
- started from the time-harmonic solution, period 2's mean torque, stator current and bar
  current are within 1 % (torque, current; the settling target) and 1.5 % (bars) of the
  reference (measured: +0.28 %, −0.19 %, +0.05 %);
- the cold start is still off by more than 5 % in period 2 (the motor's start is slow enough for
  the check above to mean something; measured −12 %);
- with stop_when_settled the run ends after at most 3 of the 6 periods allowed, says so in
  summary.json, and its settled period's torque is within 1 % of the reference;
- resuming the settled run steps nothing and gives the same summary;
- the time-harmonic study of the same case is within 3 % of the reference in torque, stator
  current and bar current, with saturation (the harmonic model holds the rotor and carries the
  fundamental only; measured −0.31 %, −1.21 %, +0.80 %);
- summary.json of a run started from the time-harmonic solution shows that solution's prediction
  beside the stepped result (`time_harmonic_start`), also after a resume, and so does its report; on an unbalanced supply
  (VUF about 2 %) with the iron made linear, predicted and stepped agree within 1 % in torque,
  stator current and bar current (the issue's linear tolerance; measured +0.24 %, +0.24 %,
  +0.77 %) and within 3 % in the negative sequence's current and bar current (measured −1.5 %,
  +0.9 %; a small quantity, 2 % of the positive one): with linear iron the sequences superpose
  and the slip transformation is exact for the fundamental (Fortescue; common practice, no
  source), what is left is the slot harmonics' own currents. With
  saturation the prediction's negative sequence is ~30 % low on this closed-slot rotor (measured,
  docs/results.md), which is why the run shows both.
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
from cage_case import cage_case, coarse_demo
from report_page import report_page
from tally import check, finish

demo = coarse_demo(examples, "pump_4p36s_running.toml", steps_per_period=72)
demo = re.sub(r"\nperiods = 3\n", "\nperiods = 6\n", demo)
demo = re.sub(r"\ndiscard_periods = 2.*\n", "\ndiscard_periods = 3\n", demo)
check("periods = 6" in demo and "discard_periods = 3" in demo, "the demo case's study table changed")


def run(name, study_extra, *flags):
    path = os.path.join(tmp, name + ".toml")
    open(path, "w").write(demo.replace("slip = 0.03", "slip = 0.03" + study_extra))
    out = os.path.join(tmp, name)
    r = subprocess.run([gapflux, "run", path, "--out", out, "--lean", *flags], capture_output=True,
                       text=True)
    check(r.returncode == 0, f"{name}: run failed ({r.returncode}): {r.stderr[-1500:]}")
    return path, out, r


def per_period(out):
    with h5py.File(os.path.join(out, "results.h5"), "r") as f:
        spp = int(f.attrs["steps_per_period"])
        torque = f["steps/torque"][:, 0]
        current = f["steps/phase_current"][:]
        bars = f["steps/bar_current"][:]
        start = f.attrs.get("start", b"cold")
    n = len(torque) // spp
    rows = [slice(q * spp, (q + 1) * spp) for q in range(n)]
    return {"torque": np.array([torque[s].mean() for s in rows]),
            "current": np.array([np.sqrt((current[s] ** 2).mean()) for s in rows]),
            "bars": np.array([np.sqrt((bars[s] ** 2).mean()) for s in rows]),
            "start": start.decode() if isinstance(start, bytes) else str(start)}


_, cold_out, _ = run("cold", "")
cold = per_period(cold_out)
check(len(cold["torque"]) == 6, f"cold run: {len(cold['torque'])} periods")
reference = {k: cold[k][3:6].mean() for k in ("torque", "current", "bars")}
print("cold start, per-period mean torque:", " ".join(f"{v:.3f}" for v in cold["torque"]))

# Started from the time-harmonic solution and stopped when settled: its periods 1–3 are those
# of an unstopped run from the same start.
# The time-harmonic study of the same case against the settled time stepping, saturated: torque,
# stator current and bar current within 3 % (the harmonic model holds the rotor and carries the
# fundamental only; time stepping adds the slot harmonics' own torques and currents).
harmonic_case = os.path.join(tmp, "harmonic.toml")
open(harmonic_case, "w").write(re.sub(r"\[study\]\n.*?(?=\n\[output\])",
                                      '[study]\nkind = "time_harmonic"\nslip = 0.03\n', demo,
                                      flags=re.S))
r = subprocess.run([gapflux, "run", harmonic_case, "--out", os.path.join(tmp, "harmonic")],
                   capture_output=True, text=True)
check(r.returncode == 0, f"time-harmonic run failed ({r.returncode}): {r.stderr[-1500:]}")
h = json.load(open(os.path.join(tmp, "harmonic", "summary.json")))
for name, value in (("torque", h["torque"]["mean_nm"]),
                    ("current", h["supply"]["current_sequence"]["positive_a"]),
                    ("bars", h["cage"]["forward"]["bar_rms_a"])):
    off = value / reference[name] - 1
    check(abs(off) < 0.03, f"time-harmonic {name} {value:.4g} vs settled time stepping "
          f"{reference[name]:.4g} ({100 * off:+.2f} %)")
    print(f"time-harmonic {name} {value:.4g} vs settled time stepping {reference[name]:.4g} "
          f"({100 * off:+.2f} %)")

settle_case, settle_out, _ = run("settled", '\nstart = "time_harmonic"\nstop_when_settled = true')
harm = per_period(settle_out)
check(harm["start"] == "time_harmonic", f"results.h5 start attribute {harm['start']!r}")
check(len(harm["torque"]) >= 2, f"the settled run has {len(harm['torque'])} periods")
print("harmonic start, per-period mean torque:", " ".join(f"{v:.3f}" for v in harm["torque"]))
for name, tolerance in (("torque", 0.01), ("current", 0.01), ("bars", 0.015)):
    off = harm[name][1] / reference[name] - 1
    check(abs(off) < tolerance, f"harmonic start, period 2 {name} {harm[name][1]:.4g} vs settled "
          f"{reference[name]:.4g} ({100 * off:+.2f} %)")
    print(f"harmonic start, period 2 {name}: {harm[name][1]:.4g} vs settled {reference[name]:.4g} "
          f"({100 * off:+.2f} %); cold start {cold[name][1]:.4g} ({100 * (cold[name][1] / reference[name] - 1):+.2f} %)")
cold_off = cold["torque"][1] / reference["torque"] - 1
check(cold_off < -0.05, f"the cold start's period 2 is off by only {100 * cold_off:+.2f} %: "
      "this motor no longer shows what the start saves")

s = json.load(open(os.path.join(settle_out, "summary.json")))
stop = s["steady_state"].get("stopped_when_settled", {})
check(stop.get("settled") is True and stop.get("periods_run", 99) <= 3,
      f"stop_when_settled: {stop}")
check(s["steady_state"]["reached"], "settled run: steady state not reached")
off = s["torque"]["mean_nm"] / reference["torque"] - 1
check(abs(off) < 0.01, f"settled run's torque {s['torque']['mean_nm']:.4f} vs {reference['torque']:.4f} "
      f"({100 * off:+.2f} %)")
print(f"stop_when_settled: ended after {stop.get('periods_run')} of 6 periods, torque "
      f"{s['torque']['mean_nm']:.4f} N·m ({100 * off:+.2f} % from the reference), harmonic start "
      f"{s['solver']['start_harmonic_solves']} solves, {s['solver']['start_harmonic_s']:.1f} s")

prediction = s.get("time_harmonic_start", {})
check(set(prediction.get("predicted", {})) >= {"torque_nm", "current_positive_a",
                                                 "current_negative_a", "bar_forward_rms_a"},
      f"summary.json lacks the time-harmonic start's prediction: {prediction}")
for name in ("torque_nm", "current_positive_a", "bar_forward_rms_a"):
    off = prediction.get("difference_pct", {}).get(name[:name.rfind("_")] + "_pct")
    check(off is not None and abs(off) < 3.0, f"settled run: predicted {name} off by {off} % "
          "from the stepped (saturated: 3 %, as the time-harmonic study above)")

r = subprocess.run([gapflux, "run", settle_case, "--out", settle_out, "--lean", "--resume"],
                   capture_output=True, text=True)
check(r.returncode == 0 and "nothing is left to step" in r.stderr,
      f"resuming the settled run: {r.returncode} {r.stderr[-600:]}")
again = json.load(open(os.path.join(settle_out, "summary.json")))
check(again["solver"]["steps"] == s["solver"]["steps"] and
      abs(again["torque"]["mean_nm"] - s["torque"]["mean_nm"]) < 1e-12,
      "the resumed settled run's summary differs")
check(again.get("time_harmonic_start") == prediction,
      "the resumed run's summary lost or changed the time-harmonic start's prediction")

# An unbalanced supply on linear iron: the prediction's sequences against the stepping.
unbalanced = ('[supply]\nfeed = "voltage"\nconnection = "star"\nvoltages = "line_to_line"\n'
              'frequency_hz = 50.0\nrms_v = 400.0\n\n[supply.phases]\nbc = { rms_v = 391.0 }\n'
              'ca = { rms_v = 404.5 }\n')
linear_case = cage_case(examples, os.path.join(tmp, "linear.toml"), slip=0.03, periods=4,
                        steps_per_period=72, linear=True, resistive_bars=False, supply=unbalanced)
text = open(linear_case).read()
open(linear_case, "w").write(
    text.replace("slip = 0.03", 'slip = 0.03\nstart = "time_harmonic"\nstop_when_settled = true'))
linear_out = os.path.join(tmp, "linear")
r = subprocess.run([gapflux, "run", linear_case, "--out", linear_out, "--lean"],
                   capture_output=True, text=True)
check(r.returncode == 0, f"linear unbalanced run failed ({r.returncode}): {r.stderr[-1500:]}")
check("time-harmonic model (the start) against this run" in r.stdout,
      "the printed table lacks the prediction beside the stepped result")
lin = json.load(open(os.path.join(linear_out, "summary.json")))["time_harmonic_start"]
beyond = lin.get("beyond_fundamental") or {}
check({"torque_pct", "bar_current_rms_pct", "cage_loss_pct"} <= set(beyond),
      f"the slot harmonics' share is not reported: {beyond}")
code, stderr, page = report_page(linear_out)
check(code == 0, f"report failed: {stderr[-800:]}")
if page is not None:
    check(page.count("time-harmonic model / this run") >= 3,
          "the report lacks the time-harmonic prediction beside the stepped result")
print("beyond the fundamental (linear):", {k: round(v, 3) for k, v in beyond.items()
                                          if isinstance(v, float)})
check(lin["stepped"]["current_negative_a"] > 0.01 * lin["stepped"]["current_positive_a"],
      f"the unbalanced supply drew no negative sequence: {lin['stepped']}")
for name, tolerance_pct in (("torque_nm", 1.0), ("current_positive_a", 1.0),
                            ("bar_forward_rms_a", 1.0), ("current_negative_a", 3.0),
                            ("bar_backward_rms_a", 3.0)):
    off = lin["difference_pct"][name[:name.rfind("_")] + "_pct"]
    check(abs(off) < tolerance_pct, f"linear, unbalanced: predicted {name} {lin['predicted'][name]:.4g} vs "
          f"stepped {lin['stepped'][name]:.4g} ({off:+.2f} %)")
    print(f"linear, unbalanced: predicted {name} {lin['predicted'][name]:.4g} vs stepped "
          f"{lin['stepped'][name]:.4g} ({off:+.2f} %)")

finish()
