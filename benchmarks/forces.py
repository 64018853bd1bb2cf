"""Speed and accuracy of the magnet-pair forces against magpylib's meshed force.

Run by hand: ``python benchmarks/forces.py``. Not part of the test suite.

For each arrangement (coaxial, offset, tilted) and gap (1, 5, 20 mm) it reports:
- the time of our general charge-model quadrature at rtol = 1e-3 and its error against a
  tight reference (the same quadrature at rtol = 1e-8, which agrees with the exact closed
  form to ~1e-8 where one exists);
- the smallest magpylib meshing (test-only reference library, magpylib.getFT) from a
  geometric ladder whose force error is within 0.1 %, and its time;
- the time of the exact fast paths (coaxial cylinders, parallel cuboids);
- the time of one call of the source's field at as many points as the first quadrature
  pass uses (416 for a cylinder target magnetized along its axis): the floor under which
  the general force cannot go without a lighter field evaluation.
Times are the best of a few repeats on this machine.
"""
from __future__ import annotations

import time

import numpy as np

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.forces import force_and_torque_by_charges, force_between, place_at_gap

SOURCE = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=10e-3, height=5e-3)
TILT = rotation_from_axis([np.sin(np.radians(30)), 0, np.cos(np.radians(30))])
TARGETS = {
    "coaxial": MagnetBody("cylinder", [0, 0, 0.02], np.eye(3), [0, 0, 1.2], diameter=8e-3, height=4e-3),
    "offset": MagnetBody("cylinder", [3e-3, 1e-3, 0.02], np.eye(3), [0, 0, 1.2], diameter=8e-3, height=4e-3),
    "tilted": MagnetBody("cylinder", [1e-3, 0, 0.02], TILT, 1.2 * TILT[:, 2], diameter=8e-3, height=4e-3),
}
GAPS = (1e-3, 5e-3, 20e-3)
MESH_LADDER = (100, 300, 1000, 3000, 10000, 30000, 100000, 300000)


def best_time(function, repeats=5):
    best, result = np.inf, None
    for _ in range(repeats):
        start = time.perf_counter()
        result = function()
        best = min(best, time.perf_counter() - start)
    return best, result


def magpylib_object(magpy, body):
    from scipy.spatial.transform import Rotation

    return magpy.magnet.Cylinder(dimension=(body.diameter, body.height),
                                 polarization=body.rotation.T @ body.polarization,
                                 position=body.center,
                                 orientation=Rotation.from_matrix(body.rotation))


def main():
    try:
        import magpylib as magpy
    except ImportError:  # the comparison needs the test-only reference library
        magpy = None
    print(f"{'case':8} {'gap':>6} {'ours ms':>8} {'ours err':>9} {'mesh':>7} {'ref ms':>9} "
          f"{'ref err':>9} {'speed-up':>8}")
    for name, start in TARGETS.items():
        for gap in GAPS:
            target = place_at_gap(start, SOURCE, [0, 0, -1], gap)
            truth = force_and_torque_by_charges(target, SOURCE, rtol=1e-8)[0]
            ours_time, (ours, _) = best_time(lambda: force_and_torque_by_charges(target, SOURCE))
            ours_error = np.linalg.norm(ours - truth) / np.linalg.norm(truth)
            line = f"{name:8} {gap * 1e3:5.0f}mm {ours_time * 1e3:8.2f} {ours_error:9.1e}"
            if magpy is not None:
                source_object, target_object = (magpylib_object(magpy, SOURCE),
                                                magpylib_object(magpy, target))
                reached = None
                for cells in MESH_LADDER:
                    ref_time, (force, _) = best_time(
                        lambda: magpy.getFT(source_object, target_object, meshing=cells, eps=1e-8),
                        repeats=2)
                    error = np.linalg.norm(force - truth) / np.linalg.norm(truth)
                    reached = (cells, ref_time, error)
                    if error <= 1e-3:
                        break
                cells, ref_time, error = reached
                flag = "" if error <= 1e-3 else " (0.1% not reached)"
                line += (f" {cells:7d} {ref_time * 1e3:9.2f} {error:9.1e} "
                         f"{ref_time / ours_time:7.1f}x{flag}")
            print(line)
    block_a = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.3], size=[10e-3, 6e-3, 5e-3])
    block_b = MagnetBody("block", [3e-3, 1e-3, 6e-3], np.eye(3), [0, 0, 1.2], size=[8e-3, 6e-3, 4e-3])
    coaxial = place_at_gap(TARGETS["coaxial"], SOURCE, [0, 0, -1], 1e-3)
    for label, pair in (("coaxial cylinders (Vokoun et al.)", (coaxial, SOURCE)),
                        ("parallel cuboids (Akoun & Yonnet)", (block_b, block_a))):
        elapsed, _ = best_time(lambda: force_between(*pair), repeats=50)
        print(f"fast path, {label}: {elapsed * 1e3:.3f} ms per force")
    from planner.physics.fields import field_of_body

    points = np.random.default_rng(1).normal(size=(416, 3)) * 3e-3 + [0, 0, 0.012]
    elapsed, _ = best_time(lambda: field_of_body(SOURCE, points), repeats=50)
    print(f"one field call at 416 points (the first pass): {elapsed * 1e3:.3f} ms")


if __name__ == "__main__":
    main()
