"""Pass/fail bookkeeping shared by the Python output checks: each check counts, and the run ends
with the plain closing line 'N passed, N failed' and a non-zero exit on any failure."""
import sys

failures = []
passed = 0


def check(condition, message):
    global passed
    if condition:
        passed += 1
    else:
        failures.append(message)


def finish():
    for f in failures:
        print("FAIL:", f)
    print(f"{passed} passed, {len(failures)} failed")
    sys.exit(1 if failures else 0)
