"""Speed and accuracy of the magnet-pair forces against magpylib's meshed force.

Run by hand: ``python benchmarks/forces.py``. Not part of the test suite.

For each arrangement (coaxial, offset, tilted) and gap (1, 5, 20 mm) it reports:
- the time of our general charge-model quadrature at rtol = 1e-3 and its force error
  against a tight reference computed independently of its first pass and error estimate:
  adaptive tensor Gauss-Legendre quadrature (orders 8 and 12, the plain difference as error
  estimate) at rtol = 1e-10 over the general field function (the tests' plain_reference in
  tests/physics/references.py), which agrees with the closed form of Vokoun et al. to
  2.3-2.7e-9 for the coaxial pairs (measured);
- the smallest magpylib meshing (test-only reference library, magpylib.getFT) from a
  geometric ladder starting at 10 cells whose force error is within 0.1 %, and its time;
- the time of one call of the source's closed-form field at the first pass's nodes (168 to
  336, fewer for pairs farther apart): the floor under which our force cannot go without a
  faster field function, and the speed-up over magpylib that floor would give ("cap").
Times are the best mean over 15 blocks of 10 consecutive calls, the blocks of ours and
magpylib's taken alternately so that a load on the machine weighs on both alike; the
ratios are steadier than the absolute times.
Then the exact fast paths (coaxial cylinders, parallel cuboids) are timed.

Measured on the 2-core development machine (2 December 2026), quiet, two runs: every case
takes one field call; ours 0.08-0.14 ms with force errors 1e-14..6e-5 at rtol 1e-3; 19-49x
faster than magpylib where it needs 300-1000 cells (coaxial and offset at 1 and 5 mm),
13-14x at 20 mm (the source's multipole series), and 10.7-10.8x (1 mm) and 11.1-11.5x
(5 mm) for the tilted target, where magpylib needs only 30-100 cells (1.1-1.4 ms). Ratios
fall by a tenth or so when the machine is busy.
"""
from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.forces import force_and_torque_by_charges, force_between, place_at_gap
from planner.physics.forces.charge_model import FIELD_ACCURACY_SHARE, _rule_key
from planner.physics.forces.face_rules import (_series_ratio, field_in_frame_of, first_pass_size,
                                               whole_face_rule)

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # the repository root, for tests.physics
from tests.physics.references import magpylib_source, plain_reference  # noqa: E402

SOURCE = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=10e-3, height=5e-3)
TILT = rotation_from_axis([np.sin(np.radians(30)), 0, np.cos(np.radians(30))])
TARGETS = {
    "coaxial": MagnetBody("cylinder", [0, 0, 0.02], np.eye(3), [0, 0, 1.2], diameter=8e-3, height=4e-3),
    "offset": MagnetBody("cylinder", [3e-3, 1e-3, 0.02], np.eye(3), [0, 0, 1.2], diameter=8e-3, height=4e-3),
    "tilted": MagnetBody("cylinder", [1e-3, 0, 0.02], TILT, 1.2 * TILT[:, 2], diameter=8e-3, height=4e-3),
}
GAPS = (1e-3, 5e-3, 20e-3)
MESH_LADDER = (10, 30, 100, 300, 1000, 3000, 10000, 30000, 100000, 300000)
REPEATS = 15
CALLS_PER_BLOCK = 10


def reference_force(target, source, rtol=1e-10):
    """Force on ``target`` by the plain adaptive Gauss-Legendre quadrature (orders 8, 12) of
    the tests (``tests.physics.references.plain_reference``)."""
    return plain_reference(target, source, rtol=rtol)[0]


def alternate_best_times(functions, repeats=REPEATS, calls=CALLS_PER_BLOCK):
    """Best mean time per call of each function [s], over blocks of ``calls`` calls in turn.

    Blocks of consecutive calls measure each function as a caller meets it (a snap scan or
    an energy integral calls the force many times in a row); alternating the blocks makes a
    load on the machine weigh on both alike. Single calls in turn would time each function
    just after the other has filled the processor caches with its own arrays.
    """
    best = [np.inf] * len(functions)
    for _ in range(repeats):
        for k, function in enumerate(functions):
            start = time.perf_counter()
            for _ in range(calls):
                function()
            best[k] = min(best[k], (time.perf_counter() - start) / calls)
    return best


def first_pass_field_call(target, source):
    """One call of the field the first pass uses (closed form or series) at its nodes."""
    rule = whole_face_rule(*_rule_key(target), *first_pass_size(target, source))
    local_field = field_in_frame_of(target, source, accuracy=FIELD_ACCURACY_SHARE * 1e-3)
    distance = float(np.linalg.norm(target.center - source.center))
    model = "series" if _series_ratio(target, source, distance) else "closed"
    return model, lambda: local_field(rule.points)


def main():
    try:
        import magpylib as magpy
    except ImportError:  # the comparison needs the test-only reference library
        magpy = None
    print(f"{'case':8} {'gap':>5} {'ours ms':>8} {'ours err':>9} {'mesh':>7} {'ref ms':>8} "
          f"{'ref err':>8} {'speed-up':>8} {'field ms':>9} {'model':>6} {'cap':>6}")
    for name, start in TARGETS.items():
        for gap in GAPS:
            target = place_at_gap(start, SOURCE, [0, 0, -1], gap)
            truth = reference_force(target, SOURCE)
            ours = force_and_torque_by_charges(target, SOURCE)[0]
            ours_error = np.linalg.norm(ours - truth) / np.linalg.norm(truth)
            model, field_call = first_pass_field_call(target, SOURCE)
            line = f"{name:8} {gap * 1e3:3.0f}mm"
            if magpy is None:
                ours_time, field_time = alternate_best_times(
                    [lambda: force_and_torque_by_charges(target, SOURCE), field_call])
                print(f"{line} {ours_time * 1e3:8.3f} {ours_error:9.1e} "
                      f"{field_time * 1e3:9.3f} {model}")
                continue
            source_object, target_object = (magpylib_source(SOURCE, magpy),
                                            magpylib_source(target, magpy))
            for cells in MESH_LADDER:
                force, _ = magpy.getFT(source_object, target_object, meshing=cells, eps=1e-8)
                error = np.linalg.norm(force - truth) / np.linalg.norm(truth)
                if error <= 1e-3:
                    break
            flag = "" if error <= 1e-3 else " (0.1% not reached)"
            ours_time, ref_time, field_time = alternate_best_times([
                lambda: force_and_torque_by_charges(target, SOURCE),
                lambda: magpy.getFT(source_object, target_object, meshing=cells, eps=1e-8),
                field_call])
            print(f"{line} {ours_time * 1e3:8.3f} {ours_error:9.1e} {cells:7d} "
                  f"{ref_time * 1e3:8.3f} {error:8.1e} {ref_time / ours_time:7.1f}x "
                  f"{field_time * 1e3:9.3f} {model:>6} {ref_time / field_time:5.1f}x{flag}")
    print("field ms: the first pass's one field call at its nodes (model: the source's closed "
          "form, or its multipole series for pairs far apart); cap: magpylib's time over it")
    block_a = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.3], size=[10e-3, 6e-3, 5e-3])
    block_b = MagnetBody("block", [3e-3, 1e-3, 6e-3], np.eye(3), [0, 0, 1.2], size=[8e-3, 6e-3, 4e-3])
    coaxial = place_at_gap(TARGETS["coaxial"], SOURCE, [0, 0, -1], 1e-3)
    for label, pair in (("coaxial cylinders (Vokoun et al.)", (coaxial, SOURCE)),
                        ("parallel cuboids (Akoun & Yonnet)", (block_b, block_a))):
        [elapsed] = alternate_best_times([lambda: force_between(*pair)], repeats=50)
        print(f"fast path, {label}: {elapsed * 1e3:.3f} ms per force")


if __name__ == "__main__":
    main()
