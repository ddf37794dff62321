"""What disturbed supplies do to the airgap field, read from the finite-element results (not
from the supply description), with h5py and numpy (Debian's python3-h5py, python3-numpy).

Usage: test_supply_waves.py GAPFLUX EXAMPLES_DIR TMP_DIR
Three short runs of the invented 4-pole, 24-slot reference stator (open radial slots, smooth
rotor, linear iron μr = 1000 so that fields add; rotor locked, one electrical period):
- balanced sinusoidal currents: the space spectrum holds only phase-belt (6k ± 1) and stator slot
  (k·Q/p ± 1) orders; every other order below a noise floor of 0.2 % of the fundamental (common
  practice, no source; the floor is the mesh's departure from per-slot symmetry, measured
  below 0.05 %);
- an unbalanced set: the backward fundamental wave over the forward one equals |I2|/|I1| (a
  symmetric linear stator has equal positive- and negative-sequence inductances; common
  practice, no source), within 1 %; the locus semi-axes B_f ± B_b match the extremes of the
  space fundamental traced by numpy from the stored B_r(θ, t), within 1 % (design.md §4);
- the same harmonic set given as a measured CSV record (written here from the same formula at
  2000 rows per period over 5.2 periods, fundamental detected to 1e-6 relative): the same
  currents and waves within the linear interpolation error of the record (3e-5 relative to the
  fundamental at these orders);
- 5th, 7th and a zero-sequence 3rd harmonic in all phases: a backward wave of electrical space
  order 1 at time order 5, a forward one at 7 (each at its share of the fundamental within
  1 %), and no wave of space order 1 at time order 3 (harmonic sequence rule, common practice,
  no source); numpy's 2-D FFT of the stored B_r gives the stored wave amplitudes to 1e-9
  relative (for waves above 1e-4 of the largest: round-off scales with the largest).
Radial force waves, on a nearly slotless 2-pole stator (the invented compressor's 24 slots with
1 mm openings, 10/12-pitch double layer, smooth rotor): with B_r = B̂·cos(pθ − ωt) the force
density B_r²/(2μ0) holds a wave of mode 2p at 2f of amplitude B̂²/(4μ0) (common practice, no
source); it must be the largest time-varying wave and match within 3 % (the remaining belt and
slot harmonics and B_θ² add products at the same mode, a few per cent here).
"""
import json
import os
import shutil
import subprocess
import sys

import h5py
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)  # each run starts from an empty scratch folder
os.makedirs(tmp)
from reference_case import COARSE_MESH, LINEAR_IRON, locked_study, reference_without_supply
from tally import check, finish

base = reference_without_supply(examples)
common = LINEAR_IRON + COARSE_MESH + locked_study(36)


def run(name, supply):
    case = os.path.join(tmp, name + ".toml")
    open(case, "w").write(base + supply + common)
    out = os.path.join(tmp, name)
    shutil.rmtree(out, ignore_errors=True)
    r = subprocess.run([gapflux, "run", case, "--out", out], capture_output=True, text=True)
    check(r.returncode == 0, f"{name}: run failed ({r.returncode}): {r.stderr[-2000:]}")
    summary = json.load(open(os.path.join(out, "summary.json")))
    return h5py.File(os.path.join(out, "results.h5"), "r"), summary, r.stdout


def full_circle(f):
    """B_r(t, θ) on the full circle from the stored sector samples, with the sector sign."""
    b = f["steps/airgap_B_r"][...]
    sectors = int(f["mesh"].attrs["sectors"])
    sign = -1.0 if int(f["mesh"].attrs["antiperiodic"]) else 1.0
    full = np.array([np.concatenate([row * sign ** k for k in range(sectors)]) for row in b])
    theta0 = f["airgap/theta"][0]
    return full, theta0 + 2 * np.pi * np.arange(full.shape[1]) / full.shape[1]


def waves_table(f):
    w = f["analysis/waves"]
    return (w["space_order_mech"][...], w["time_order"][...], w["direction"][...],
            w["amplitude"][...])


def wave(f, m, h_signed):
    m_, h_, d_, a_ = waves_table(f)
    for mm, hh, dd, aa in zip(m_, h_, d_, a_):
        if mm == m and abs(hh * (dd if dd != 0 else 1) - h_signed) < 1e-9:
            return aa
    return 0.0


p = 2
# --- balanced sinusoidal ------------------------------------------------------------------
f, s, _ = run("balanced", "[supply]\nrms_a = 10.0\n")
with f:
    amp = f["analysis/space_harmonics/amplitude_per_step"][...].mean(axis=0)
    fundamental = amp[p]
    allowed = set()
    for k in range(0, 20):
        allowed |= {6 * k + 1, abs(6 * k - 1)}          # phase belt orders (integral slot)
        allowed |= {k * 24 // p + 1, abs(k * 24 // p - 1)}  # stator slot orders
    worst = 0.0
    for m in range(1, len(amp)):
        nu = m / p
        if nu == int(nu) and int(nu) in allowed:
            continue
        worst = max(worst, amp[m] / fundamental)
    check(worst < 2e-3, f"balanced: an order outside belt and slot harmonics reaches {worst:.2e} of the fundamental")
    print(f"balanced: largest non-belt, non-slot order {worst:.2e} of the fundamental")
    check(s["supply"]["unbalance"]["vuf_pct"] < 1e-9, "balanced: VUF not zero")
    check(s["airgap"]["locus"]["axis_ratio"] > 1 - 1e-4, "balanced: the locus is not a circle")

# --- unbalanced sinusoidal ----------------------------------------------------------------
supply = ("[supply]\nrms_a = 10.0\n[supply.phases]\nb = { rms_a = 9.0, angle_deg = -115.0 }\n"
          "c = { rms_a = 10.5 }\n")
f, s, stdout = run("unbalanced", supply)
with f:
    ia = np.array([10.0, 9.0 * np.exp(-1j * np.radians(115)), 10.5 * np.exp(-1j * np.radians(240))])
    a = np.exp(2j * np.pi / 3)
    i1 = abs(ia[0] + a * ia[1] + a * a * ia[2]) / 3
    i2 = abs(ia[0] + a * a * ia[1] + a * ia[2]) / 3
    seq = s["supply"]["current_sequence"]
    check(abs(seq["positive_a"] - i1) < 1e-9 * i1, f"positive sequence {seq['positive_a']} vs {i1}")
    check(abs(seq["negative_a"] - i2) < 1e-9 * i1, f"negative sequence {seq['negative_a']} vs {i2}")
    bf, bb = wave(f, p, 1.0), wave(f, p, -1.0)
    check(abs(bb / bf - i2 / i1) < 0.01 * (i2 / i1), f"backward/forward {bb / bf:.5f} vs I2/I1 {i2 / i1:.5f}")
    # The locus traced by numpy from the stored samples.
    full, th = full_circle(f)
    b1 = 2 * (full * np.exp(-1j * p * th)).mean(axis=1)
    loc = s["airgap"]["locus"]
    check(abs(np.abs(b1).max() - loc["major_tesla"]) < 0.01 * loc["major_tesla"],
          f"locus major {loc['major_tesla']} vs traced {np.abs(b1).max()}")
    check(abs(np.abs(b1).min() - loc["minor_tesla"]) < 0.01 * loc["minor_tesla"],
          f"locus minor {loc['minor_tesla']} vs traced {np.abs(b1).min()}")
    check("field locus" in stdout and "VUF" in stdout, "the stdout table lacks the locus or VUF")
    print(f"unbalanced: B_b/B_f = {bb / bf:.5f}, I2/I1 = {i2 / i1:.5f}; locus {loc['major_tesla']:.5f} x "
          f"{loc['minor_tesla']:.5f} T, traced {np.abs(b1).max():.5f} x {np.abs(b1).min():.5f} T")

# --- harmonics ----------------------------------------------------------------------------
# (with the neutral connected: an isolated star would not carry the zero-sequence 3rd at all)
supply = ("[supply]\nrms_a = 10.0\nconnection = \"star_neutral\"\n"
          "[[supply.harmonics]]\norder = 5\npercent = 8.0\n"
          "[[supply.harmonics]]\norder = 7\npercent = 5.0\nangle_deg = 30.0\n"
          "[[supply.harmonics]]\norder = 3\npercent = 6.0\n")
f, s, _ = run("harmonics", supply)
with f:
    b1 = wave(f, p, 1.0)
    b5f, b5b = wave(f, p, 5.0), wave(f, p, -5.0)
    b7f, b7b = wave(f, p, 7.0), wave(f, p, -7.0)
    # Read from numpy's transform of the stored field, not the table (the table drops waves
    # below 1e-4 of the largest, so an absent row would prove nothing).
    full, _ = full_circle(f)
    nt, ns = full.shape
    spec = np.fft.fft2(full) / (nt * ns)  # bin (k, m) ↔ e^{−i(2πkn/nt + mθ)}: time order −k
    b3 = 2 * max(abs(spec[(-3) % nt, p]), abs(spec[3, p]))
    check(abs(b5b / b1 - 0.08) < 0.01 * 0.08, f"5th backward {b5b / b1:.5f} of the fundamental, expected 0.08")
    check(b5f < 1e-3 * b5b, f"5th has a forward part {b5f}")
    check(abs(b7f / b1 - 0.05) < 0.01 * 0.05, f"7th forward {b7f / b1:.5f} of the fundamental, expected 0.05")
    check(b7b < 1e-3 * b7f, f"7th has a backward part {b7b}")
    # A zero-sequence 3rd would give 6 % of B1 were it to make a space-order-1 wave.
    check(b3 < 1e-3 * 0.06 * b1, f"3rd harmonic makes a space-order-1 wave of {b3}")
    # It does make the triplen space order 3 (pulsating: equal forward and backward halves).
    b33f, b33b = wave(f, 3 * p, 3.0), wave(f, 3 * p, -3.0)
    check(b33f > 0 and abs(b33f - b33b) < 0.01 * b33f, f"3rd: space order 3 halves {b33f}, {b33b}")
    seq5 = [h for h in s["supply"]["current_harmonics"] if abs(h["order"] - 5) < 1e-9][0]
    check(seq5["negative"]["rms_a"] > 0.79 and seq5["positive"]["rms_a"] < 1e-9,
          f"5th current sequence {seq5['positive']}, {seq5['negative']}")
    print(f"harmonics: 5th backward {b5b / b1:.5f}, 7th forward {b7f / b1:.5f}, 3rd at order 1 {b3 / b1:.2e}")

    # numpy's 2-D FFT of the stored samples against the stored wave table.
    m_, h_, d_, a_ = waves_table(f)
    largest = a_.max()
    worst = 0.0
    for mm, hh, dd, aa in zip(m_, h_, d_, a_):
        if aa < 1e-4 * largest:
            continue
        k = int(round(hh)) * (dd if dd != 0 else 1)    # one period: time bin = time order
        c = spec[(-k) % nt, mm]
        ref = abs(c) * (1.0 if (mm == 0 and k == 0) else 2.0)
        worst = max(worst, abs(ref - aa) / aa)
    check(worst < 1e-9, f"numpy's 2-D FFT differs from the wave table by {worst:.2e} relative")
    print(f"numpy 2-D FFT vs wave table: {worst:.2e} relative, {int((a_ >= 1e-4 * largest).sum())} waves")

# --- radial force waves on a nearly slotless stator ---------------------------------------
comp = open(os.path.join(examples, "compressor_2p24s.toml")).read()
comp = comp.replace("opening_width_mm = 2.2", "opening_width_mm = 1.0")
comp = comp[: comp.index("[rotor]")] + ("[rotor]\nkind = \"smooth\"\nouter_diameter_mm = 85.3\n"
                                         "shaft_diameter_mm = 30.0\n\n") + comp[comp.index("[winding]"):]
comp = (comp[: comp.index("[supply]")] + "[supply]\nrms_a = 4.0\n" + LINEAR_IRON +
        "\n[mesh]\nband_nodes = 1560\n" + locked_study(24))
case = os.path.join(tmp, "forces.toml")
open(case, "w").write(comp)
out = os.path.join(tmp, "forces")
shutil.rmtree(out, ignore_errors=True)
r = subprocess.run([gapflux, "run", case, "--out", out], capture_output=True, text=True)
check(r.returncode == 0, f"forces: run failed ({r.returncode}): {r.stderr[-2000:]}")
with h5py.File(os.path.join(out, "results.h5"), "r") as f:
    fw = f["analysis/force_waves"]
    mode, order, amp = fw["mode"][...], fw["time_order"][...], fw["amplitude"][...]
    varying = order > 0
    top = np.argmax(np.where(varying, amp, 0))
    b1 = wave(f, 1, 1.0)
    expected = b1 ** 2 / (4 * 4e-7 * np.pi)
    check(mode[top] == 2 and abs(order[top] - 2) < 1e-9,
          f"largest time-varying force wave is mode {mode[top]} at {order[top]}f, expected mode 2 at 2f")
    check(abs(amp[top] - expected) < 0.03 * expected,
          f"mode-2 2f force wave {amp[top]:.1f} N/m², B̂²/(4μ0) = {expected:.1f} N/m²")
    check(bool(fw["low_mode"][top]), "mode 2 is not flagged as a low mode")
    print(f"forces: mode {mode[top]} at {order[top]:g}f: {amp[top]:.1f} N/m² vs B̂²/(4μ0) = {expected:.1f} N/m²")

# --- the same harmonics as a measured record ------------------------------------------------
rows = ["# invented record written by the test", "time_s,i_a,i_b,i_c"]
per_period, f0 = 2000, 50.0
parts = [(1, 10.0, 0.0), (5, 0.8, 0.0), (7, 0.5, 30.0), (3, 0.6, 0.0)]
for n in range(int(5.2 * per_period) + 1):
    t = n / (per_period * f0)
    i = []
    for k in range(3):
        phi = -2 * np.pi * k / 3  # phase k's fundamental angle; a harmonic follows h·φ_k
        i.append(sum(np.sqrt(2) * rms * np.cos(h * (2 * np.pi * f0 * t + phi) + np.radians(ang))
                     for h, rms, ang in parts))
    rows.append(f"{t:.17g},{i[0]:.17g},{i[1]:.17g},{i[2]:.17g}")
open(os.path.join(tmp, "record.csv"), "w").write("\n".join(rows) + "\n")
g, s2, _ = run("measured", '[supply]\nconnection = "star_neutral"\n[supply.waveform]\n'
               'file = "record.csv"\n')
with g, h5py.File(os.path.join(tmp, "harmonics", "results.h5"), "r") as f:
    check(s2["supply"]["frequency_detected"] and abs(s2["supply"]["frequency_hz"] - 50) < 50e-6,
          f"detected {s2['supply']['frequency_hz']} Hz")
    di = np.abs(g["steps/phase_current"][...] - f["steps/phase_current"][...]).max()
    check(di < 3e-5 * 10 * np.sqrt(2), f"measured-record currents differ by {di} A")
    worst = 0.0
    b1 = wave(f, p, 1.0)
    for m, h in ((p, 1.0), (p, -5.0), (p, 7.0), (3 * p, 3.0), (11 * p, -1.0)):
        worst = max(worst, abs(wave(g, m, h) - wave(f, m, h)) / b1)
    check(worst < 1e-4, f"measured-record waves differ by {worst:.2e} of the fundamental")
    print(f"measured record: currents within {di:.2e} A, waves within {worst:.2e} of B1")
finish()
