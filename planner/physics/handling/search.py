"""The largest distance at which a decreasing-with-distance quantity still exceeds a level.

References
----------
R. P. Brent, *Algorithms for Minimization without Derivatives*, Prentice-Hall (1973),
ch. 4 (the root refinement, :func:`planner.physics.roots.bracketed_root`).
"""
from __future__ import annotations

import numpy as np

from planner.physics.roots import bracketed_root


def largest_exceeding(function, level: float, search_limit: float, smallest: float = 0.0,
                      samples: int = 48, xtol: float = 1e-9, vectorized: bool = False) -> float:
    """Largest x in [smallest, inf) where ``function(x) > level``.

    Parameters
    ----------
    function : callable
        Scalar function of a distance [m].
    level : float
        The level to exceed (same unit as ``function``).
    search_limit : float
        Upper end of the first scan [m]; doubled (up to 40 times) while the function still
        exceeds the level there.
    smallest : float
        Lower end [m].
    samples : int
        Points of the geometric scan between ``smallest`` and ``search_limit``.
    xtol : float
        Absolute tolerance of the final root [m].
    vectorized : bool
        True if ``function`` takes an array of distances and returns an array of values:
        the whole scan is then one call.

    Returns
    -------
    float
        The distance [m]; 0.0 when even ``function(smallest)`` does not exceed the level,
        inf when it still does after 40 doublings of ``search_limit``.

    Notes
    -----
    Scans a geometric grid (fine near ``smallest``, where magnetic forces change fastest),
    takes the last grid point above the level and refines the crossing after it with
    Brent's method (or, for a vectorized function, by batches of 32 points per call). A larger level can only give a smaller or equal result when the
    function decreases with distance past its last crossing.

    Examples
    --------
    >>> round(largest_exceeding(lambda x: 1 / (1 + x) ** 4, 1 / 16, 10.0), 9)
    1.0
    >>> round(largest_exceeding(lambda x: 1 / (1 + x) ** 4, 1 / 16, 10.0, vectorized=True), 9)
    1.0
    """
    def scalar(x):
        if vectorized:
            return float(np.asarray(function(np.array([x], dtype=float))).ravel()[0])
        return function(x)
    if not scalar(smallest) > level:
        return 0.0
    high = float(search_limit)
    for _ in range(40):
        if not scalar(high) > level:
            break
        high *= 2
    else:
        return float("inf")
    start = smallest if smallest > 0 else high * 1e-4
    grid = np.concatenate([[smallest], np.geomspace(start, high, samples)])
    if vectorized:
        values = np.asarray(function(grid), dtype=float).ravel()
    else:
        values = np.array([function(x) for x in grid])
    above = np.nonzero(values > level)[0]
    last = above[-1]
    if vectorized:
        return _refine_in_batches(function, level, grid[last], grid[last + 1], xtol)
    return float(bracketed_root(lambda x: scalar(x) - level, grid[last], grid[last + 1], xtol=xtol,
                                rtol=1e-12))


def _refine_in_batches(function, level, low, high, xtol, points=32):
    """Shrink [low, high] (function above the level at low, not at high) by 33 per call.

    For a vectorized function one call at 32 points costs about as much as one at a single
    point, so five calls narrow a 1 cm bracket to 1e-9 m where Brent's method needed about
    nine; the last crossing inside each batch is kept, as in the scan.
    """
    while high - low > max(xtol, 1e-12 * high):
        inner = np.linspace(low, high, points + 2)[1:-1]
        values = np.asarray(function(inner), dtype=float).ravel()
        above = np.nonzero(values > level)[0]
        if len(above):
            low = inner[above[-1]]
            high = inner[above[-1] + 1] if above[-1] + 1 < points else high
        else:
            high = inner[0]
    return float(0.5 * (low + high))
