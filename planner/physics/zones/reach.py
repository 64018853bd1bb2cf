"""Does a threshold's region reach a zone (a seat row, a desk, a door), and by how much?

References
----------
Gradient bound: :mod:`planner.physics.zones.bounds` (Jackson, Classical Electrodynamics,
3rd ed. (1999), eq. 5.56, and the surface-charge picture of section 5.9).
"""
from __future__ import annotations

import numpy as np

from planner.physics.zones.bounds import field_with_error, gradient_bound


def _zone_samples(low, high, per_side, bodies):
    axes = [np.linspace(low[k], high[k], per_side if high[k] > low[k] else 1) for k in range(3)]
    grid = np.stack(np.meshgrid(*axes, indexing="ij"), axis=-1).reshape(-1, 3)
    nearest = np.array([np.clip(b.center, low, high) for b in bodies])  # closest to each magnet
    spacing = np.array([(high[k] - low[k]) / (len(axes[k]) - 1) if len(axes[k]) > 1 else 0.0 for k in range(3)])
    return np.vstack([grid, nearest]), 0.5 * float(np.linalg.norm(spacing))


def zone_reach(bodies, zones, thresholds, height=0.0, per_side=9):
    """Largest field in each zone and whether each threshold's region reaches it.

    Parameters
    ----------
    bodies : list of MagnetBody
    zones : array_like (k, 2, 3) or (k, 2, 2)
        Min and max corners of axis-aligned boxes [m]; plan rectangles (x, y) are taken as
        flat rectangles at z = ``height``.
    thresholds : array_like (t,)
        Flux densities [T].
    height : float
        z of plan rectangles [m].
    per_side : int
        Grid points along each side of a zone (plus the zone point nearest each magnet).

    Returns
    -------
    dict with
        ``max_field`` (k,) [T]: proven upper bound of |B| over the zone (inf if a magnet
        is inside it or touches it);
        ``reached`` (k, t) bool: max_field >= threshold (conservative: counts as reached
        when the bound cannot exclude it);
        ``excess`` (k, t) [T]: max_field - threshold;
        ``depth`` (k, t) [m]: how far sampled points surely at or above the threshold lie
        inside the zone, measured from its nearest side (0 if none).

    Notes
    -----
    Every point of the zone is within h (half a grid-cell diagonal) of a sample y, so
    |B| <= |B(y)| + error(y) + h G(y, h), G the gradient bound over the ball of radius h.

    References
    ----------
    Jackson, Classical Electrodynamics, 3rd ed. (1999), eq. 5.56.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> out = zone_reach([ball], [[[0.5, -1, 0], [1, 1, 0]]], [0.5e-3])
    >>> bool(out["reached"][0, 0]), bool(out["max_field"][0] < 0.5e-3)
    (False, True)
    """
    zones = np.asarray(zones, dtype=float)
    if zones.ndim == 2:
        zones = zones[None]
    if zones.shape[-1] == 2:
        zones = np.concatenate([zones, np.full(zones.shape[:-1] + (1,), height)], axis=-1)
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    count = len(zones)
    max_field = np.zeros(count)
    depth = np.zeros((count, len(thresholds)))
    for k, (low, high) in enumerate(zones):
        low, high = np.minimum(low, high), np.maximum(low, high)
        samples, spread = _zone_samples(low, high, per_side, bodies)
        value, error = field_with_error(bodies, samples, 1e-3 * float(np.min(thresholds)))
        bound = value + error + spread * gradient_bound(bodies, samples, np.full(len(samples), spread))
        max_field[k] = float(np.max(np.nan_to_num(bound, nan=np.inf)))
        sized = high > low
        inside = np.minimum(samples - low, high - samples)[:, sized]
        from_side = np.min(inside, axis=1) if sized.any() else np.zeros(len(samples))
        for j, threshold in enumerate(thresholds):
            sure = value - error >= threshold
            depth[k, j] = float(np.max(from_side[sure], initial=0.0))
    reached = max_field[:, None] >= thresholds[None, :]
    return {"max_field": max_field, "reached": reached,
            "excess": max_field[:, None] - thresholds[None, :], "depth": depth}
