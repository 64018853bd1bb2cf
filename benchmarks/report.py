"""Wall time and peak memory of the PDF checklist for each example setup.

Run by hand (not part of the test suite):  python benchmarks/report.py [SETUP ...]

Each setup runs in a fresh Python process that loads it, assesses it (``planner.assess``),
renders the PDF and reports the time of each step, the process's peak resident memory
(``ru_maxrss``, which includes the interpreter and libraries) and that of the largest keep-out
worker process it forked (``RUSAGE_CHILDREN``; they share the parent's pages until they write).
Target: the largest example under 5 s wall on a 2-core machine and under 500 MB.
"""
from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
CHILD = r"""
import json, resource, sys, time
start = time.perf_counter()
from planner.setup import load_setup
from reports.fingerprint import fingerprint
from reports.pdf import inputs_from_setup, render_pdf
imported = time.perf_counter()
setup = load_setup(sys.argv[1])
loaded = time.perf_counter()
from planner.assess import assess
assessment = assess(setup)
assessed = time.perf_counter()
pdf = render_pdf(inputs_from_setup(setup, assessment, fingerprint(setup), None, created_epoch=0))
rendered = time.perf_counter()
print(json.dumps({"import_s": imported - start, "load_s": loaded - imported, "assess_s": assessed - loaded,
                  "render_s": rendered - assessed, "total_s": rendered - start, "pdf_bytes": len(pdf),
                  "peak_MB": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024,
                  "worker_peak_MB": resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024,
                  "findings": len(getattr(assessment, "findings", []) or [])}))
"""


def measure(setup: Path) -> dict:
    result = subprocess.run([sys.executable, "-c", CHILD, str(setup)], capture_output=True, text=True,
                            cwd=ROOT, timeout=600)
    if result.returncode != 0:
        return {"error": result.stderr.strip().splitlines()[-1] if result.stderr.strip() else "failed"}
    return json.loads(result.stdout.strip().splitlines()[-1])


def main(arguments: list[str]) -> None:
    setups = [Path(a) for a in arguments] or sorted(p for p in (ROOT / "setups").glob("*.yaml")
                                                    if "site-rules" not in p.name)
    print(f"{'setup':38s} {'import':>7s} {'assess':>7s} {'render':>7s} {'total':>7s} {'peak MB':>8s} "
          f"{'worker MB':>9s} {'PDF KB':>7s}")
    for setup in setups:
        row = measure(setup)
        if "error" in row:
            print(f"{setup.name:38s} error: {row['error']}")
            continue
        print(f"{setup.name:38s} {row['import_s']:7.2f} {row['assess_s']:7.2f} {row['render_s']:7.2f} "
              f"{row['total_s']:7.2f} {row['peak_MB']:8.0f} {row['worker_peak_MB']:9.0f} {row['pdf_bytes'] / 1024:7.0f}")


if __name__ == "__main__":
    main(sys.argv[1:])
