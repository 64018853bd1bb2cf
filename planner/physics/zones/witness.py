"""Points where the field surely reaches a threshold, found along paths of a magnet's cell.

The keep-out proofs (:mod:`planner.physics.zones.keep_out`) try a radius just beyond the
farthest such point, so finding it well decides how often they must try again; it never
decides a distance on its own. Each sample counts only where the model's |B| minus its
proven error (:func:`planner.physics.zones.bounds.field_with_error`) reaches the
threshold, and only in the magnet's own cell (the points at least as close to its centre
as to any other), so every point found is a proven lower bound of the exact distance.

Paths: rays from the centre (:func:`ray_paths`, :func:`probe_paths`) and paths on the
faces of the cell (:func:`face_paths`, :func:`face_paths_near`), where a stronger
neighbour's field spilling over makes the farthest point hug a face that rays only graze.
:class:`PathSamples` samples them once for every threshold and searches between the
outermost sample at each threshold and the next one out (:func:`farthest_on_paths`).

References
----------
Dipole stand-ins and their error: :mod:`planner.physics.zones.bounds`. Fibonacci points:
A. Gonzalez, Math. Geosci. 42, 49-64 (2010).
"""
from __future__ import annotations

import numpy as np

from planner.physics.zones import bounds, shell
from planner.physics.zones.bounds import field_with_error
from planner.physics.zones.sampling import fibonacci_directions, geometric_steps

__all__ = ["WITNESS_ERROR", "RAYS", "FACE_PATHS", "in_own_cell", "lower_at", "PathSamples", "farthest_on_paths",
           "ray_paths", "face_paths", "face_paths_near", "probe_paths", "probe"]

# Error allowed in the far-field model where points are only sampled (witness rays, probes,
# the closing check), as a fraction of the threshold: a witness counts only where |B| minus
# this error reaches the threshold, so it is sound at any size; 1 % keeps the witnesses within
# 0.3 % of their distance while letting most distant magnets be taken as dipoles.
WITNESS_ERROR = 1e-2

# Directions sampled for points at the thresholds. With the face paths, 128 found no more than
# 64; 40 (about 32 degrees apart) needed one more retried proof in 30 random setups of 2-6
# magnets than 64 did, and 23 % fewer field evaluations in the search.
RAYS = 40
FACE_PATHS = 12  # paths on each face of the cell, out from the centre's foot


def in_own_cell(table, index, points, distance=None):
    """Which points (n, 3) are at least as close to centre ``index`` as to any other (its cell).

    Points on a face of the cell count (up to the rounding of the distances, 1e-12).
    ``distance``: the points' distances from all centres (n, b) [m], if the caller has them.
    """
    if distance is None:
        distance = table.centre_distances(points)
    others = np.delete(distance, index, axis=1)
    return distance[:, index] <= np.min(others, axis=1, initial=np.inf) * (1 + 1e-12)


def face_paths_near(table, index, points, outer, samples=10):
    """Paths on the cell faces near ``points`` (n, 3) [m], for :class:`PathSamples`.

    The region at the threshold can hug a face of the cell (a stronger neighbour's field
    spilling over): rays from the centre leave the cell there at once, so for each point
    within 2 % of its distance from a face the search runs on that face instead, outward
    from the foot of the centre on it through the point's projection, out to ``outer`` [m]
    (geometric samples). Points of a face belong to the cell, so what is found there counts.
    """
    cell = shell.Cell(table.centres, index)
    none = (np.empty((0, 3)), np.empty((0, 3)), np.empty((0, samples)), np.empty(0))
    if not len(cell.gaps) or not len(points):
        return none
    offsets = points - cell.centre
    excess, row = cell.excess_and_face(points)
    near = excess >= -0.02 * np.linalg.norm(offsets, axis=1)
    row, offsets = row[near], offsets[near]
    normals, half = cell.normals[row], 0.5 * cell.gaps[row]
    along = offsets - np.sum(offsets * normals, axis=1)[:, None] * normals  # from the foot, in the plane
    start = np.linalg.norm(along, axis=1)
    fits = (start > 0) & (half < outer)
    if not fits.any():
        return none
    along, start, row, half = along[fits] / start[fits, None], start[fits], row[fits], half[fits]
    end = np.sqrt(np.maximum(outer**2 - half**2, start**2))
    steps = geometric_steps(start, end, samples)
    return cell.feet[row], along, steps, half


def lower_at(bodies, index, points, allowed_error, table):
    """|B| minus its proven error [T] at ``points`` (n, 3); -inf outside body ``index``'s cell.

    ``allowed_error`` [T]: one value or one per point.
    """
    distance = table.centre_distances(points)
    keep = in_own_cell(table, index, points, distance)
    lower = np.full(len(points), -np.inf)
    if keep.any():
        allowed = np.broadcast_to(np.asarray(allowed_error, dtype=float), (len(points),))[keep]
        value, error = field_with_error(bodies, points[keep], allowed, table, distance[keep])
        lower[keep] = value - error
    return lower


def probe_paths(bodies, index, axes, radii, inner, samples=10):
    """Rays along ``axes`` (n, 3) from ``inner`` [m] (or the bounding radius) out to ``radii``
    (n,) [m], geometric samples, for :class:`PathSamples`; only the rays that go outward."""
    floor = max(bodies[index].bounding_radius * (1 + 1e-6), inner)
    outward = radii > floor
    steps = geometric_steps(floor, radii[outward], samples).reshape(-1, samples)
    return np.broadcast_to(bodies[index].center, (len(steps), 3)), axes[outward], steps, np.zeros(len(steps))


def probe(bodies, index, axes, radii, threshold, samples=10, table=None, inner=0.0):
    """Farthest radius found on the given axes, inside ``radii``, where |B| surely >= threshold.

    A lower bound of the exact distance (used only to decide where to refine): geometric
    samples from ``inner`` (a radius already found at the threshold, or the body's bounding
    radius) out to ``radii``, then a search between the outermost sample at the threshold
    and the next one out. Returns ``inner`` if nothing farther is found.
    """
    table = bounds.body_table(bodies, table)
    paths = [probe_paths(bodies, index, axes, radii, inner, samples)]
    return float(PathSamples(bodies, index, table, paths, threshold).farthest([threshold], [inner])[0])


def farthest_on_paths(reached, steps, group, best, check, distance, rounds=3, parts=4):
    """Farthest distance [m] found at the threshold on sampled paths, refined between samples.

    ``reached`` (n, k): whether sample j of path i is surely at its threshold; ``steps``
    (n, k): the samples' positions along the paths (increasing); ``group`` (n,): the entry
    of ``best`` (g,) [m] each path counts for (a threshold). ``check(rows, s)``: whether the
    points at positions ``s`` of paths ``rows`` are surely at the threshold;
    ``distance(rows, s)``: their distances from the centre, growing with s. Each path with a
    reached sample is searched between its outermost one and the next sample out, while it
    can still beat its group's best: each of ``rounds`` rounds checks the ``parts - 1``
    points that cut that interval into ``parts`` and keeps the interval beyond the outermost
    one reached (4^3: the precision of six halvings in half as many evaluations of the
    model, whose cost is mostly per call). Returns ``best``, raised to what was found.
    """
    rows = np.flatnonzero(reached.any(axis=1))
    if not len(rows):
        return best
    samples = steps.shape[1]
    outermost = samples - 1 - np.argmax(reached[rows, ::-1], axis=1)
    inner = steps[rows, outermost]
    outer = steps[rows, np.minimum(outermost + 1, samples - 1)]
    np.maximum.at(best, group[rows], distance(rows, inner))
    cuts = np.arange(1, parts) / parts
    for _ in range(rounds):
        promising = distance(rows, outer) > best[group[rows]]
        if not promising.any():
            break
        rows, inner, outer = rows[promising], inner[promising], outer[promising]
        points = inner[:, None] + cuts[None, :] * (outer - inner)[:, None]  # (n, parts - 1)
        ok = check(np.repeat(rows, parts - 1), points.ravel()).reshape(points.shape)
        # the outermost point reached (or the old inner end) and the next one out
        last = np.where(ok.any(axis=1), parts - 2 - np.argmax(ok[:, ::-1], axis=1), -1)
        ends = np.concatenate([inner[:, None], points, outer[:, None]], axis=1)
        inner, outer = ends[np.arange(len(rows)), last + 1], ends[np.arange(len(rows)), last + 2]
        np.maximum.at(best, group[rows], distance(rows, inner))
    return best


class PathSamples:
    """|B| lower values on fixed paths of one body's cell, sampled once and shared by all thresholds.

    ``path_sets``: tuples (origins, directions, steps, offsets), each path set with its own
    number of samples. Path i runs from ``origins[i]`` along the unit ``directions[i]``;
    ``steps`` (n, k) [m] are the samples' positions along it, and a point at position s lies
    hypot(``offsets[i]``, s) from the body's centre (rays from the centre have offset 0;
    paths on a face of the cell start at the centre's foot on it, half the gap away). The
    sets are joined into one array of paths, the shorter rows padded with copies of their
    last sample that never count as reached. ``lower`` (n, k): the model value minus its
    proven error (own cell only, -inf elsewhere), all samples in one evaluation.

    A sample is compared with every threshold, so it needs the precision of the lowest only
    where its field may be that low: far from the magnet. Nearer, 1 % of the magnet's own
    dipole scale k m / r^3 (at most its field, at least half of it) is as fine compared with
    the thresholds the sample can decide, and lets the neighbours be taken as dipoles there.
    Any allowance is sound: it is subtracted.
    """

    def __init__(self, bodies, index, table, path_sets, lowest):
        self.bodies, self.index, self.table = bodies, index, table
        width = max(steps.shape[1] for _, _, steps, _ in path_sets)
        padding = [width - steps.shape[1] for _, _, steps, _ in path_sets]
        self.origins = np.concatenate([np.reshape(origins, (-1, 3)) for origins, _, _, _ in path_sets])
        self.directions = np.concatenate([directions for _, directions, _, _ in path_sets])
        self.offsets = np.concatenate([offsets for _, _, _, offsets in path_sets])
        self.steps = np.concatenate([np.concatenate([steps, np.repeat(steps[:, -1:], extra, axis=1)], axis=1)
                                     for (_, _, steps, _), extra in zip(path_sets, padding)])
        valid = np.concatenate([np.arange(width)[None, :] < np.full((len(steps), 1), steps.shape[1])
                                for _, _, steps, _ in path_sets])
        distance = np.hypot(self.offsets[:, None], self.steps)
        allowed = WITNESS_ERROR * np.maximum(lowest, bounds.K * float(table.moments[index]) / distance**3)
        self.lower = np.full(self.steps.shape, -np.inf)
        rows, columns = np.nonzero(valid)
        self.lower[rows, columns] = self._lower(rows, self.steps[rows, columns], allowed[rows, columns])

    def _lower(self, rows, s, allowed):
        points = self.origins[rows] + s[..., None] * self.directions[rows]
        return lower_at(self.bodies, self.index, points.reshape(-1, 3), np.ravel(allowed), self.table)

    def farthest(self, thresholds, best=None):
        """Farthest distance [m] from the centre found at each of ``thresholds`` (k,) [T].

        The outermost sample at the threshold on each path, then a search towards the next
        sample out (:func:`farthest_on_paths`), for the paths that can still beat the best
        so far (``best`` (k,) [m], points already known; 0 if not given); the searches of all
        thresholds share their field evaluations (each to 1 % of its own threshold).
        """
        thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
        best = np.zeros(len(thresholds)) if best is None else np.array(best, dtype=float)
        count = len(self.origins)
        if not count:
            return best
        reached = np.concatenate([self.lower >= threshold for threshold in thresholds])  # threshold-major
        group = np.repeat(np.arange(len(thresholds)), count)

        def check(rows, s):
            return self._lower(rows % count, s, WITNESS_ERROR * thresholds[group[rows]]) >= thresholds[group[rows]]

        return farthest_on_paths(reached, np.tile(self.steps, (len(thresholds), 1)), group, best, check,
                                  lambda rows, s: np.hypot(self.offsets[rows % count], s))


def ray_paths(bodies, index, reach, count=RAYS, samples=16):
    """``count`` rays from the centre, sampled geometrically from the bounding radius out to
    ``reach`` [m] (:func:`probe_paths` along evenly spread directions)."""
    return probe_paths(bodies, index, fibonacci_directions(count), np.full(count, float(reach)), 0.0, samples)


def face_paths(table, index, reach, sectors=FACE_PATHS, samples=6):
    """Paths on each face of the cell nearer than ``reach`` [m], for :class:`PathSamples`:
    ``sectors`` of them outward from the centre's foot on it, at distances from the centre
    geometric from half the gap out to ``reach``. Where a neighbour's field spills over a
    face, the farthest point at a threshold hugs the face, where the rays from the centre
    graze it."""
    cell = shell.Cell(table.centres, index)
    rows = np.flatnonzero(0.5 * cell.gaps < reach)
    angle = 2 * np.pi * np.arange(sectors) / sectors
    row, sector = np.repeat(rows, sectors), np.tile(angle, len(rows))
    half = 0.5 * cell.gaps[row]
    directions = np.cos(sector)[:, None] * cell.e1[row] + np.sin(sector)[:, None] * cell.e2[row]
    floor = half * (1 + 1e-6)
    distance = geometric_steps(floor, reach, samples)
    steps = np.sqrt(np.maximum(distance**2 - half[:, None]**2, 0.0))
    return cell.feet[row], directions, steps, half
