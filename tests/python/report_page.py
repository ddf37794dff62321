"""The report of a run folder (postproc/report/make_report.py, matplotlib), made as `script/report`
makes it: returns (exit code, stderr, the page's HTML or None)."""
import os
import subprocess
import sys

MAKE_REPORT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "postproc",
                           "report", "make_report.py")


def report_page(folder):
    r = subprocess.run([sys.executable, MAKE_REPORT, folder], capture_output=True, text=True)
    page = open(os.path.join(folder, "report.html")).read() if r.returncode == 0 else None
    return r.returncode, r.stderr, page
