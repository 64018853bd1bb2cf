"""Wall time and peak memory of the PDF checklist for each example setup.

Run by hand (not part of the test suite):  python benchmarks/report.py [SETUP ...]

Each setup runs in a fresh Python process that loads it, assesses it (``planner.assess``; an
invented stand-in assessment if that module is not there yet, which the output says), renders
the PDF and reports the time of each step and the process's peak resident memory
(``ru_maxrss``, which includes the interpreter and libraries). Target: the largest example
under 5 s wall and under 500 MB.
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
try:
    from planner.assess import assess
    stand_in = False
except ModuleNotFoundError:
    sys.path.insert(0, sys.argv[2])
    from tests.reports.test_pdf import sample_assessment
    assess = lambda s: sample_assessment(s.title)
    stand_in = True
assessment = assess(setup)
assessed = time.perf_counter()
pdf = render_pdf(inputs_from_setup(setup, assessment, fingerprint(setup), None, created_epoch=0))
rendered = time.perf_counter()
print(json.dumps({"import_s": imported - start, "load_s": loaded - imported, "assess_s": assessed - loaded,
                  "render_s": rendered - assessed, "total_s": rendered - start, "pdf_bytes": len(pdf),
                  "peak_MB": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024, "stand_in": stand_in,
                  "findings": len(getattr(assessment, "findings", []) or [])}))
"""


def measure(setup: Path) -> dict:
    result = subprocess.run([sys.executable, "-c", CHILD, str(setup), str(ROOT)], capture_output=True, text=True,
                            cwd=ROOT, timeout=600)
    if result.returncode != 0:
        return {"error": result.stderr.strip().splitlines()[-1] if result.stderr.strip() else "failed"}
    return json.loads(result.stdout.strip().splitlines()[-1])


def main(arguments: list[str]) -> None:
    setups = [Path(a) for a in arguments] or sorted(p for p in (ROOT / "setups").glob("*.yaml")
                                                    if "site-rules" not in p.name)
    print(f"{'setup':38s} {'import':>7s} {'assess':>7s} {'render':>7s} {'total':>7s} {'peak MB':>8s} {'pages KB':>8s}")
    for setup in setups:
        row = measure(setup)
        if "error" in row:
            print(f"{setup.name:38s} error: {row['error']}")
            continue
        note = "  (stand-in assessment: planner.assess not present)" if row["stand_in"] else ""
        print(f"{setup.name:38s} {row['import_s']:7.2f} {row['assess_s']:7.2f} {row['render_s']:7.2f} "
              f"{row['total_s']:7.2f} {row['peak_MB']:8.0f} {row['pdf_bytes'] / 1024:8.0f}{note}")


if __name__ == "__main__":
    main(sys.argv[1:])
