"""The mesh cache shared by runs at once, through the CLI.

Usage: test_mesh_cache.py GAPFLUX EXAMPLES_DIR TMP_DIR
Checks: four `gapflux mesh` runs started together on one empty cache all succeed and write the
same mesh.vtu; the cache then holds one whole entry and no temporary file; a fifth run reads that
entry and writes the same mesh.vtu again; `mesh-cache clear` empties it; GAPFLUX_MESH_CACHE=off
writes nothing. (Bit-equality is the criterion: the cache stores the mesher's doubles as they are.)
"""
import filecmp
import os
import shutil
import subprocess
import sys

gapflux, examples, tmp = sys.argv[1:4]
shutil.rmtree(tmp, ignore_errors=True)
os.makedirs(tmp)
failures = []


def check(condition, message):
    if not condition:
        failures.append(message)


cache = os.path.join(tmp, "cache")
env = dict(os.environ, GAPFLUX_MESH_CACHE=cache)
case = os.path.join(examples, "pump_4p36s.toml")


def mesh(out, environment=env):
    return subprocess.Popen([gapflux, "mesh", case, "--out", os.path.join(tmp, out)], env=environment,
                            stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True)


together = [mesh(f"together_{i}") for i in range(4)]
outputs = [p.communicate()[0] for p in together]
for i, (p, text) in enumerate(zip(together, outputs)):
    check(p.returncode == 0, f"run {i} at once with the others failed: {text[-400:]}")
entries = sorted(os.listdir(cache)) if os.path.isdir(cache) else []
check(len([e for e in entries if e.endswith(".mesh")]) == 1, f"cache after four runs at once: {entries}")
check(not [e for e in entries if ".tmp." in e], f"temporary files left in the cache: {entries}")
first = os.path.join(tmp, "together_0", "mesh.vtu")
for i in range(1, 4):
    check(filecmp.cmp(first, os.path.join(tmp, f"together_{i}", "mesh.vtu"), shallow=False),
          f"run {i}'s mesh.vtu differs from run 0's")

later = mesh("later")
text = later.communicate()[0]
check(later.returncode == 0 and "mesh from the cache" in text, f"fifth run did not read the cache: {text[-400:]}")
check(filecmp.cmp(first, os.path.join(tmp, "later", "mesh.vtu"), shallow=False),
      "the mesh read from the cache differs from the one meshed")

info = subprocess.run([gapflux, "mesh-cache", "info"], env=env, capture_output=True, text=True)
check(info.returncode == 0 and "holds 1 mesh" in info.stdout, f"mesh-cache info: {info.stdout} {info.stderr}")
clear = subprocess.run([gapflux, "mesh-cache", "clear"], env=env, capture_output=True, text=True)
check(clear.returncode == 0 and not os.listdir(cache), f"mesh-cache clear left {os.listdir(cache)}: {clear.stdout}")

off_cache = os.path.join(tmp, "off_cache")
off = mesh("off", dict(os.environ, GAPFLUX_MESH_CACHE="off", XDG_CACHE_HOME=off_cache))
text = off.communicate()[0]
check(off.returncode == 0 and "in the cache" not in text and "from the cache" not in text, f"with the cache off: {text[-300:]}")
check(not os.path.exists(off_cache), "GAPFLUX_MESH_CACHE=off still wrote a cache")

for f in failures:
    print("FAIL:", f)
print(f"{'FAILED' if failures else 'passed'}: mesh cache shared by runs at once")
sys.exit(1 if failures else 0)
