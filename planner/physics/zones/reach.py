"""Does a threshold's region reach a zone (a seat row, a desk, a door), and by how much?

References
----------
Gradient bound: :mod:`planner.physics.zones.bounds` (Jackson, Classical Electrodynamics,
3rd ed. (1999), eq. 5.56, and the surface-charge picture of section 5.9).
"""
from __future__ import annotations

import numpy as np

from planner.physics.bodies import distance_to_body
from planner.physics.zones.bounds import body_table, field_with_error, gradient_bound


RELATIVE_TOLERANCE = 0.05  # the bound on the largest field is refined to within 5 % of a sampled value
MAX_EVALUATIONS = 40000  # per zone; what is still open then keeps its (larger) bound
#: A bound above this [T] means the refinement closed in on a magnet's edge inside or at the
#: zone, where the field of the ideal model grows without limit: reported as inf.
NO_BOUND = 100.0


def _zone_samples(low, high, per_side, bodies):
    axes = [np.linspace(low[k], high[k], per_side if high[k] > low[k] else 1) for k in range(3)]
    grid = np.stack(np.meshgrid(*axes, indexing="ij"), axis=-1).reshape(-1, 3)
    nearest = np.array([np.clip(b.center, low, high) for b in bodies])  # closest to each magnet
    return np.vstack([grid, nearest])


def _box_bounds(bodies, centres, halves, allowed_error, table):
    """Field at box centres, its error, and a proven upper bound of |B| over each box [T]."""
    value, error = field_with_error(bodies, centres, allowed_error, table)
    spread = np.linalg.norm(halves, axis=1)  # the box lies in the ball of this radius
    slope = gradient_bound(bodies, centres, spread, table)
    with np.errstate(invalid="ignore"):
        upper = value + error + spread * slope
    upper = np.where(np.isnan(upper), np.inf, upper)  # a box touching a magnet: no bound
    return value, error, upper


def _largest_field(bodies, low, high, per_side, allowed_error, table):
    """Proven upper bound of |B| over the box [low, high] and the points sampled on the way.

    Branch and bound: the zone is cut into cells of a per_side grid; each cell's bound is
    |B(y)| + error(y) + r G(y, r) (y its centre, r its half-diagonal, G the gradient bound
    over the ball of radius r). Cells whose bound exceeds the largest surely-reached value
    found by more than 5 % are halved along their longest side, until none does or the
    evaluation budget is spent. The result is the largest bound of any cell, kept or
    dropped, so it holds for the whole zone; inf when it exceeds ``NO_BOUND`` (a magnet in
    or at the zone).
    """
    sized = high > low
    cells = np.where(sized, per_side, 1)
    steps = (high - low) / cells
    index = np.stack(np.meshgrid(*[np.arange(c) for c in cells], indexing="ij"), axis=-1).reshape(-1, 3)
    centres = low + (index + 0.5) * steps
    halves = np.broadcast_to(steps / 2, centres.shape).copy()
    samples = [_zone_samples(low, high, per_side, bodies)]
    for body in bodies:  # a magnet's centre region inside the zone: no bound, no search
        if distance_to_body(body, np.clip(body.center, low, high)[None])[0] == 0.0:
            return np.inf, samples[0], *field_with_error(bodies, samples[0], allowed_error, table)
    value, error = field_with_error(bodies, samples[0], allowed_error, table)
    values, errors = [value], [error]
    best = float(np.max(value - error, initial=0.0))
    settled = 0.0  # largest bound among the cells no longer refined
    evaluations = len(samples[0])
    while len(centres):
        value, error, upper = _box_bounds(bodies, centres, halves, allowed_error, table)
        samples.append(centres), values.append(value), errors.append(error)
        evaluations += len(centres)
        best = max(best, float(np.max(value - error, initial=0.0)))
        open_ = upper > (1 + RELATIVE_TOLERANCE) * best
        settled = max(settled, float(np.max(upper[~open_], initial=0.0)))
        if not open_.any():
            break
        if evaluations + 2 * open_.sum() > MAX_EVALUATIONS:
            settled = max(settled, float(np.max(upper[open_])))
            break
        centres, halves = centres[open_], halves[open_]
        axis = np.argmax(halves, axis=1)  # halve the longest side
        shift = np.zeros_like(halves)
        shift[np.arange(len(axis)), axis] = halves[np.arange(len(axis)), axis] / 2
        halves = halves.copy()
        halves[np.arange(len(axis)), axis] /= 2
        centres, halves = np.vstack([centres - shift, centres + shift]), np.vstack([halves, halves])
    if not settled <= NO_BOUND:
        settled = np.inf
    return settled, np.vstack(samples), np.concatenate(values), np.concatenate(errors)


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
        Cells along each side of a zone to begin with (refined where the field is
        largest), and grid points of the first samples (plus the zone point nearest each
        magnet).

    Returns
    -------
    dict with
        ``max_field`` (k,) [T]: proven upper bound of |B| over the zone, within about 5 %
        of a value found in it (inf if a magnet is inside it or touches it);
        ``reached`` (k, t) bool: max_field >= threshold (conservative: counts as reached
        when the bound cannot exclude it);
        ``excess`` (k, t) [T]: max_field - threshold;
        ``depth`` (k, t) [m]: how far sampled points surely at or above the threshold lie
        inside the zone, measured from its nearest side (0 if none).

    Notes
    -----
    Every point of a cell is within its half-diagonal r of the cell's centre y, so
    |B| <= |B(y)| + error(y) + r G(y, r), G the gradient bound over the ball of radius r;
    cells are halved where that bound is more than 5 % above the largest value found
    (branch and bound). A single coarse grid over a long zone gave balls so large that they
    reached the magnets, and so no bound at all.

    References
    ----------
    Jackson, Classical Electrodynamics, 3rd ed. (1999), eq. 5.56. Branch and bound:
    R. Horst and H. Tuy, *Global Optimization*, 3rd ed., Springer (1996), ch. IV.

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
    table = body_table(bodies)
    count = len(zones)
    max_field = np.zeros(count)
    depth = np.zeros((count, len(thresholds)))
    for k, (low, high) in enumerate(zones):
        low, high = np.minimum(low, high), np.maximum(low, high)
        max_field[k], samples, value, error = _largest_field(
            bodies, low, high, per_side, 1e-3 * float(np.min(thresholds)), table)
        sized = high > low
        inside = np.minimum(samples - low, high - samples)[:, sized]
        from_side = np.min(inside, axis=1) if sized.any() else np.zeros(len(samples))
        for j, threshold in enumerate(thresholds):
            sure = value - error >= threshold
            depth[k, j] = float(np.max(from_side[sure], initial=0.0))
    reached = max_field[:, None] >= thresholds[None, :]
    return {"max_field": max_field, "reached": reached,
            "excess": max_field[:, None] - thresholds[None, :], "depth": depth}
