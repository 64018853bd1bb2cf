"""Evaluate a field function over many points in blocks that fit the processor cache.

Working in blocks of a few thousand points keeps every temporary array small: the peak
memory stays far below that of the whole point set and element-wise numpy operations run
from cache, which is several times faster than streaming arrays of 10^6 entries.

References
----------
No physics here; the block size was measured with benchmarks/fields.py (see BLOCK_POINTS).
"""
from __future__ import annotations

import math

import numpy as np

BLOCK_POINTS = 8192  # 64 kB per array; 4096..32768 measured within noise of each other
ROUNDING_NOISE = 16 * np.finfo(float).eps  # relative size of frame-change round-off


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


def without_rounding_noise(polarization):
    """Polarization (3,) [T] with components below round-off of its magnitude set to zero.

    Parameters
    ----------
    polarization : array (3,)
        J in a body frame [T], typically R^T J_global.

    Returns
    -------
    ndarray (3,)
        The same vector, components with |J_i| <= 16 eps |J| replaced by exactly 0 [T].

    Notes
    -----
    Turning an axial J into the frame of a body whose axis was built from J leaves
    components of a few eps |J| across the axis. They are round-off, not physics, but a
    non-zero component makes the field functions evaluate its whole (costly) set of terms.
    Dropping them changes B by at most 16 eps |J| times the field per unit J, i.e. a
    relative 4e-15: far below any other error of the closed forms.

    Examples
    --------
    >>> without_rounding_noise([1e-17, 0.0, 1.2]).tolist()
    [0.0, 0.0, 1.2]
    """
    x, y, z = np.asarray(polarization, dtype=float).reshape(3).tolist()
    noise = ROUNDING_NOISE * math.hypot(x, y, z)
    return np.array([c if abs(c) > noise else 0.0 for c in (x, y, z)])
