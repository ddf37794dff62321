"""What the Python benches share: the common command line and one gapflux run of a case text."""
import argparse
import json
import os
import subprocess
import sys
import time

here = os.path.dirname(os.path.abspath(__file__))
root = os.path.dirname(here)


def parser(doc, out_name):
    """The options every bench takes: --gapflux, --quick, --out (default build/OUT_NAME)."""
    p = argparse.ArgumentParser(description=doc.split("\n")[0])
    p.add_argument("--gapflux", default=os.path.join(root, "build", "gapflux"))
    p.add_argument("--quick", action="store_true")
    p.add_argument("--out", default=os.path.join(root, "build", out_name))
    return p


def run_case(gapflux, folder, name, text, tool):
    """Writes TEXT as FOLDER/NAME.toml, runs it lean into FOLDER/NAME; exits on failure.
    Returns (output folder, summary.json, wall seconds)."""
    path = os.path.join(folder, name + ".toml")
    open(path, "w").write(text)
    out = os.path.join(folder, name)
    start = time.monotonic()
    r = subprocess.run([gapflux, "run", path, "--out", out, "--lean"], capture_output=True,
                       text=True)
    wall = time.monotonic() - start
    if r.returncode != 0:
        sys.exit(f"{tool}: {name} failed ({r.returncode}): {r.stderr[-1500:]}")
    return out, json.load(open(os.path.join(out, "summary.json"))), wall
