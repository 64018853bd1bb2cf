"""Keep-out distances of all magnets at once, in worker processes."""
from __future__ import annotations

import numpy as np

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.zones import keep_out_radii, keep_out_table


def small_bench():
    return [MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=0.01, height=0.005),
            MagnetBody("block", [0.05, 0.01, 0], rotation_from_axis([1, 0, 0]), [1.2, 0, 0],
                       size=[0.01, 0.01, 0.02]),
            MagnetBody("sphere", [-0.04, 0.03, 0], np.eye(3), [0, 1.2, 0], diameter=0.008)]


def test_table_in_workers_equals_one_by_one():
    bodies, thresholds = small_bench(), [3e-3, 0.5e-3]
    table = keep_out_table(bodies, thresholds, workers=2)
    # identity: the same pure function per magnet, wherever it runs
    expected = np.array([keep_out_radii(bodies, i, thresholds) for i in range(len(bodies))])
    assert table.shape == (3, 2)
    assert np.array_equal(table, expected)
    assert np.array_equal(keep_out_table(bodies, thresholds, workers=1), expected)
