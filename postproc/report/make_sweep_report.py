"""DIR/sweep.html from a sweep's table (sweep.h5, manifest.json): each output against each varied
parameter — one curve per combination of the other parameters — and the table itself; a
self-contained page (images embedded) drawn by matplotlib (Debian's python3-matplotlib) from
the files gapflux wrote, read with h5py.

Usage: make_sweep_report.py DIR
"""
import html
import json
import os
import sys

import h5py
import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402

from make_report import INK, ACCENT, MUTED, WARM, figure_html, table_html, text  # noqa: E402

COLOURS = [INK, ACCENT, MUTED, WARM, "#2a9d8f", "#6d597a"]


def column(f, name):
    d = f[name]
    values = d[...]
    units = text(d.attrs.get("units", b"1"))
    if values.dtype.kind in "SO":
        return [text(v) for v in values], units, False
    return values.astype(float), units, True


def label(key, units):
    return f"{key} [{units}]" if units and units != "1" else key


def main(out):
    manifest_path, table_path = os.path.join(out, "manifest.json"), os.path.join(out, "sweep.h5")
    if not (os.path.isfile(manifest_path) and os.path.isfile(table_path)):
        sys.exit(f"report: {out} holds no collected sweep (manifest.json and sweep.h5 are needed; "
                 "gapflux sweep or gapflux collect writes them)")
    manifest = json.load(open(manifest_path))
    f = h5py.File(table_path, "r")
    names = [text(n) for n in f["name"][...]]
    status = [text(s) for s in f["status"][...]]
    finished = np.array([s == "finished" for s in status])
    params = [p["key"] for p in manifest["parameters"]]
    outputs = [o for o in manifest["outputs"] if "outputs/" + o in f]
    pcols = {p: column(f, "parameters/" + p) for p in params}

    parts = [f"<p>{len(names)} cases from {html.escape(manifest['base_case'])} "
             f"({manifest['combine']}); {int(finished.sum())} finished, "
             f"{status.count('failed')} failed, {status.count('pending')} not run.</p>"]
    # Cautions as the runs give them.
    for n, s in zip(names, status):
        summary = os.path.join(out, "runs", n, "summary.json")
        if s == "finished" and os.path.isfile(summary):
            cautions = json.load(open(summary)).get("cautions", [])
            parts.append("<div class='caution'><b>Cautions.</b> " +
                         " ".join(html.escape(c) for c in cautions) + "</div>")
            break

    for o in outputs:
        y, y_units, numeric = column(f, "outputs/" + o)
        if not numeric or not np.isfinite(y[finished]).any():
            continue
        for p in params:
            x, x_units, x_numeric = pcols[p]
            others = [q for q in params if q != p]
            groups = {}
            for i in np.flatnonzero(finished):
                key = tuple(pcols[q][0][i] for q in others)
                groups.setdefault(key, []).append(i)
            fig, ax = plt.subplots(figsize=(6, 3.2))
            for g, (key, idx) in enumerate(sorted(groups.items(), key=lambda kv: kv[0])):
                xs = [x[i] for i in idx]
                order = np.argsort(xs) if x_numeric else range(len(xs))
                xs = [xs[i] for i in order]
                ys = [y[idx[i]] for i in order]
                name = ", ".join(f"{q} = {v:g}" if isinstance(v, float) else f"{q} = {v}"
                                 for q, v in zip(others, key))
                ax.plot(xs, ys, "o-", color=COLOURS[g % len(COLOURS)], lw=1.2, ms=4,
                        label=name or None)
            ax.set_xlabel(label(p, x_units))
            ax.set_ylabel(label(o, y_units))
            ax.grid(alpha=0.3)
            if len(groups) > 1:
                ax.legend(fontsize=7)
            parts.append(figure_html(fig, f"{o} against {p}"))

    header = ["name", "status"] + [label(p, pcols[p][1]) for p in params] + \
             [label(o, column(f, "outputs/" + o)[1]) for o in outputs]
    rows = []
    for i, n in enumerate(names):
        row = [n, status[i]]
        for p in params:
            v = pcols[p][0][i]
            row.append(f"{v:g}" if isinstance(v, (float, np.floating)) else v)
        for o in outputs:
            v = column(f, "outputs/" + o)[0][i]
            row.append(f"{v:.5g}" if isinstance(v, (float, np.floating)) and np.isfinite(v) else "")
        rows.append(row)
    parts.append("<h2>Table</h2>" + table_html(header, rows))

    style = ("body{font-family:sans-serif;max-width:60em;margin:2em auto;color:#1d3557}"
             "table{border-collapse:collapse;margin:0.5em 0}td,th{border-bottom:1px solid #ccd;"
             "padding:0.2em 0.6em;text-align:left;font-size:0.8em}figure{margin:1em 0}"
             "img{max-width:100%}figcaption{font-size:0.85em;color:#556}"
             ".caution{background:#fff4e5;border-left:4px solid #e07a1f;padding:0.5em 1em;margin:1em 0}")
    title = f"gapflux sweep: {os.path.basename(os.path.abspath(out))}"
    page = (f"<!DOCTYPE html><html><head><meta charset='utf-8'><title>{html.escape(title)}</title>"
            f"<style>{style}</style></head><body><h1>{html.escape(title)}</h1>" + "".join(parts) +
            "</body></html>")
    path = os.path.join(out, "sweep.html")
    with open(path + ".partial", "w") as page_file:
        page_file.write(page)
    os.replace(path + ".partial", path)
    print(f"report: {path}")


if __name__ == "__main__":
    if len(sys.argv) != 2:
        sys.exit("usage: make_sweep_report.py DIR")
    main(sys.argv[1])
