"""Keep-out distances of every magnet at every threshold, spread over the machine's cores.

The work goes in two rounds over the magnets (:mod:`planner.physics.zones.all_magnets`):
each magnet's sphere first, then, with every magnet's radius known, the faces between
neighbouring cells, each once; a last step here settles the few radii that grew in the
second round. Within a round the magnets are independent; they go in groups of neighbours
(:func:`magnet_groups`), whose proofs share their steps, to separate worker processes when
the machine has more than one core and runs Linux, where forking is safe (the workers
inherit the loaded program instead of importing it again); elsewhere one group after
another. The numbers are the same either way: each round runs the same pure functions on
the same input, and the last step runs in this process.
"""
from __future__ import annotations

import multiprocessing
import os
import sys
from concurrent.futures import ProcessPoolExecutor, ThreadPoolExecutor

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.zones.all_magnets import caps_first_many, faces_next_many, settle
from planner.physics.zones.bounds import body_table

__all__ = ["KeepOutJob", "keep_out_table", "available_workers", "magnet_groups"]


def available_workers() -> int:
    """Cores this process may use (1 where worker processes cannot be forked)."""
    # Forking is safe on Linux; on macOS system libraries may not survive it, and Windows has none.
    if not sys.platform.startswith("linux") or "fork" not in multiprocessing.get_all_start_methods():
        return 1
    return max(len(os.sched_getaffinity(0)), 1)  # Linux always has CPU affinity


class KeepOutJob:
    """Keep-out distances being computed in worker processes; :meth:`result` waits for them.

    Lets the caller compute other figures in its own process meanwhile (the workers and the
    caller then share the cores; a thread here hands the rounds to the workers). With one
    worker the work is done in :meth:`result`.
    """

    def __init__(self, bodies: list[MagnetBody], thresholds, workers: int | None = None):
        self.bodies = list(bodies)
        self.thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
        count = len(self.bodies)
        self.workers = min(available_workers() if workers is None else int(workers), count)
        self._pool = self._rounds = self._outcome = None
        if self.workers > 1:
            # The bodies' constants, built here before forking, are inherited by every worker
            # instead of being computed again in each.
            body_table(self.bodies)
            self._pool = ProcessPoolExecutor(max_workers=self.workers, mp_context=multiprocessing.get_context("fork"))
            # The first task forks every worker at once, here in the calling thread, before
            # the thread that hands out the rounds exists (forking a process that runs
            # several threads can leave a lock held in the child).
            self._pool.submit(int)
            self._rounds = ThreadPoolExecutor(max_workers=1)
            self._outcome = self._rounds.submit(self._run, self._pool.submit)

    def _run(self, submit):
        """The two rounds and the settling step; ``submit(function, *arguments)`` returns a future."""
        bodies, thresholds = self.bodies, self.thresholds
        groups = magnet_groups(bodies)
        first = _gathered(len(bodies), groups, [submit(caps_first_many, bodies, group, thresholds)
                                                for group in groups])
        radii = np.array([proof.proven for proof in first]).reshape(len(bodies), -1)
        second = _gathered(len(bodies), groups, [submit(faces_next_many, bodies, group, thresholds,
                                                        [first[i] for i in group], radii) for group in groups])
        return settle(bodies, thresholds, first, second)

    def result(self) -> np.ndarray:
        """Distances [m], (len(bodies), len(thresholds)); see :func:`keep_out_table`."""
        if self._pool is None:
            return self._run(_Done).reshape(len(self.bodies), -1)
        try:
            return self._outcome.result()
        finally:
            self.close()

    def close(self) -> None:
        """Stop the workers (unfinished distances are dropped)."""
        if self._pool is not None:
            self._pool.shutdown(wait=True, cancel_futures=True)
            self._rounds.shutdown(wait=True)
            self._pool = None


#: Magnets per group of neighbours, and the fewest groups (see magnet_groups).
GROUP_MAGNETS = 5
LEAST_GROUPS = 6


def magnet_groups(bodies) -> list[list[int]]:
    """The magnets split into groups of neighbours, each proven in one worker's call.

    The proofs of a group share their evaluations of the field model (a few large numpy
    calls instead of many small ones, whose fixed cost dominated); neighbours need nearly
    the same bodies modelled, so a group of them costs little more per point than one
    magnet alone. The magnets are ordered along the setup's longest extent and cut into
    groups of about ``GROUP_MAGNETS``, and into at least ``LEAST_GROUPS`` (so that the work
    still spreads evenly over a few cores); the groups with the most magnetic moment come
    first, as they take longest. The groups do not depend on the number of workers, so
    neither do the distances. On the 30-magnet benchmark, groups of five took 0.59-0.61 s on
    2 cores where one magnet at a time took 0.68-0.70 s (alternating runs; groups of five
    magnets spread over the bench instead of neighbours: 0.68 s).
    """
    count = len(bodies)
    if not count:
        return []
    centres = np.array([body.center for body in bodies], dtype=float).reshape(count, 3)
    along = np.argmax(np.ptp(centres, axis=0))
    order = np.argsort(centres[:, along], kind="stable")
    parts = min(count, max(LEAST_GROUPS, -(-count // GROUP_MAGNETS)))
    groups = [[int(i) for i in part] for part in np.array_split(order, parts)]
    weight = [-sum(float(np.linalg.norm(bodies[i].moment)) for i in group) for group in groups]
    return [groups[k] for k in np.argsort(weight, kind="stable")]


def _gathered(count, groups, futures):
    """Each magnet's result, in the bodies' order, from the futures of the groups' calls."""
    result = [None] * count
    for group, future in zip(groups, futures):
        for index, value in zip(group, future.result()):
            result[index] = value
    return result


class _Done:
    """A finished computation with the interface of a future: runs ``function(*arguments)`` at once."""

    def __init__(self, function, *arguments):
        self.value = function(*arguments)

    def result(self):
        return self.value


def keep_out_table(bodies: list[MagnetBody], thresholds, workers: int | None = None) -> np.ndarray:
    """Keep-out distance [m] of each body (rows) at each threshold [T] (columns).

    Parameters
    ----------
    bodies : list of MagnetBody
        All magnets; each distance uses their total field.
    thresholds : array_like (k,)
        Flux densities [T], each > 0.
    workers : int, optional
        Worker processes; default: the cores available. 1 computes in this process.

    Returns
    -------
    ndarray (len(bodies), k)
        Row i carries the guarantee of ``keep_out_radii(bodies, i, thresholds)`` (never
        below the exact distance; 4.5 % or 4.5 mm beyond a point found at the threshold
        unless a proof needed more) and usually equals it; the faces between cells are
        proven once for both magnets (:mod:`planner.physics.zones.all_magnets`).

    Notes
    -----
    The magnets go to the workers in groups of neighbours (:func:`magnet_groups`), the
    strongest groups first (their distances take longest), so the work spreads evenly.
    :class:`KeepOutJob` starts the same work and returns at once.
    """
    return KeepOutJob(bodies, thresholds, workers).result()
