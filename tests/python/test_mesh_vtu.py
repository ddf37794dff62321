"""mesh.vtu from the CLI, read with an independent reader (meshio, Debian's python3-meshio).

Usage: test_mesh_vtu.py GAPFLUX EXAMPLES_DIR TMP_DIR
Checks: the file reads; cells are quadratic triangles; the cell count and the per-kind
triangle counts match what `gapflux mesh` printed; every region_id is in the id -> name map.
"""
import os
import shutil
import re
import subprocess
import sys

import meshio
import numpy as np

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)  # each run starts from an empty scratch folder
os.makedirs(tmp)
failures = []


def check(condition, message):
    if not condition:
        failures.append(message)


for name in ["pump_4p36s", "compressor_2p24s", "reference_radial_4p24s"]:
    out = os.path.join(tmp, name)
    run = subprocess.run([gapflux, "mesh", os.path.join(examples, name + ".toml"), "--out", out],
                         capture_output=True, text=True)
    check(run.returncode == 0, f"{name}: gapflux mesh failed: {run.stderr}")
    printed = {m.group(1): int(m.group(2))
               for m in re.finditer(r"^(\w+)\s+(\d+)\s+[\d.]+$", run.stdout, re.M)}
    mesh = meshio.read(os.path.join(out, "mesh.vtu"))
    check([c.type for c in mesh.cells] == ["triangle6"], f"{name}: cell types {[c.type for c in mesh.cells]}")
    region = np.concatenate(mesh.cell_data["region_id"])
    side = np.concatenate(mesh.cell_data["side"])
    ids = np.asarray(mesh.field_data["region_ids"]).ravel()
    names = bytes(np.asarray(mesh.field_data["region_names"], dtype=np.uint8).ravel()).split(b"\0")[:-1]
    names = [n.decode() for n in names]
    check(len(ids) == len(names), f"{name}: {len(ids)} ids, {len(names)} names")
    check(set(region) <= set(ids), f"{name}: region ids outside the map")
    kind_of = {}
    for i, n in zip(ids, names):
        kind = re.sub(r"(_s\d+.*|_r\d+)$", "", n)
        kind = {"coil": "coil_side"}.get(kind, kind)
        kind_of[int(i)] = kind
    counted = {}
    for r, s in zip(region, side):
        if s == 2:
            continue  # band triangles are rebuilt per rotor angle; the table counts mesh triangles
        counted[kind_of[int(r)]] = counted.get(kind_of[int(r)], 0) + 1
    for kind, count in printed.items():
        if kind == "moving_band":
            continue
        check(counted.get(kind, 0) == count, f"{name}: {kind}: printed {count}, file has {counted.get(kind, 0)}")
    total = re.search(r"(\d+) triangles", run.stdout)
    check(total is not None and int(total.group(1)) == int((side != 2).sum()),
          f"{name}: triangle count differs from the printout")
    check(int((side == 2).sum()) > 0, f"{name}: no band triangles in the file")

for f in failures:
    print("FAIL:", f)
print(f"{3 - len({f.split(':')[0] for f in failures})} passed, {len({f.split(':')[0] for f in failures})} failed")
sys.exit(1 if failures else 0)
