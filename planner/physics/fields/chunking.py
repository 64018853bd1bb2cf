"""Evaluate a field function over many points in blocks that fit the processor cache.

Working in blocks of a few thousand points keeps every temporary array small: the peak
memory stays far below that of the whole point set and element-wise numpy operations run
from cache, which is several times faster than streaming arrays of 10^6 entries.
"""
from __future__ import annotations

import numpy as np

BLOCK_POINTS = 8192


def in_blocks(function, points, *arguments, block_points=BLOCK_POINTS):
    """Apply ``function(points_block, *arguments) -> (m, 3)`` to (n, 3) points block by block.

    Parameters
    ----------
    function : callable
        Field function of a block of points (m, 3) [m] returning (m, 3).
    points : array (n, 3)
        All field points [m].
    *arguments
        Passed through unchanged.
    block_points : int
        Points per block.

    Returns
    -------
    ndarray (n, 3)
        The results stacked in the original order.

    Examples
    --------
    >>> import numpy as np
    >>> float(in_blocks(lambda p, f: f * p, np.ones((5, 3)), 2.0, block_points=2).sum())
    30.0
    """
    points = np.asarray(points, dtype=float).reshape(-1, 3)
    if len(points) <= block_points:
        return function(points, *arguments)
    result = np.empty_like(points)
    for start in range(0, len(points), block_points):
        stop = start + block_points
        result[start:stop] = function(points[start:stop], *arguments)
    return result
