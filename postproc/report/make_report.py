"""DIR/report.html from a run's results.h5 and summary.json: a self-contained page (images
embedded) readable without gapflux. A time-stepping run gets its waves, locus, torque, saturation
and losses; a static run its field map, airgap field with its space spectrum, and the iron's
saturation at that instant. Plots are drawn by matplotlib (Debian's python3-matplotlib), the
results read with h5py.

Usage: make_report.py DIR
"""
import base64
import html
import io
import json
import os
import sys

import h5py
import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.collections import LineCollection  # noqa: E402
from matplotlib.tri import Triangulation  # noqa: E402

INK, ACCENT, MUTED, WARM = "#1d3557", "#e07a1f", "#8d99ae", "#b5172b"


def text(v):
    return v.decode() if isinstance(v, bytes) else str(v)


def figure_html(fig, caption):
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=110, bbox_inches="tight")
    plt.close(fig)
    data = base64.b64encode(buf.getvalue()).decode()
    return (f'<figure><img alt="{html.escape(caption)}" src="data:image/png;base64,{data}">'
            f"<figcaption>{html.escape(caption)}</figcaption></figure>")


def table_html(header, rows):
    head = "".join(f"<th>{html.escape(str(h))}</th>" for h in header)
    body = "".join("<tr>" + "".join(f"<td>{html.escape(str(c))}</td>" for c in r) + "</tr>" for r in rows)
    return f"<table><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


def full_circle(f, name, squared=False):
    b = f[name][...]
    sectors = int(f["mesh"].attrs["sectors"])
    sign = 1.0 if squared or not int(f["mesh"].attrs["antiperiodic"]) else -1.0
    return np.array([np.concatenate([row * sign ** k for k in range(sectors)]) for row in b])


def voltage_section(s, f):
    """A voltage feed: line voltages and line currents over the last period, their sequences and
    unbalance, the circuit and how settled the start is."""
    spp = s["study"]["steps_per_period"]
    t = f["steps/time"][-spp:].ravel() * 1e3
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(9, 3))
    for k, (name, colour) in enumerate(zip(("ab", "bc", "ca"), (INK, ACCENT, MUTED))):
        a1.plot(t, f["steps/line_voltage"][-spp:, k], color=colour, lw=1, label=name)
    for k, (name, colour) in enumerate(zip("abc", (INK, ACCENT, MUTED))):
        a2.plot(t, f["steps/line_current"][-spp:, k], color=colour, lw=1, label=name)
    a1.set_xlabel("t (ms)"), a1.set_ylabel("line-to-line voltage (V)")
    a2.set_xlabel("t (ms)"), a2.set_ylabel("line current (A)")
    a1.legend(frameon=False, fontsize=8), a2.legend(frameon=False, fontsize=8)
    sup, c, ss = s["supply"], s["circuit"], s.get("steady_state", {})
    vs, ls = sup.get("voltage_sequence", {}), sup.get("line_current_sequence", {})
    vu, cu = sup.get("unbalance", {}), sup.get("current_unbalance", {})
    rows = [
        ["connection", f'{c["connection"]} ({c["voltages_given"]} voltages given), {c["time_scheme"]}'],
        ["R, L_end per branch", f'{c["phase_resistance_ohm"]:.4g} Ω' +
         (" (given)" if c["resistance_given"] else " (from the winding)") +
         f', {c["end_winding_inductance_h"] * 1e3:.4g} mH' +
         (" (estimated)" if c["end_winding_inductance_estimated"] else " (given)")],
        ["supply voltage, fundamental", f'positive {vs.get("positive_v", 0):.4g} V, negative '
         f'{vs.get("negative_v", 0):.4g} V, zero {vs.get("zero_v", 0):.4g} V; VUF '
         f'{vu.get("vuf_pct", 0):.3f} %, LVUR {vu.get("lvur_pct", 0):.3f} %, PVUR {vu.get("pvur_pct", 0):.3f} %'],
        ["line current, fundamental", f'positive {ls.get("positive_a", 0):.4g} A, negative '
         f'{ls.get("negative_a", 0):.4g} A, zero {ls.get("zero_a", 0):.4g} A; VUF '
         f'{cu.get("vuf_pct", 0):.3f} %'],
        ["steady state (last period)", f'flux-linkage change {ss.get("last_change_pct") or 0:.3g} %, DC part '
         f'{ss.get("last_dc_pct") or 0:.3g} % ({"within" if ss.get("reached") else "NOT within"} '
         f'{ss.get("tolerance_pct", 0):g} %)'],
    ]
    # Started from the time-harmonic solution: its prediction beside what the stepping gave.
    th = s.get("time_harmonic_start")
    if th:
        p, q = th["predicted"], th["stepped"]
        for key, label, unit in (("torque_nm", "torque", "N·m"),
                                 ("current_positive_a", "current, positive sequence", "A"),
                                 ("current_negative_a", "current, negative sequence", "A"),
                                 ("cage_loss_w", "cage loss (forward + backward waves)", "W")):
            if key in p and key in q:
                rows.append([f"{label}: time-harmonic model / this run",
                             f"{p[key]:.4g} / {q[key]:.4g} {unit}"])
    return ("<h2>Voltage feed</h2>" + table_html(["item", "value"], rows) +
            figure_html(fig, "Line-to-line supply voltages and line currents over the last period") +
            "<div class='caution'>" + html.escape(c["model"]) + "</div>")


STATIC_THRESHOLDS_T = (1.5, 1.8, 2.0)


def outlines(nodes, tri, region):
    """Edges between regions (and on the boundary), for drawing region outlines."""
    edges = {}
    for t, (a, b, c) in enumerate(tri):
        for e in ((a, b), (b, c), (c, a)):
            edges.setdefault((min(e), max(e)), []).append(region[t])
    return [nodes[list(k)] * 1e3 for k, r in edges.items() if len(r) == 1 or r[0] != r[1]]


def static_sections(s, f):
    """A static run: |B| map, airgap B_r around the full circle and its space spectrum, and how
    much of each iron lies above common flux-density levels at this instant."""
    parts = []
    p = s["winding"]["poles"] // 2
    nodes = f["mesh/nodes"][...]
    tri = f["mesh/triangles"][...][:, :3]
    region = f["mesh/triangle_region"][...]
    b_abs = f["field/B_abs"][...]
    fig, ax = plt.subplots(figsize=(6, 6))
    mesh = Triangulation(nodes[:, 0] * 1e3, nodes[:, 1] * 1e3, tri)
    pc = ax.tripcolor(mesh, facecolors=b_abs, cmap="inferno", shading="flat")
    ax.add_collection(LineCollection(outlines(nodes, tri, region), colors="white", linewidths=0.3))
    ax.set_aspect("equal"), ax.set_xlabel("x (mm)"), ax.set_ylabel("y (mm)")
    fig.colorbar(pc, ax=ax, label="|B| (T)", shrink=0.8)
    inst = s["supply"].get("instant", {})
    parts.append("<h2>Field</h2>" + figure_html(
        fig, f'|B| at t = {inst.get("time_s", 0) * 1e3:.3g} ms, rotor at '
             f'{inst.get("rotor_angle_deg", 0):.3g}° (rotor drawn in its own frame), region outlines in white'))

    # Airgap B_r around the whole circle (the sector's images with their sign) and its spectrum.
    sectors = int(f["mesh"].attrs["sectors"])
    sign = -1.0 if int(f["mesh"].attrs["antiperiodic"]) else 1.0
    br_sector = f["airgap/B_r"][...]
    br = np.concatenate([br_sector * sign ** k for k in range(sectors)])
    theta0 = f["airgap/theta"][0]
    th = np.degrees(theta0 + 2 * np.pi * np.arange(br.size) / br.size)
    spectrum = 2 * np.abs(np.fft.rfft(br)) / br.size
    orders = np.arange(spectrum.size)
    keep = (orders > 0) & (spectrum > 1e-3 * spectrum.max())
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(10, 3))
    a1.plot(th, br, color=INK, lw=1)
    a1.set_xlabel("mechanical angle θ (°)"), a1.set_ylabel("B_r at mid-gap (T)")
    # Lines, not bars: hundreds of orders share the axis.
    a2.vlines(orders[keep] / p, 1e-3 * spectrum.max(), spectrum[keep], color=ACCENT, lw=1.5)
    a2.set_yscale("log"), a2.set_xlabel("electrical space order ν"), a2.set_ylabel("amplitude (T)")
    top = orders[keep][np.argsort(spectrum[keep])[::-1][:8]]
    rows = [[f"{m / p:g}", f"{m}", f"{spectrum[m]:.4f}"] for m in top]
    parts.append("<h2>Airgap field</h2>" + figure_html(
        fig, "Radial flux density at mid-gap around the full circle, and its space harmonics (log scale)") +
        table_html(["ν (el)", "order (mech)", "amplitude (T)"], rows))

    # Saturation at this instant: area shares of each iron above common levels.
    names = [text(n) for n in f["mesh/region_names"][...]]
    ids = list(f["mesh/region_ids"][...]) if "mesh/region_ids" in f else list(range(len(names)))
    area = np.abs(np.cross(nodes[tri[:, 1]] - nodes[tri[:, 0]], nodes[tri[:, 2]] - nodes[tri[:, 0]])) / 2
    rows = []
    for iron in ("stator_iron", "rotor_iron"):
        if iron not in names:
            continue
        sel = region == ids[names.index(iron)]
        if not sel.any():
            continue
        total = area[sel].sum()
        rows.append([iron.replace("_", " "), f"{b_abs[sel].max():.3f}"] +
                    [f"{100 * area[sel & (b_abs > t)].sum() / total:.1f} %" for t in STATIC_THRESHOLDS_T])
    parts.append("<h2>Saturation at this instant</h2>" + table_html(
        ["iron", "peak |B| (T)"] + [f"area above {t:g} T" for t in STATIC_THRESHOLDS_T], rows))
    return parts


def case_parts(s):
    """The case table and the cautions, for every kind of run."""
    sup = s["supply"]
    unb = sup.get("unbalance", {})
    rows = [
        ["case", s["case_name"]],
        ["winding", f'{s["winding"]["slots"]} slots, {s["winding"]["poles"]} poles, '
                    f'{s["winding"]["layers"]} layer(s), pitch {s["winding"]["coil_pitch_slots"]} slots'],
        ["supply", f'{sup["frequency_hz"]:.6g} Hz, given as {sup.get("form", "?")}'],
    ]
    if "study" in s:
        quantity = "voltage" if sup.get("feed") == "voltage" else "current"
        rows.append([f"{quantity} unbalance", f'VUF {unb.get("vuf_pct", 0):.3f} %, LVUR '
                     f'{unb.get("lvur_pct", 0):.3f} %, PVUR {unb.get("pvur_pct", 0):.3f} %'])
        rows.append(["steps", f'{s["solver"]["steps"]} ({s["study"]["steps_per_period"]} per period), '
                     f'{s["solver"]["newton_iterations"]} Newton iterations, {s["solver"]["wall_s"]:.0f} s'])
    else:
        inst = sup.get("instant", {})
        rows.append(["study", "static: one instant"])
        rows.append(["phase currents", ", ".join(f"{i:.4g} A" for i in inst.get("phase_current_a", []))])
        rows.append(["solver", f'{s["solver"]["newton_iterations"]} Newton iterations, {s["solver"]["wall_s"]:.1f} s'])
    return ["<h2>Case</h2>" + table_html(["item", "value"], rows),
            "<div class='caution'><b>Cautions.</b> " +
            " ".join(html.escape(c) for c in s.get("cautions", [])) + "</div>"]


def curves_parts(s):
    """Slip curves: torque, current, power factor and efficiency against speed, the starting,
    breakdown and rated points and the equivalent circuit."""
    c = s["curves"]
    speed = np.array(c["speed_rpm"], dtype=float)
    series = [("torque_nm", "torque (N·m)"), ("current_a", "stator current I1 (A, RMS)"),
              ("power_factor", "power factor"), ("efficiency_pct", "efficiency (%, no iron loss)")]
    fig, axes = plt.subplots(2, 2, figsize=(9, 6))
    for ax, (key, label) in zip(axes.ravel(), series):
        ax.plot(speed, np.array([np.nan if v is None else v for v in c[key]], dtype=float),
                color=INK, marker="o", ms=3, lw=1)
        ax.set_xlabel("speed (rpm)")
        ax.set_ylabel(label)
    fig.tight_layout()
    rows = [["points", f'{len(c["slip"])} from slip {s["study"]["slip_from"]:g} to '
                       f'{s["study"]["slip_to"]:g} ({s["solver"]["points_settled"]} settled)'],
            ["solver", f'{s["solver"]["linear_solves"]} linear solves, {s["solver"]["wall_s"]:.1f} s']]
    for name in ("starting", "rated"):
        p = s.get(name, {})
        if p.get("converged"):
            rows.append([name, f'slip {p["slip"]:.4f}: {p["torque_nm"]:.2f} N·m, {p["current_a"]:.2f} A, '
                               f'power factor {p["power_factor"]:.3f}'])
    if "breakdown" in s:
        b = s["breakdown"]
        rows.append(["breakdown", f'{b["torque_nm"]:.2f} N·m at slip {b["slip"]:.4f}'])
    e = s.get("equivalent_circuit", {})
    if "xm_ohm" in e:
        rows.append(["equivalent circuit (per branch)",
                     f'R1 {e["r1_ohm"]:.4f} Ω, X1σ {e["x1_leakage_ohm"]:.4f} Ω, Xm {e["xm_ohm"]:.3f} Ω; '
                     f'R2\' {e["standstill"]["r2_ohm"]:.4f} Ω, X2σ\' {e["standstill"]["x2_leakage_ohm"]:.4f} Ω at standstill'])
        for t in e.get("torque_checks", []):
            rows.append([f'circuit at slip {t["slip"]:.4f}',
                         f'{t["torque_circuit_nm"]:.2f} N·m (rated rotor branch), '
                         f'{t.get("torque_saturating_circuit_nm", float("nan")):.2f} N·m (saturating) '
                         f'against the field\'s {t["torque_field_nm"]:.2f}'])
    return ["<h2>Slip curves</h2>" + table_html(["item", "value"], rows),
            figure_html(fig, "Time-harmonic steady state against speed"),
            "<div class='caution'><b>Cautions.</b> " +
            " ".join(html.escape(x) for x in s.get("cautions", [])) + "</div>"]


def write_page(out, s, parts):
    style = ("body{font-family:sans-serif;max-width:60em;margin:2em auto;color:#1d3557}"
             "table{border-collapse:collapse;margin:0.5em 0}td,th{border-bottom:1px solid #ccd;"
             "padding:0.2em 0.6em;text-align:left;font-size:0.9em}figure{margin:1em 0}"
             "img{max-width:100%}figcaption{font-size:0.85em;color:#556}"
             ".caution{background:#fff4e5;border-left:4px solid #e07a1f;padding:0.5em 1em;margin:1em 0}")
    page = (f"<!DOCTYPE html><html><head><meta charset='utf-8'><title>gapflux report: "
            f"{html.escape(s['case_name'])}</title><style>{style}</style></head><body>"
            f"<h1>{html.escape(s['case_name'])}</h1>" + "".join(parts) + "</body></html>")
    path = os.path.join(out, "report.html")
    # Whole or absent: written under a partial name, then renamed.
    with open(path + ".partial", "w") as page_file:
        page_file.write(page)
    os.replace(path + ".partial", path)
    print(f"report: {path}")


def main(out):
    summary_path, results_path = os.path.join(out, "summary.json"), os.path.join(out, "results.h5")
    if not os.path.isdir(out):
        sys.exit(f"report: {out} is not a folder; give the folder a `gapflux run` wrote into")
    if not (os.path.isfile(summary_path) and os.path.isfile(results_path)):
        sys.exit(f"report: {out} holds no finished gapflux run (summary.json and results.h5 are "
                 "needed); give the folder a `gapflux run` wrote into")
    s = json.load(open(summary_path))
    f = h5py.File(results_path, "r")
    if s.get("study", {}).get("kind") == "slip_curves":
        return write_page(out, s, curves_parts(s))
    if s.get("study", {}).get("kind") != "time_stepping":
        return write_page(out, s, case_parts(s) + static_sections(s, f))
    parts = []
    p = s["winding"]["poles"] // 2
    sup = s["supply"]
    parts += case_parts(s)
    if sup.get("feed") == "voltage":
        parts.append(voltage_section(s, f))

    # B_r(θ) at three instants.
    br = full_circle(f, "steps/airgap_B_r")
    theta0 = f["airgap/theta"][0]
    th = np.degrees(theta0 + 2 * np.pi * np.arange(br.shape[1]) / br.shape[1])
    times = f["steps/time"][...].ravel()
    fig, ax = plt.subplots(figsize=(8, 3))
    for n, colour in zip([len(times) - 1 - k * (len(times) // 6) for k in range(3)], [INK, ACCENT, MUTED]):
        ax.plot(th, br[n], color=colour, lw=1, label=f"t = {times[n] * 1e3:.2f} ms")
    ax.set_xlabel("mechanical angle θ (°)")
    ax.set_ylabel("B_r at mid-gap (T)")
    ax.legend(frameon=False, fontsize=8)
    parts.append("<h2>Airgap field</h2>" + figure_html(fig, "Radial flux density around the airgap at three instants"))

    # Space-harmonic spectrum (window mean).
    orders = f["analysis/space_harmonics/order_mech"][...]
    amps = f["analysis/space_harmonics/amplitude"][...]
    fig, ax = plt.subplots(figsize=(8, 3))
    ax.bar(orders / p, amps, width=0.6, color=INK)
    ax.set_xlabel("electrical space order ν")
    ax.set_ylabel("amplitude (T)")
    ax.set_yscale("log")
    parts.append(figure_html(fig, "Space harmonics of B_r, mean over the analysis window (log scale)"))

    # Wave table.
    w = f["analysis/waves"]
    rows = []
    for i in range(min(15, len(w["amplitude"]))):
        d = int(w["direction"][i])
        rows.append([f'{w["space_order_mech"][i] / p:g}', f'{w["time_order"][i]:g}',
                     "forward" if d > 0 else "backward" if d < 0 else "standing",
                     f'{w["amplitude"][i]:.4f}', text(w["label"][i])])
    parts.append("<h3>Largest space–time waves</h3>" +
                 table_html(["ν (el)", "time order", "direction", "B (T)", "reading"], rows))

    # Locus against the balanced circle.
    path = f["analysis/locus/space_fundamental"][...]
    loc = s["airgap"]["locus"]
    fig, ax = plt.subplots(figsize=(4, 4))
    z = path[:, 0] + 1j * path[:, 1]
    z = np.append(z, z[0])
    ax.plot(z.real, z.imag, color=ACCENT, lw=1.5, label="traced space fundamental")
    circle = loc["forward_tesla"] * np.exp(1j * np.linspace(0, 2 * np.pi, 200))
    ax.plot(circle.real, circle.imag, color=MUTED, ls="--", lw=1, label="balanced circle (B_f)")
    ax.set_aspect("equal")
    ax.set_xlabel("Re (T)")
    ax.set_ylabel("Im (T)")
    ax.legend(frameon=False, fontsize=8, loc="lower left")
    parts.append("<h3>Field locus</h3>" + figure_html(
        fig, f'Locus of the space fundamental: {loc["major_tesla"]:.4f} × {loc["minor_tesla"]:.4f} T, '
             f'axis ratio {loc["axis_ratio"]:.4f}'))

    # Torque over time and its spectrum.
    torque = f["steps/torque"][...].ravel()
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(9, 3))
    a1.plot(times * 1e3, torque, color=INK, lw=1)
    a1.set_xlabel("time (ms)")
    a1.set_ylabel("torque (N·m)")
    th_orders = f["analysis/torque_harmonics/order"][...]
    th_amps = f["analysis/torque_harmonics/amplitude"][...]
    a2.bar(th_orders, th_amps, width=0.5, color=ACCENT)
    a2.set_xlabel("order (× supply frequency)")
    a2.set_ylabel("amplitude (N·m)")
    tq = s.get("torque", {})
    parts.append("<h2>Torque</h2>" + figure_html(
        fig, f'Arkkio torque: mean {tq.get("mean_nm", 0):.4f} N·m, ripple {tq.get("ripple_pct", 0):.2f} %'))

    # Saturation map with region outlines, and per-tooth peaks.
    if "saturation" in f:
        nodes = f["mesh/nodes"][...]
        tri = f["mesh/triangles"][...][:, :3]
        region = f["mesh/triangle_region"][...]
        peak = f["saturation/peak_B"][...]
        fig, ax = plt.subplots(figsize=(6, 6))
        mesh = Triangulation(nodes[:, 0] * 1e3, nodes[:, 1] * 1e3, tri)
        pc = ax.tripcolor(mesh, facecolors=peak, cmap="inferno", shading="flat")
        ax.add_collection(LineCollection(outlines(nodes, tri, region), colors="white", linewidths=0.3))
        ax.set_aspect("equal")
        ax.set_xlabel("x (mm)")
        ax.set_ylabel("y (mm)")
        fig.colorbar(pc, ax=ax, label="peak |B| over the period (T)", shrink=0.8)
        parts.append("<h2>Saturation</h2>" + figure_html(fig, "Peak |B| over the last period, region outlines in white"))
        zones = f["saturation/zones"]
        names = [text(n) for n in zones["name"][...]]
        idx = [i for i, n in enumerate(names) if n.startswith("stator tooth ") and "tip" not in n]
        fig, ax = plt.subplots(figsize=(8, 3))
        ax.bar([zones["angle"][i] for i in idx], [zones["peak_B"][i] for i in idx], width=2.5, color=WARM)
        thr = s["saturation"]["threshold_tesla"]
        if thr > 0:
            ax.axhline(thr, color=MUTED, ls="--", lw=1, label=f"threshold {thr:.2f} T")
            ax.legend(frameon=False, fontsize=8)
        ax.set_xlabel("tooth centre, mechanical angle (°)")
        ax.set_ylabel("peak |B| (T)")
        parts.append(figure_html(fig, "Peak |B| per stator tooth body"))

    # The cage and the power balance.
    if "cage" in s or "power" in s:
        rows = []
        c, pw = s.get("cage"), s.get("power")
        if c:
            rows += [["bar current", f'{c["bar_rms_a"]:.1f} A RMS: forward wave {c["forward"]["bar_rms_a"]:.1f} A at '
                      f'{c["forward"]["frequency_hz"]:.3g} Hz, backward {c["backward"]["bar_rms_a"]:.1f} A at '
                      f'{c["backward"]["frequency_hz"]:.3g} Hz'],
                     ["ring segments", f'{c["ring_rms_a"]:.1f} A ({c["ring_to_bar"]:.3f} × the bars)'],
                     ["cage loss", f'{c["loss_w"]:.1f} W (bars {c["loss_bars_w"]:.1f}, rings {c["loss_rings_w"]:.1f}): '
                      f'forward field {c["forward"]["loss_w"]:.1f} W, backward {c["backward"]["loss_w"]:.1f} W, '
                      f'rest {c["loss_rest_w"]:.1f} W'],
                     ["cage temperature", f'{c["temperature_c"]:g} °C (a case value)']]
        if pw:
            rows += [["power", f'input {pw["input_w"]:.0f} W, stator copper {pw["stator_copper_w"]:.0f} W, cage '
                      f'{pw["cage_w"]:.0f} W, mechanical {pw["mechanical_w"]:.0f} W at slip {pw["slip"]:.4f}'],
                     ["efficiency", f'{pw["efficiency_pct"]:.2f} % (iron-loss estimate {pw["iron_estimate_w"]:.0f} W '
                      "included; no friction, windage or stray load loss)"],
                     ["power factor", f'{pw["power_factor"]:.3f} arithmetic, {pw["displacement_factor"]:.3f} '
                      "positive-sequence displacement"]]
        z2 = s["supply"].get("negative_sequence_impedance")
        if z2:
            rows.append(["negative sequence", f'V2/I2 = {z2["ohm"]:.3f} Ω at {z2["angle_deg"]:.1f}°; current '
                         f'unbalance {s["supply"]["unbalance_amplification"]:.2f} × the voltage unbalance'])
        parts.append("<h2>Cage and power</h2>" + table_html(["item", "value"], rows))

    # Losses, against the baseline when there is one.
    if "losses" in s:
        lo = s["losses"]
        labels = ["iron, stator", "iron, rotor", "copper", "cage"]
        cage_w = s.get("cage", {}).get("loss_w", 0.0)
        run = [lo["iron_stator_w"], lo["iron_rotor_w"], lo["copper_w"], cage_w]
        fig, ax = plt.subplots(figsize=(6, 3))
        x = np.arange(4)
        if "baseline" in s:
            bdir = s["baseline"]["dir"]
            bsum = json.load(open(os.path.join(bdir, "summary.json")))
            bs = bsum["losses"]
            base = [bs["iron_stator_w"], bs["iron_rotor_w"], bs["copper_w"],
                    bsum.get("cage", {}).get("loss_w", 0.0)]
            ax.bar(x - 0.2, base, width=0.4, color=MUTED, label="balanced baseline")
            ax.bar(x + 0.2, run, width=0.4, color=ACCENT, label="this supply")
            ax.legend(frameon=False, fontsize=8)
            tot = s["baseline"]["losses"]["total_w"]
            caption = f'Losses: {tot["run"]:.1f} W against {tot["baseline"]:.1f} W balanced ({tot["change_pct"]:+.2f} %)'
        else:
            ax.bar(x, run, width=0.5, color=ACCENT)
            caption = f'Losses: {sum(run):.1f} W (run with --baseline for the comparison)'
        ax.set_xticks(x, labels)
        ax.set_ylabel("W")
        parts.append("<h2>Losses</h2>" + figure_html(fig, caption))
        if "baseline" in s:
            parts.append("<p>" + html.escape(s["baseline"]["guidance"]) + "</p><div class='caution'>" +
                         html.escape(s["baseline"]["caution"]) + "</div>")

    write_page(out, s, parts)


if __name__ == "__main__":
    if len(sys.argv) != 2:
        sys.exit("usage: make_report.py DIR  (the output folder of a gapflux run)")
    main(sys.argv[1])
