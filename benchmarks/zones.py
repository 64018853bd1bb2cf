"""Speed of the zone calculations on the largest example setup and on an invented 30-magnet bench
layout (run by hand).

    python benchmarks/zones.py [--magnets 30] [--resolution 400]

Times (1) keep-out distances for every magnet of the example in setups/ with the most magnets,
at the thresholds in force for it (its site rules applied), as ``assess`` and ``report`` work
them out (``planner.calculations.keep_out.keep_out_distances``); (2) the same for the 30-magnet
bench at the default thresholds, read from hazards/thresholds.yaml (0.1, 0.5, 1, 2, 3, 6 and
400 mT when this was written), as the program computes them (``keep_out_table``: one worker
process per core; ``--workers 1`` for one core); and (3) a plan map of the bench's total field
on a resolution x resolution grid with its contours at the same thresholds. Targets: under
1 s each. Each is run ``--repeat`` times (default 3): the first run is cold (the bodies' bound
tables are built), and this machine's speed drifts, so the best and the median are printed
too. The bench layout is invented for the benchmark: discs and blocks of N35-N52 and ferrite
spaced along a 2 m bench.
"""
from __future__ import annotations

import argparse
import time
from pathlib import Path

import numpy as np

from hazards.thresholds import effective_thresholds
from planner.calculations.keep_out import KEEP_OUT_THRESHOLDS, field_thresholds, keep_out_distances
from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.zones import available_workers, field_contours, keep_out_table
from planner.setup import SetupError, load_setup, site_rules_of
from planner.setup.model import SiteRules

#: The distinct field values [T] that get a keep-out distance with no site overrides, taken from
#: hazards/thresholds.yaml the way planner.calculations.keep_out.PendingKeepOut takes them.
DEFAULT_THRESHOLDS = np.unique([t.value for t in field_thresholds(effective_thresholds(SiteRules()))
                                if t.id in KEEP_OUT_THRESHOLDS])


def layout(count, seed=5):
    rng = np.random.default_rng(seed)
    bodies = []
    for k in range(count):
        centre = [-1.0 + 2.0 * k / max(count - 1, 1), rng.uniform(-0.3, 0.3), 0.0]
        axis = rng.normal(size=3)
        remanence = rng.choice([0.4, 1.2, 1.3, 1.45])
        direction = axis / np.linalg.norm(axis)
        if k % 3 == 2:
            body = MagnetBody("block", centre, rotation_from_axis(axis), remanence * direction,
                              size=rng.uniform(5e-3, 25e-3, size=3))
        else:
            body = MagnetBody("cylinder", centre, rotation_from_axis(axis), remanence * direction,
                              diameter=rng.uniform(5e-3, 25e-3), height=rng.uniform(3e-3, 12e-3))
        bodies.append(body)
    return bodies


def largest_example():
    """(file name, Setup) of the example in setups/ with the most magnets."""
    examples = []
    for path in sorted((Path(__file__).resolve().parent.parent / "setups").glob("*.yaml")):
        try:
            examples.append((path.name, load_setup(path)))
        except SetupError:  # the site-rules example is not a setup
            continue
    return max(examples, key=lambda item: len(item[1].magnets))


def timed(repeat, work):
    """``work()``'s result and its wall times [s] over ``repeat`` runs (the first one cold)."""
    seconds = []
    for _ in range(repeat):
        start = time.perf_counter()
        result = work()
        seconds.append(time.perf_counter() - start)
    return result, seconds


def summary(seconds):
    """The first run and, over several, the best and the median: this machine's speed drifts."""
    if len(seconds) == 1:
        return f"{seconds[0]:.2f} s"
    return (f"{seconds[0]:.2f} s first run; best {min(seconds):.2f} s, median {np.median(seconds):.2f} s "
            f"of {len(seconds)}")


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--magnets", type=int, default=30)
    parser.add_argument("--resolution", type=int, default=400)
    parser.add_argument("--workers", type=int, default=None, help="worker processes (default: every core)")
    parser.add_argument("--repeat", type=int, default=3, help="runs of each measurement (default 3)")
    options = parser.parse_args()
    bodies = layout(options.magnets)
    workers = available_workers() if options.workers is None else options.workers

    name, example = largest_example()
    thresholds = effective_thresholds(site_rules_of(example))
    rows, seconds = timed(options.repeat, lambda: keep_out_distances(example, thresholds))
    print(f"keep-out, largest example ({name}: {len(example.magnets)} magnets x "
          f"{len({row.threshold_T for row in rows})} thresholds, as assess works them out): {summary(seconds)}")

    radii, seconds = timed(options.repeat, lambda: keep_out_table(bodies, DEFAULT_THRESHOLDS, workers=workers))
    print(f"keep-out, {len(bodies)} magnets x {len(DEFAULT_THRESHOLDS)} thresholds, {workers} worker(s): "
          f"{summary(seconds)}")
    print("  largest distance per threshold [cm]:",
          ", ".join(f"{t * 1e3:g} mT {r * 100:.1f}" for t, r in zip(DEFAULT_THRESHOLDS, radii.max(axis=0))))

    lines, seconds = timed(options.repeat, lambda: field_contours(bodies, DEFAULT_THRESHOLDS, view="plan", offset=0.0,
                                                                  resolution=options.resolution))
    print(f"plan map {options.resolution} x {options.resolution} with contours: {summary(seconds)} "
          f"({sum(len(v) for v in lines.values())} closed lines)")


if __name__ == "__main__":
    main()
