"""Keep-out distances of every magnet at every threshold, spread over the machine's cores.

The distances of different magnets are independent computations
(:func:`planner.physics.zones.keep_out_radii` per magnet), so they run in separate worker
processes when the machine has more than one core and runs Linux, where forking is safe (the
workers inherit the loaded program instead of importing it again); elsewhere one by one. The numbers are the same as
computed one by one: each worker runs the same pure function on the same input.
"""
from __future__ import annotations

import multiprocessing
import os
import sys
from concurrent.futures import ProcessPoolExecutor

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.zones.bounds import BodyTable
from planner.physics.zones.keep_out import keep_out_radii

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
    caller then share the cores). With one worker the work is done in :meth:`result`.
    """

    def __init__(self, bodies: list[MagnetBody], thresholds, workers: int | None = None):
        self.bodies = list(bodies)
        self.thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
        count = len(self.bodies)
        self.workers = min(available_workers() if workers is None else int(workers), count)
        self._pool, self._futures = None, {}
        if self.workers > 1:
            # The bodies' series tables are cached per shape: filling the caches here, before
            # forking, lets every worker inherit them instead of computing them again.
            BodyTable(self.bodies)
            order = np.argsort([-float(np.linalg.norm(body.moment)) for body in self.bodies], kind="stable")
            self._pool = ProcessPoolExecutor(max_workers=self.workers, mp_context=multiprocessing.get_context("fork"))
            self._futures = {int(i): self._pool.submit(keep_out_radii, self.bodies, int(i), self.thresholds)
                             for i in order}

    def result(self) -> np.ndarray:
        """Distances [m], (len(bodies), len(thresholds)); see :func:`keep_out_table`."""
        count = len(self.bodies)
        if self._pool is None:
            return np.array([keep_out_radii(self.bodies, i, self.thresholds) for i in range(count)]).reshape(count, -1)
        try:
            result = np.empty((count, len(self.thresholds)))
            for i, future in self._futures.items():
                result[i] = future.result()
            return result
        finally:
            self.close()

    def close(self) -> None:
        """Stop the workers (unfinished distances are dropped)."""
        if self._pool is not None:
            self._pool.shutdown(wait=True, cancel_futures=True)
            self._pool = None


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
        Row i is ``keep_out_radii(bodies, i, thresholds)``.

    Notes
    -----
    The largest magnets are started first (their distances take longest), so the work
    spreads evenly over the workers. :class:`KeepOutJob` starts the same work and returns
    at once.
    """
    return KeepOutJob(bodies, thresholds, workers).result()
