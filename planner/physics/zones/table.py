"""Keep-out distances of every magnet at every threshold, spread over the machine's cores.

The work goes in two rounds over the magnets (:mod:`planner.physics.zones.all_magnets`):
each magnet's sphere first, then, with every magnet's radius known, the faces between
neighbouring cells, each once; a last step here settles the few radii that grew in the
second round. Within a round the magnets are independent, so they run in separate worker
processes when the machine has more than one core and runs Linux, where forking is safe
(the workers inherit the loaded program instead of importing it again); elsewhere one by
one. The numbers are the same either way: each round runs the same pure functions on the
same input, and the last step runs in this process.
"""
from __future__ import annotations

import multiprocessing
import os
import sys
from concurrent.futures import ProcessPoolExecutor, ThreadPoolExecutor

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.zones.all_magnets import caps_first, faces_next, settle
from planner.physics.zones.bounds import body_table

__all__ = ["KeepOutJob", "keep_out_table", "available_workers"]


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
        # the largest magnets first: their distances take longest, so the work spreads evenly
        order = np.argsort([-float(np.linalg.norm(body.moment)) for body in bodies], kind="stable")
        futures = {int(i): submit(caps_first, bodies, int(i), thresholds) for i in order}
        first = [futures[i].result() for i in range(len(bodies))]
        radii = np.array([proof.proven for proof in first]).reshape(len(bodies), -1)
        futures = {int(i): submit(faces_next, bodies, int(i), thresholds, first[i], radii) for i in order}
        second = [futures[i].result() for i in range(len(bodies))]
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
    The largest magnets are started first (their distances take longest), so the work
    spreads evenly over the workers. :class:`KeepOutJob` starts the same work and returns
    at once.
    """
    return KeepOutJob(bodies, thresholds, workers).result()
