"""Speed of the induction and eddy-current computations (planner.physics.induction, .eddy).

Run by hand (not part of the test suite):  python benchmarks/induction.py

Prints the best of several runs of each computation. Figures to reach (issue 6): an EMF
time series of 10,000 samples for a finite magnet through a multi-layer coil in under 0.2 s,
a tube drag constant in under 50 ms. The scenarios are invented for timing only.
"""
from __future__ import annotations

import time

import numpy as np

from planner.physics.eddy import sheet_drag, tube_drag_constant, tube_fall
from planner.physics.induction import (
    AxialMagnet,
    Winding,
    coil_mutual_inductance,
    coupling_table,
    flux_linkage,
    loop_mutual_inductance,
    passage_time_series,
    winding_inductance,
)

MAGNET = AxialMagnet("cylinder", 0.006, 0.0, 0.010, 1.2)
RING = AxialMagnet("ring", 0.007, 0.003, 0.006, 1.3)
COIL = Winding(800, 0.008, 0.014, 0.02, 12)       # 12 layers, 800 turns
SMALL_COIL = Winding(400, 0.008, 0.011, 0.02, 4)  # 4 layers: every layer summed exactly


def best_time(function, repeats=5):
    """Best wall time and best process CPU time of ``repeats`` calls [s].

    The CPU time is what the computation costs on an idle machine; on a shared, loaded
    machine the wall time can be several times longer.
    """
    best_wall, best_cpu = float("inf"), float("inf")
    for _ in range(repeats):
        start, start_cpu = time.perf_counter(), time.process_time()
        function()
        best_cpu = min(best_cpu, time.process_time() - start_cpu)
        best_wall = min(best_wall, time.perf_counter() - start)
    return best_wall, best_cpu


def main():
    inductance = winding_inductance(COIL)
    cases = [
        ("EMF series, 10,000 samples, cylinder, 12-layer coil, constant speed (L given)",
         lambda: passage_time_series(MAGNET, COIL, speed=1.0, resistance=50.0, inductance=inductance), 0.2),
        ("EMF series, 10,000 samples, cylinder, 12-layer coil, dropped (L computed)",
         lambda: passage_time_series(MAGNET, COIL, drop_height=0.2, resistance=50.0), 0.2),
        ("EMF series, 10,000 samples, ring, 4-layer coil, dropped (L given)",
         lambda: passage_time_series(RING, SMALL_COIL, drop_height=0.2, resistance=5.0,
                                     inductance=1e-3), 0.2),
        ("self-inductance of the 12-layer coil (66 sheet pairs)", lambda: winding_inductance(COIL), None),
        ("flux linkage by quadrature, 1,000 positions", lambda: flux_linkage(
            MAGNET, COIL, np.linspace(-0.05, 0.05, 1000)), None),
        ("tube drag constant, finite magnet, thick wall", lambda: tube_drag_constant(
            MAGNET, 0.0065, 0.0075, 58e6), 0.05),
        ("tube fall figures (drag constant plus fall time)", lambda: tube_fall(
            MAGNET, 0.0093, 1.0, 0.0065, 0.0075, 58e6), 0.05),
        ("sheet drag, finite magnet, 5 mm plate", lambda: sheet_drag(
            MAGNET, 0.01, 37.7e6, 0.005, 0.5), None),
        ("loop mutual inductance, tilted and offset", lambda: loop_mutual_inductance(
            0.1, [0, 0, 0], [0, 0, 1], 0.05, [0.03, 0.02, 0.07], [0.3, 0.2, 1.0]), None),
        ("coil mutual inductance, tilted (5 x 8 filaments each)", lambda: coil_mutual_inductance(
            COIL, [0, 0, 0], [0, 0, 1], COIL, [0.01, 0, 0.06], [0.5, 0, 1.0]), None),
        ("coupling table, 5 distances x 4 angles", lambda: coupling_table(
            SMALL_COIL, SMALL_COIL, np.linspace(0.03, 0.1, 5), np.radians([0, 30, 60, 90])), None),
    ]
    print(f"{'computation':<80} {'wall':>9} {'cpu':>9}  target (on wall time)")
    for name, function, target in cases:
        wall, cpu = best_time(function)
        verdict = "" if target is None else (f"< {target * 1e3:.0f} ms " + ("met" if wall < target else "MISSED"))
        print(f"{name:<80} {wall * 1e3:6.1f} ms {cpu * 1e3:6.1f} ms  {verdict}")


if __name__ == "__main__":
    main()
