"""Speed, accuracy and memory of planner.physics.fields against the reference library.

Run by hand (not part of the test suite):  python benchmarks/fields.py [points]

For each shape: points per second of field_of_body and of magpylib on the same random
points in the same run, their ratio, the largest relative difference |dB|/|B| and the
peak memory traced by tracemalloc while our function runs. magpylib is used here only as
a reference (it is a test-only dependency). The two are timed alternately, best of five,
so that load from other processes affects both alike; the load average is printed.
"""
from __future__ import annotations

import os
import sys
import time
import tracemalloc
from pathlib import Path

import numpy as np

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.fields import field_of_body

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # the repository root, for tests.physics
from tests.physics.references import magpylib_source  # noqa: E402

TURN = rotation_from_axis([0.3, -0.5, 0.8])
CASES = [
    ("cylinder, axial", MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.3],
                                   diameter=0.02, height=0.01)),
    ("cylinder, axial, rotated", MagnetBody("cylinder", [0.001, 0, 0], TURN, TURN @ [0, 0, 1.3],
                                            diameter=0.02, height=0.01)),
    ("cylinder, tilted J, rotated", MagnetBody("cylinder", [0.001, 0, 0], TURN,
                                               TURN @ [0.6, -0.4, 1.0], diameter=0.02, height=0.01)),
    ("ring, axial", MagnetBody("ring", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=0.02,
                               inner_diameter=0.008, height=0.01)),
    ("block, axial", MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.3],
                                size=[0.02, 0.01, 0.03])),
    ("block, tilted J, rotated", MagnetBody("block", [0.001, 0, 0], TURN, TURN @ [0.6, -0.4, 1.0],
                                            size=[0.02, 0.01, 0.03])),
    ("sphere", MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=0.02)),
]


def timed_pair(first, second, repeats=5):
    """Best-of-``repeats`` wall times of two functions, run alternately so that load from
    other processes on the machine affects both alike."""
    best = [np.inf, np.inf]
    results = [None, None]
    for _ in range(repeats):
        for index, function in enumerate((first, second)):
            start = time.perf_counter()
            results[index] = function()
            best[index] = min(best[index], time.perf_counter() - start)
    return best, results


def main(count=10**6):
    import magpylib

    rng = np.random.default_rng(0)
    points = rng.uniform(-0.05, 0.05, (count, 3))
    load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    print(f"{count} random points in a 10 cm cube; best of 5 alternating runs each; "
          f"load average {load:.2f} on {os.cpu_count()} processors")
    print(f"{'case':30s} {'ours [pt/s]':>12s} {'magpylib':>12s} {'ratio':>6s} "
          f"{'max rel diff':>12s} {'peak MB':>8s}")
    for name, body in CASES:
        source = magpylib_source(body, magpylib)
        (ours_time, theirs_time), (ours, theirs) = timed_pair(
            lambda: field_of_body(body, points), lambda: source.getB(points))
        magnitude = np.linalg.norm(theirs, axis=1)
        finite = np.all(np.isfinite(ours), axis=1) & (magnitude > 0)
        difference = np.max(np.linalg.norm(ours - theirs, axis=1)[finite] / magnitude[finite])
        tracemalloc.start()
        field_of_body(body, points)
        peak = tracemalloc.get_traced_memory()[1] / 1e6
        tracemalloc.stop()
        print(f"{name:30s} {count / ours_time:12.3g} {count / theirs_time:12.3g} "
              f"{theirs_time / ours_time:6.2f} {difference:12.2e} {peak:8.1f}")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 10**6)
