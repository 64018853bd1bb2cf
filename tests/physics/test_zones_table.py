"""Keep-out distances of all magnets at once (planner.physics.zones.table and .all_magnets).

Checks: the same numbers in worker processes as in one (the same pure functions); brute-force
sampling of the exact field of planner.physics.fields beyond each distance (an independent
computation of what the proofs bound); and the settling step's bookkeeping of faces, against
the rule of planner.physics.zones.all_magnets (each face between min(R_i, R_j) and
max(R_i, R_j) proven once), which rests on the weak maximum principle (Gilbarg and
Trudinger, Elliptic Partial Differential Equations of Second Order (2001), Theorem 3.1).
"""
from __future__ import annotations

import numpy as np
import pytest

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.zones import all_magnets, keep_out_radii, keep_out_table
from tests.physics.brute_force import largest_field_beyond
from tests.physics.test_zones_shell import bench

RNG = np.random.default_rng(20261203)


def small_bench():
    return [MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=0.01, height=0.005),
            MagnetBody("block", [0.05, 0.01, 0], rotation_from_axis([1, 0, 0]), [1.2, 0, 0],
                       size=[0.01, 0.01, 0.02]),
            MagnetBody("sphere", [-0.04, 0.03, 0], np.eye(3), [0, 1.2, 0], diameter=0.008)]


def spill_over():
    """A strong block and a weak disc 30 mm apart: the block's field reaches well into the
    disc's cell, across the face between them, at the lower thresholds."""
    return [MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.4], size=[0.02, 0.02, 0.02]),
            MagnetBody("cylinder", [0.03, 0.0, 0.004], rotation_from_axis([1, 0, 0]), [0.3, 0, 0],
                       diameter=0.005, height=0.002)]


def test_table_in_workers_equals_one_process():
    # identity: the same pure functions per magnet and round, wherever they run
    bodies, thresholds = small_bench(), [3e-3, 0.5e-3]
    table = keep_out_table(bodies, thresholds, workers=2)
    assert table.shape == (3, 2)
    assert np.array_equal(table, keep_out_table(bodies, thresholds, workers=1))


@pytest.mark.parametrize("make", [small_bench, spill_over])
def test_no_point_beyond_the_table_distances_reaches_the_threshold(make):
    # brute force (60 000 random points of each cell just beyond its distance, exact field),
    # and the two proven figures, the table's and one magnet's at a time, each within 5 % or
    # 5 mm of the exact value, are within that of each other
    bodies, thresholds = make(), np.array([0.5e-3, 3e-3, 20e-3])
    table = keep_out_table(bodies, thresholds, workers=1)
    for index in range(len(bodies)):
        alone = keep_out_radii(bodies, index, thresholds)
        for k, threshold in enumerate(thresholds):
            assert largest_field_beyond(bodies, index, table[index, k], RNG) < threshold
            assert abs(table[index, k] - alone[k]) <= max(0.05 * min(table[index, k], alone[k]), 5e-3)


def test_a_grown_radius_sends_its_neighbours_back_to_the_face_between(monkeypatch):
    # Bookkeeping of the settling step: if magnet 0's radius at 6 mT grows from R to R' after
    # the first round, each neighbour with a smaller radius must cover the face towards
    # magnet 0 between max(its radius, R) and R' (or its start radius), and nothing else; a
    # larger radius stays valid (it only claims less), so the grown figure is as sound as
    # the proven one.
    bodies, thresholds = bench(), np.array([6e-3])
    first, second = rounds(bodies, thresholds)
    grown = second[0].proven * 1.3
    second[0] = second[0]._replace(proven=grown)
    calls = []
    original = all_magnets.shell.prove_all_beyond

    def recording(bodies, index, tasks, table=None, phases=("caps", "faces")):
        calls.append((index, tasks, phases))
        return original(bodies, index, tasks, table, phases)

    monkeypatch.setattr(all_magnets.shell, "prove_all_beyond", recording)
    distances = all_magnets.settle(bodies, thresholds, first, second)
    assert [index for index, _, _ in calls] == [1, 2]
    for index, ((low, high, threshold, limits),), phases in calls:
        assert second[index].shell[0] and second[index].proven[0] < first[0].proven[0]
        assert phases == ("faces",) and threshold == thresholds[0]
        assert low == max(second[index].proven[0], first[0].proven[0])
        assert high == min(grown[0], first[index].starts[0])
        assert limits[0] == high and np.count_nonzero(limits) == 1
    assert np.array_equal(distances, np.array([proof.distances for proof in second]))


def test_a_face_that_fails_between_the_radii_makes_that_magnet_try_farther_out(monkeypatch):
    # If the face towards a grown neighbour cannot be proven, the magnet with the smaller
    # radius searches again and proves a radius beyond its first one (caps and faces); its
    # distance is then checked by brute force like any other.
    bodies, thresholds = bench(), np.array([6e-3])
    first, second = rounds(bodies, thresholds)
    second[0] = second[0]._replace(proven=second[0].proven * 1.3)
    original = all_magnets.shell.prove_all_beyond
    failed = []

    def failing_once(bodies, index, tasks, table=None, phases=("caps", "faces")):
        if phases == ("faces",) and index == 2 and not failed:
            failed.append(index)
            low, high = tasks[0][:2]
            towards = bodies[0].center - bodies[2].center
            point = bodies[2].center + 0.5 * (low + high) * towards / np.linalg.norm(towards)
            return [all_magnets.shell.ShellOutcome(False, np.empty((0, 3)), point[None])]
        return original(bodies, index, tasks, table, phases)

    monkeypatch.setattr(all_magnets.shell, "prove_all_beyond", failing_once)
    distances = all_magnets.settle(bodies, thresholds, first, second)
    assert failed == [2]
    assert distances[2, 0] > second[2].distances[0]
    assert largest_field_beyond(bodies, 2, distances[2, 0], RNG) < thresholds[0]


def rounds(bodies, thresholds):
    """The two rounds of keep_out_table, in this process."""
    first = [all_magnets.caps_first(bodies, i, thresholds) for i in range(len(bodies))]
    radii = np.array([proof.proven for proof in first])
    return first, [all_magnets.faces_next(bodies, i, thresholds, first[i], radii) for i in range(len(bodies))]


def test_magnet_groups_are_runs_of_neighbours_covering_every_magnet_once():
    # Every magnet in exactly one group; each group a run of consecutive magnets along the
    # setup's longest extent; at least six groups (or one per magnet), the strongest first.
    from planner.physics.zones.table import magnet_groups
    rng = np.random.default_rng(4)
    for count in (1, 4, 13, 31):
        bodies = [MagnetBody("cylinder", [x, rng.uniform(-0.1, 0.1), 0.0], np.eye(3), [0, 0, rng.uniform(0.3, 1.4)],
                             diameter=0.01, height=0.005) for x in rng.uniform(-1.0, 1.0, count)]
        groups = magnet_groups(bodies)
        assert sorted(i for group in groups for i in group) == list(range(count))
        assert len(groups) == min(count, max(6, -(-count // 5)))
        rank = np.argsort(np.argsort([body.center[0] for body in bodies], kind="stable"))
        for group in groups:
            assert sorted(rank[group]) == list(range(min(rank[group]), max(rank[group]) + 1))
        strength = [sum(float(np.linalg.norm(bodies[i].moment)) for i in group) for group in groups]
        assert strength == sorted(strength, reverse=True)


def test_magnets_proven_in_one_group_match_one_at_a_time(monkeypatch):
    # A group's proofs share their steps (shell.prove_many, with the bodies any of them
    # needs); each magnet's distances must be what it gets in a group of its own, up to the
    # bodies then modelled rather than bounded (both proven: within 5 % or 5 mm of each
    # other), and beyond them no sampled point of its cell reaches the threshold (exact field).
    from planner.physics.zones import table as table_module
    bodies, thresholds = bench(), np.array([0.5e-3, 3e-3, 20e-3])
    alone = keep_out_table(bodies, thresholds, workers=1)
    monkeypatch.setattr(table_module, "LEAST_GROUPS", 1)
    monkeypatch.setattr(table_module, "GROUP_MAGNETS", 3)
    assert len(table_module.magnet_groups(bodies)) == 1  # all three in one group
    together = keep_out_table(bodies, thresholds, workers=1)
    assert np.all(np.abs(together - alone) <= np.maximum(0.05 * np.minimum(together, alone), 5e-3))
    for index in range(len(bodies)):
        for k, threshold in enumerate(thresholds):
            assert largest_field_beyond(bodies, index, together[index, k], RNG) < threshold
