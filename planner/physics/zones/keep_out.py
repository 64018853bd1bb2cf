"""Keep-out distances around each magnet, for the total field of all magnets.

Every figure here is meant for a safety line, so each one errs outward and says how:

* the field is evaluated exactly (``planner.physics.fields``) near each magnet and as a
  point dipole plus a proven error bound far from it; the *upper* value |B| + error is used
  whenever a point must be shown to lie below a threshold;
* a region is declared below a threshold only when proven bounds on the field and its
  derivatives say no point of it can reach the threshold (:mod:`planner.physics.zones.bounds`,
  :mod:`planner.physics.zones.certify`, :mod:`planner.physics.zones.shell`);
* what cannot be proven below is counted as reaching the threshold.

The points found at each threshold, which decide where a proof is tried, come from
:mod:`planner.physics.zones.witness`.

All inputs and outputs are SI floats and numpy arrays: tesla, metres.

References
----------
Derivations of the bounds: :mod:`planner.physics.zones.bounds`. Dipole field and multipole
expansion: J. D. Jackson, *Classical Electrodynamics*, 3rd ed., Wiley (1999), sections 4.1
and 5.6. Edge singularities of uniformly magnetized bodies: R. Engel-Herbert and
T. Hesjedal, J. Appl. Phys. 97, 074504 (2005).
"""
from __future__ import annotations

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.zones import bounds, shell, witness
from planner.physics.zones.bounds import field_with_error
from planner.physics.zones.witness import WITNESS_ERROR
from planner.physics.zones.certify import certified_depth
from planner.physics.zones.sampling import (
    cone_of_triangle, fibonacci_directions, geometric_steps, icosahedron_triangles, subdivide)

__all__ = ["keep_out_radius", "keep_out_radii", "farthest_start_radius", "farthest_start_radii"]

RELATIVE_TARGET = 0.045  # refine until the proven radius is within 4.5 % ...
ABSOLUTE_TARGET = 4.5e-3  # ... or 4.5 mm of the farthest point found at the threshold [m]
PROBED_CONES = 48
START_LEVEL = 2  # 320 cones of about 9 degrees to begin with
MAX_LEVEL = 7
MAX_CONES = 24000
GUARD_FIRST_ERROR = 0.25  # the sampling guard's first, loose pass (of each threshold)
PROOF_ATTEMPTS = 6  # radii tried by the shell proof before the cone walk takes over
LOOSER_STEP = 0.02  # how much farther out to try when a proof stalls with no farther point found


def farthest_start_radius(bodies: list[MagnetBody], index: int, threshold: float, table=None) -> float:
    """A radius around body ``index`` beyond which no point of its cell reaches ``threshold``.

    Parameters
    ----------
    bodies : list of MagnetBody
    index : int
        The body whose centre is the origin of the distance.
    threshold : float
        Flux density [T], > 0.
    table : BodyTable, optional
        The bodies' constants (:class:`planner.physics.zones.bounds.BodyTable`), if the
        caller has them already; built here otherwise.

    Returns
    -------
    float
        Radius R [m] such that |B(x)| < threshold for every x with |x - c| >= R that is at
        least as close to c as to any other centre.

    Notes
    -----
    In that cell every other centre is at least as far as c, d_i >= r, and d_i >= g_i - r
    with g_i the distance between the centres; for all radii r >= R both give
    d_i >= max(R, g_i / 2) = e_i. With the dipole value and the error bound of the dipole
    stand-in of each body (:func:`~planner.physics.zones.bounds.cell_field_bounds`, which
    falls with distance), |B| <= sum_i [2 k m_i / e_i^3 + remainder_i(e_i)], k = mu0/4pi,
    finite for e_i > a_i. The right side falls with R; :func:`farthest_start_radii` takes
    the first node beyond where it meets the threshold on a fine geometric grid.

    References
    ----------
    Jackson, Classical Electrodynamics, 3rd ed. (1999), eq. 5.56 (dipole field).

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> round(farthest_start_radius([ball], 0, 1e-3) * 100, 2)  # exact dipole: on-axis radius
    4.64
    """
    return float(farthest_start_radii(bodies, index, [threshold], table)[0])


# The start radii are read off geometric grids of the bound: first GRID_NODES radii between a
# radius where the bound still reaches the threshold and one where it no longer does (a ratio
# q apart), then as many between the two nodes that bracket each threshold: q^(1/128^2)
# between the fine nodes, below 1.0005 for any q up to 2^11.
GRID_NODES = 129


def farthest_start_radii(bodies: list[MagnetBody], index: int, thresholds, table=None) -> np.ndarray:
    """:func:`farthest_start_radius` for several thresholds (k,) [T] at once: radii (k,) [m].

    The bound of :func:`farthest_start_radius` does not depend on the threshold and falls
    with the radius, so one geometric grid of it serves every threshold: each result is the
    first node of a finer grid inside the bracketing coarse cell where the bound is below
    its threshold, one fine step beyond where the bound meets it.
    """
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    table = bounds.body_table(bodies, table)
    reach = table.reach
    half_gap = np.linalg.norm(table.centres - table.centres[index], axis=1) / 2

    def bound(r):  # r (...,) -> (...,)
        return np.sum(bounds.cell_field_bounds(table, index, r), axis=-1)

    # just outside every bounding sphere that reaches into the cell (the remainders are
    # finite only beyond 1 + 1e-9 of the bounding radius)
    low = max(float(np.max(reach - half_gap)) * (1 + 2e-9), float(reach[index]) * (1 + 2e-9), 1e-6)
    result = np.full(len(thresholds), low)
    open_ = bound(low) >= thresholds
    if not open_.any():
        return result
    high = 2 * low
    while bound(high) >= thresholds[open_].min():
        high *= 2
    nodes = geometric_steps(low, high, GRID_NODES)
    values = bound(nodes)
    # the last node still at or above each threshold (the first node is, for open ones)
    last = np.array([np.flatnonzero(values >= t)[-1] for t in thresholds[open_]])
    fine = geometric_steps(nodes[last], nodes[last + 1], GRID_NODES)
    below = bound(fine) < thresholds[open_, None]  # the coarse node last + 1 is below: so is fine[:, -1]
    result[open_] = fine[np.arange(len(last)), np.argmax(below, axis=1)]
    return result


def _cell_limit(bodies, index, axes, half_angles):
    """Farthest radius [m] of each cone that is still in body ``index``'s cell (inf if none).

    The cell lies in every half-space (x - c) . n_i <= g_i / 2 (n_i the unit vector towards
    another centre, g_i the gap). A cone point x = c + r v has v within delta of the axis
    u, so v . n_i >= cos(theta_i + delta) with theta_i = angle(u, n_i); where that cosine
    is positive, r > (g_i / 2) / cos(theta_i + delta) puts every point of the cone strictly
    closer to centre i: beyond it the cone is wholly outside the cell and has nothing to
    prove. Starting each cone's walk there, instead of at the common start radius, saves
    walking (and stalling) through the neighbour's cell: a wide cone aimed at a neighbour
    otherwise stalls next to it, where the field is high but not ours to certify.
    """
    cell = shell.Cell([body.center for body in bodies], index)
    theta = np.arccos(np.clip(axes @ cell.normals.T, -1.0, 1.0))  # (cones, other centres)
    cosine = np.cos(np.minimum(theta + half_angles[:, None], np.pi))
    with np.errstate(divide="ignore"):
        limit = np.where(cosine > 1e-9, 0.5 * cell.gaps / cosine * (1 + 1e-9), np.inf)
    return np.min(limit, axis=1, initial=np.inf)


def _march(bodies, index, axes, half_angles, radii, threshold, allowed_error, table=None, goal=0.0):
    """Walk each cone inward from ``radii`` while a slab bound proves it below threshold.

    Returns the proven radius of each cone and the farthest radius found at or above the
    threshold on the cone axes (a lower bound of the exact distance; 0 if none). Walks stop
    at ``goal`` [m]: a radius the caller's answer cannot go below anyway.
    """
    centre = bodies[index].center
    cell = shell.Cell([body.center for body in bodies], index)
    radii = radii.astype(float).copy()
    floor = max(bodies[index].bounding_radius, goal)
    active = radii > floor
    found = 0.0
    for _ in range(400):
        if not active.any():
            break
        idx = np.flatnonzero(active)
        r = radii[idx]
        points = centre + r[:, None] * axes[idx]
        lateral = 2 * r * np.sin(half_angles[idx] / 2)
        smallest = np.maximum(4e-3 * r, 5e-5)
        # The whole slab lies in another magnet's cell: not ours to certify.
        into_other = cell.excess(points)
        step = into_other - lateral
        need_field = step < smallest
        if need_field.any():
            depth, value, error = certified_depth(
                bodies, points[need_field], axes[idx[need_field]], r[need_field],
                half_angles[idx[need_field]], threshold, allowed_error, table)
            hit = (value - error >= threshold) & (into_other[need_field] <= 0)
            if hit.any():
                found = max(found, float(np.max(r[need_field][hit])))
            step[need_field] = np.maximum(step[need_field], depth)
        stalled = step < smallest
        move = ~stalled
        radii[idx[move]] = np.maximum(r[move] - step[move], floor)
        done = stalled | (radii[idx] <= floor)
        active[idx[done]] = False
    return radii, found


def keep_out_radii(bodies: list[MagnetBody], index: int, thresholds) -> np.ndarray:
    """Keep-out distances of body ``index`` for several thresholds at once.

    See :func:`keep_out_radius` for the definition, method and guarantees; this form shares
    the work between thresholds: their proofs run together, and a lower threshold's proven
    radius bounds the higher ones.

    Parameters
    ----------
    bodies : list of MagnetBody
    index : int
    thresholds : array_like (k,)
        Flux densities [T], each > 0.

    Returns
    -------
    ndarray (k,)
        Distances [m] in the order of ``thresholds``.
    """
    thresholds = _checked(bodies, index, thresholds)
    table = bounds.body_table(bodies)
    starts, hits = _starts_and_hits(bodies, index, thresholds, table)
    proven = _prove_all(bodies, index, thresholds, starts, table, *_first_tries(bodies, index, hits))[0]
    return _finish(bodies, index, thresholds, starts, proven, table, hits)


def _checked(bodies, index, thresholds):
    """``thresholds`` as a float array, after checking them and ``index``."""
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    if np.any(~(thresholds > 0)):
        raise ValueError("thresholds must be positive flux densities in tesla")
    if not 0 <= index < len(bodies):
        raise IndexError(f"no body {index} among {len(bodies)}")
    return thresholds


def _starts_and_hits(bodies, index, thresholds, table):
    """Start radii (k,) [m] and the farthest points found at each threshold on the shared rays (k,) [m]."""
    starts = farthest_start_radii(bodies, index, thresholds, table)
    lowest = int(np.argmin(thresholds))
    # rays and face paths sampled once, out to the lowest threshold's start
    paths = [witness.ray_paths(bodies, index, starts[lowest]), witness.face_paths(table, index, starts[lowest])]
    return starts, witness.PathSamples(bodies, index, table, paths, thresholds[lowest]).farthest(thresholds)


def _finish(bodies, index, thresholds, starts, proven, table, hits):
    """The distances (k,) [m] from the proven radii: a lower threshold's distance bounds the
    higher ones', NaN is walked in cones, the bounding radius is the least, and the sampling
    guard (:func:`_verify`) has the last word."""
    result = np.empty(len(thresholds))
    floor = bodies[index].bounding_radius
    previous = None
    for position in np.argsort(thresholds):
        start = starts[position]
        if previous is not None:
            start = min(start, previous)
        radius = min(proven[position], start)
        if np.isnan(radius):  # magnets in the cell, or no proof at a close radius: walk cones
            radius = _refine(bodies, index, thresholds[position], start, table, hits[position])
        result[position] = previous = max(radius, floor)
    return _verify(bodies, index, thresholds, result, table=table) * (1 + 1e-9)  # rounding, outward


def _close_enough(proven, best):
    return proven <= np.maximum(best * (1 + RELATIVE_TARGET), best + ABSOLUTE_TARGET)


def _target(best):
    """The radius to try proving once a point at the threshold is known at ``best`` [m]."""
    return max(best * (1 + RELATIVE_TARGET), best + ABSOLUTE_TARGET)


def _first_tries(bodies, index, hits):
    """The best points known at the thresholds [m] (``hits``, or the bounding radius of a
    non-sphere) and the radii to try proving first, just outside them."""
    floor_hit = 0.0 if bodies[index].shape == "sphere" else bodies[index].bounding_radius
    best = np.maximum(hits, floor_hit)
    radius = np.array([max(_target(b), bodies[index].bounding_radius * (1 + 1e-6)) for b in best])
    return best, radius


def _prove_all(bodies, index, thresholds, starts, table, best, radius, phases=("caps", "faces"), limits=None,
               lower_outer=True):
    """Radii [m] proven by :func:`planner.physics.zones.shell.prove_all_beyond` near the best hits.

    For each threshold, tries ``radius`` (at first just outside the farthest point found at
    it, 4.5 % or 4.5 mm: :func:`_first_tries`); where the proof meets points at the threshold,
    or cannot settle some caps, it looks for points farther out along those directions and
    tries again outside them, and failing that a radius 2 % larger. The thresholds still
    open are proven together, each out to its start radius or (``lower_outer``) to the radius
    already proven for a lower threshold, whichever is smaller. NaN where the cell beyond the
    radius holds another magnet (:func:`~planner.physics.zones.shell.source_free`) or after
    ``PROOF_ATTEMPTS`` tries: the caller then walks cones instead. ``phases`` and ``limits``
    (per threshold, (len(bodies),) [m], or None) go to the shell proof.

    Returns the radii (k,), ``best`` and ``radius`` as they ended (copies), and which radii
    the shell proof gave (True) rather than the outer radius (False; NaN counts False).
    """
    return _prove_all_many(bodies, [(index, thresholds, starts, best, radius, limits)], table, phases,
                           lower_outer)[0]


class _Tries:
    """One magnet's thresholds in :func:`_prove_all_many`: where each stands (arrays (k,))."""

    def __init__(self, index, thresholds, starts, best, radius, limits):
        self.index, self.thresholds, self.starts, self.limits = index, thresholds, starts, limits
        self.best, self.radius = best.copy(), radius.copy()
        self.result = np.full(len(thresholds), np.nan)
        self.shell_proven = np.zeros(len(thresholds), bool)
        self.open = np.ones(len(thresholds), bool)

    def tasks(self, table, lower_outer):
        """The outer radii (k,) [m] and the positions of the thresholds to prove now; settles
        the others (outer radius reached, or magnets in the cell)."""
        thresholds, result = self.thresholds, self.result
        outer = self.starts.copy()
        for k in range(len(thresholds)):
            lower = (thresholds < thresholds[k]) & np.isfinite(result)
            if lower_outer and lower.any():
                outer[k] = min(outer[k], float(np.min(result[lower])))
        tasks = []
        for k in np.flatnonzero(self.open):
            if self.radius[k] >= outer[k]:
                result[k], self.open[k] = outer[k], False
            elif not shell.source_free(table, self.index, self.radius[k]):
                self.open[k] = False
            else:
                tasks.append(k)
        return outer, tasks


def _prove_all_many(bodies, magnets, table, phases=("caps", "faces"), lower_outer=True):
    """:func:`_prove_all` for several magnets at once: ``magnets`` a list of (index, thresholds,
    starts, best, radius, limits). Each try proves the open thresholds of all of them in one
    call of :func:`~planner.physics.zones.shell.prove_many`, whose steps then share their
    evaluations of the field model. Returns, per magnet, what :func:`_prove_all` returns."""
    tries = [_Tries(*magnet) for magnet in magnets]
    for _ in range(PROOF_ATTEMPTS):
        jobs, pending = [], []
        for magnet in tries:
            outer, tasks = magnet.tasks(table, lower_outer)
            if tasks:
                jobs.append((magnet.index, [(magnet.radius[k], outer[k], magnet.thresholds[k],
                                             None if magnet.limits is None else magnet.limits[k]) for k in tasks]))
                pending.append((magnet, outer, tasks))
        if not jobs:
            break
        for (magnet, outer, tasks), outcomes in zip(pending, shell.prove_many(bodies, jobs, table, phases)):
            for k, outcome in zip(tasks, outcomes):
                if outcome.proven:
                    magnet.result[k], magnet.open[k], magnet.shell_proven[k] = magnet.radius[k], False, True
                else:
                    magnet.best[k], magnet.radius[k] = _next_try(bodies, magnet.index, outcome, outer[k],
                                                                 magnet.thresholds[k], table, magnet.best[k],
                                                                 magnet.radius[k])
    return [(magnet.result, magnet.best, magnet.radius, magnet.shell_proven) for magnet in tries]


def _next_try(bodies, index, outcome, outer, threshold, table, best, radius):
    """After a failed shell proof: the best point known [m] and the radius to try next [m].

    Searches for points at the threshold farther out along the directions of the points
    the proof met at it (or of the caps it could not settle), and along the cell faces near
    them; tries just outside a farther point found, or else a radius 2 % larger.
    """
    points = outcome.witnesses if len(outcome.witnesses) else outcome.unproven
    offsets = points - bodies[index].center
    axes = offsets / np.linalg.norm(offsets, axis=1)[:, None]
    paths = [witness.probe_paths(bodies, index, axes, np.full(len(axes), outer), best),
             witness.face_paths_near(table, index, points, outer)]
    found = float(witness.PathSamples(bodies, index, table, paths, threshold).farthest([threshold], [best])[0])
    if found > best:
        return found, max(_target(found), radius * (1 + 1e-3))
    return best, radius * (1 + LOOSER_STEP)


def _refine(bodies, index, threshold, start, table, hit):
    """Adaptive cones: subdivide those whose proven radius is not yet close to the best hit."""
    allowed_error = 2e-3 * threshold
    triangles = icosahedron_triangles(START_LEVEL)
    starts = np.full(len(triangles), start)
    # Every shape but the sphere has charged-face edges on its bounding sphere, where the
    # field grows without bound: the exact distance is at least the bounding radius.
    best_hit = 0.0 if bodies[index].shape == "sphere" else bodies[index].bounding_radius
    # The proven start itself may already be close enough to a point found at the threshold.
    best_hit = max(best_hit, hit)
    if _close_enough(start, best_hit):
        return start
    settled = 0.0
    for level in range(START_LEVEL, MAX_LEVEL + 1):
        axes, half_angles = cone_of_triangle(triangles)
        starts = np.minimum(starts, _cell_limit(bodies, index, axes, half_angles))
        # The answer is at least best_hit (the cone holding that point cannot be proven
        # below it) and at least settled: walking a cone below both changes nothing.
        proven, hit = _march(bodies, index, axes, half_angles, starts, threshold, allowed_error, table,
                             goal=max(settled, best_hit))
        top = np.argsort(proven)[-PROBED_CONES:]
        best_hit = max(best_hit, hit)
        best_hit = witness.probe(bodies, index, axes[top], proven[top], threshold, table=table, inner=best_hit)
        open_ = ~_close_enough(proven, best_hit)
        if (~open_).any():
            settled = max(settled, float(np.max(proven[~open_])))
        if not open_.any() or level == MAX_LEVEL or 4 * open_.sum() > MAX_CONES:
            return max(settled, float(np.max(proven, initial=0.0)))
        triangles = subdivide(triangles[open_])
        starts = np.tile(proven[open_], 4)  # subdivide() lists child k of every triangle together
    return settled  # not reached


def _verify(bodies, index, thresholds, radii, directions=120, table=None):
    """Belt and braces: sample just outside each radius; grow it past any sample at its threshold.

    A guard against a fault in the proofs, not part of them: two shells of ``directions``
    points each (the proofs cover every point of the cell beyond the radius). The first
    round of all thresholds shares one field evaluation, to 25 % of each threshold, and the
    points it cannot clear a second one, to 1 %. Returns the radii [m] (k,).
    """
    centre = bodies[index].center
    table = bounds.body_table(bodies, table)
    unit = fibonacci_directions(directions)
    radii = np.array(radii, dtype=float)
    pending = np.arange(len(radii))
    for _ in range(8):
        shells = radii[pending, None] * np.array([1.0005, 1.02])
        points = (centre + shells[:, :, None, None] * unit[None, None]).reshape(-1, 3)
        owner = np.repeat(pending, 2 * directions)
        distance = table.centre_distances(points)
        keep = witness.in_own_cell(table, index, points, distance)
        points, owner, distance = points[keep], owner[keep], distance[keep]
        # First with a loose allowance, which lets most neighbours be dipoles; only the points
        # whose upper value may reach their threshold are evaluated again to 1 %. A point
        # cleared by the loose bound is below its threshold, so the guard is as strict.
        value, error = field_with_error(bodies, points, GUARD_FIRST_ERROR * thresholds[owner], table, distance)
        close = np.flatnonzero(value + error >= thresholds[owner])
        if len(close):
            value[close], error[close] = field_with_error(
                bodies, points[close], WITNESS_ERROR * thresholds[owner[close]], table, distance[close])
        reached = value + error >= thresholds[owner]
        if not reached.any():
            break
        distance = np.linalg.norm(points - centre, axis=1)
        grown = np.unique(owner[reached])
        for k in grown:
            radii[k] = 1.02 * float(np.max(distance[reached & (owner == k)]))
        pending = grown
    return radii


def keep_out_radius(bodies: list[MagnetBody], index: int, threshold: float) -> float:
    """Keep-out distance: the farthest point of body ``index``'s share of |B| >= threshold.

    Parameters
    ----------
    bodies : list of MagnetBody
        All magnets; their *total* field is used.
    index : int
        Which body the distance is measured from (its centre).
    threshold : float
        Flux density [T], > 0.

    Returns
    -------
    float
        Distance [m] from the centre of body ``index``. Never below the exact value.
        It is proven at 4.5 % or 4.5 mm beyond a point found at the threshold (so at least
        that close to the exact value) unless the proof needed a larger radius there (the
        tries of step 4, or the cone budget), in which case the figure is still proven but
        looser; tests check 5 % or 5 mm.

    Notes
    -----
    **Attribution.** A point belongs to the magnet whose centre is nearest (its Voronoi
    cell). Every point of space belongs to some cell, and each magnet's distance covers its
    whole cell, so the union of the keep-out spheres covers every point where the *total*
    field reaches the threshold: no line is shortened, even where the regions of two
    magnets merge. A point exactly as far from two centres counts for both.

    **Method.** (1) Start at a radius S proven beyond the threshold
    (:func:`farthest_start_radius`). (2) Find points at the threshold: |B| minus its proven
    error is sampled along 40 rays from the centre and 12 paths on each face of the cell
    (where a neighbour's field spills over a face, the farthest point hugs it), and bisected
    past the outermost sample that reaches the threshold; the farthest such point is a lower
    bound of the exact value
    (for shapes other than the sphere so is the bounding radius, see below). (3) Try the
    radius R 4.5 % or 4.5 mm beyond it: by the maximum principle for |B|^2, which is
    subharmonic outside the magnets, |B| < threshold in the whole cell between R and S
    once it is proven on the sphere of radius R within the cell and on the cell's faces
    between R and S (:mod:`planner.physics.zones.shell`: caps of a subdivided icosahedron
    and flat patches of the faces, each proven by second-order bounds with the magnet's own
    dipole taken exactly). (4) Where that proof meets points at the threshold, or cannot
    settle some caps, look for points farther out along their directions and try again
    just outside the farthest one, or at a radius 2 % larger. (5) Where another magnet lies
    in the cell beyond R (magnets touching or stacked), or after six tries, walk cones
    instead: cover the sphere of directions with spherical triangles, each inside a cone,
    and walk each cone inward from S while a second-order bound proves the slab
    [r - s, r] below the threshold (``zones.certify``), splitting the cones whose proven
    radius is not yet within 4.5 % or 4.5 mm of the farthest point found, until all are or
    a budget of cones is spent. (6) The result is checked by sampling just outside it
    (grown if any sample reaches the threshold). Steps (3)-(5) are what make the figure
    conservative; (6) guards the code.

    **Thresholds above the field outside the body.** The result is then the body's
    bounding radius (the body itself is the keep-out). For every shape except the sphere
    this is also the exact value: the field of a uniformly magnetized body grows without
    bound (logarithmically) at the edges of its charged faces, which reach the bounding
    sphere (Engel-Herbert & Hesjedal 2005).

    References
    ----------
    R. Engel-Herbert, T. Hesjedal, J. Appl. Phys. 97, 074504 (2005) (cuboid field and its
    edge singularities). Jackson, Classical Electrodynamics, 3rd ed. (1999), eq. 5.56.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> from planner.physics.constants import mu_0
    >>> exact = (mu_0 / (2 * np.pi) * float(np.linalg.norm(ball.moment)) / 1e-3) ** (1 / 3)
    >>> r = keep_out_radius([ball], 0, 1e-3)
    >>> bool(exact <= r <= 1.05 * exact)
    True
    """
    return float(keep_out_radii(bodies, index, [threshold])[0])
