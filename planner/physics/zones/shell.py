"""Proof that no point of a magnet's cell beyond a radius reaches a threshold.

**Why two surfaces settle a volume.** Outside the magnets B is free of curl and divergence,
so each Cartesian component B_k is harmonic and |B|^2 = sum_k B_k^2 is subharmonic: its
Laplacian is 2 sum_k |grad B_k|^2 >= 0. A subharmonic function on a bounded region takes
its largest value on the region's boundary (weak maximum principle). Take the part of
magnet j's cell (the points at least as close to its centre c as to any other centre, a
convex polyhedron) between the radii R and S about c. If it holds no magnet and |B| < t on
its boundary, then |B| < t everywhere in it. That boundary is

* the sphere of radius R, within the cell (:func:`prove_beyond` covers it with caps);
* the faces of the cell between R and S, parts of the planes that bisect c and a
  neighbour's centre (covered with flat patches);
* the sphere of radius S within the cell, where the caller's start radius
  (:func:`planner.physics.zones.keep_out.farthest_start_radius`) already proves |B| < t.

So the keep-out question at one radius is two 2-D proofs, instead of walking 3-D cones.

**Bodies left out.** Every point of that region is at least R from every centre (it is at
least R from c, and no other centre is nearer) and at least half the gap from each other
centre; a point of the sphere is also at least |gap - R| from each (triangle inequality).
Bodies whose summed dipole bound there, 2 k m / e^3 plus the dipole remainder with e the
smallest such distance (:func:`~planner.physics.zones.bounds.cell_field_bounds`), fits in
``IGNORED_SHARE`` of the threshold are left out of the per-patch work, and the patches are
proven against the threshold less that sum. The caps and the face patches are proven in
turn, each with its own set of bodies: on the sphere far fewer are needed.

**Caps: the magnet's own dipole taken exactly.** On the sphere x = c + R u (|u| = 1) the
field of the magnet's own point dipole m is D(u) = k (3 (u.m) u - m) / R^3, a quadratic
polynomial in u. Write B = D + V, V the rest (the magnet minus its dipole, and the other
kept bodies). Over a cap of half-angle delta about the unit vector n, with y = c + R n and
rho = 2 R sin(delta / 2) >= |x - y|, Taylor's theorem gives V(x) = V(y) + DV(y)^T (x - y) + r,
|r| <= L2 rho^2 / 2, L2 a bound on ||D^2 V|| along the segment from y to x. The segment is a
chord of the sphere, so it keeps at least R cos(delta / 2) from c: the own magnet's part is
its dipole remainder of order 2 (:func:`~planner.physics.zones.bounds.dipole_remainder`) at
that distance; it falls as r^-7 or faster, so at R - rho (the ball about y) it would be
3.3 times larger for caps of 9 degrees and 13 times for 18. The others' part is their
derivative bounds over the ball of radius rho about y. Then B(x) = P(u) + r with the quadratic polynomial
P(u) = D(u) + V(y) + R DV(y)^T (u - n), whose expansion about n is exact:
P(u) = P(n) + A d + 3 k (m.d) d / R^3, d = u - n = -(1 - cos theta) n + sin theta w (w a unit
vector across n, theta <= delta), A = 3 k (n m^T + (m.n) I) / R^3 + R DV(y)^T. So

    |P(n) + A d|^2 <= |P(n)|^2 + 2 max_{theta <= delta} [-(1 - cos theta) a + sin theta b]
                      + [(1 - cos delta) |A n| + sin delta ||A||_across]^2,

a = P(n).A n, b = |(A^T P(n))_across|, ||A||_across the norm of A on the plane across n. The
maximum keeps the sign of a: where the field is strongest along n (a > 0, as at a dipole's
pole) it falls towards the rim, and the bracket peaks at sqrt(a^2 + b^2) - a (at
tan theta = b / a) or at theta = delta if that comes first; for a <= 0 it is
|a| (1 - cos delta) + b sin delta. The own dipole's quadratic term is
|3 k (m.d) d / R^3| <= 3 k |d| [(1 - cos delta) |m.n| + sin delta |m_across|] / R^3, small
near the pole, where d is nearly across m. (With |a| and |m| |d| in their place, the
30-magnet benchmark needed 7 % more caps.)
Unlike a bound through ||D^2 B|| over the whole ball, which carries the steep fall of the
field along the radius (about 24 k m / R^5 against a field of 2 k m / R^3), this one sees
that the field hardly changes *across* the radius near its strongest direction: a cap of
9 degrees about a lone dipole's pole is proven at 4.5 % above the pole field. The model's
errors at y are added (|B| error, and the Jacobian error times rho). Beside a magnet, where
the dipole remainder has no useful bound, the general second-order bound of
:mod:`planner.physics.zones.certify` is tried as well; either proves a cap.

**Faces.** Flat patches of the bisecting planes, in polar cells about the foot of c on the
plane, are proven with the general bound of :func:`planner.physics.zones.certify.patch_below`.

References
----------
D. Gilbarg and N. S. Trudinger, *Elliptic Partial Differential Equations of Second Order*,
Springer (2001), Theorem 3.1 (weak maximum principle for Lu >= 0). J. D. Jackson,
*Classical Electrodynamics*, 3rd ed., Wiley (1999), eq. 5.56 (dipole field) and section 5.9
(B outside magnetized matter: divergence- and curl-free). Icosahedral caps:
:mod:`planner.physics.zones.sampling`.
"""
from __future__ import annotations

from typing import NamedTuple

import numpy as np

from planner.physics.bodies import plane_basis
from planner.physics.zones.bounds import (K, BodyTable, body_table, cell_field_bounds, derivative_bounds,
                                          dipole_remainder)
from planner.physics.zones.certify import LocalModel, local_model, patch_below
from planner.physics.zones.sampling import child_indices, geometric_steps, icosahedron_cones

__all__ = ["ShellOutcome", "source_free", "clipped_caps", "prove_beyond",
           "prove_all_beyond", "prove_many"]

IGNORED_SHARE = 0.01  # of the threshold, for the bodies left out of the per-patch work
MODEL_SHARE = 1e-2  # of the threshold, for the dipole stand-ins' error at each patch centre
FIRST_CAP_LEVEL = 2  # 320 caps of about 9 degrees to begin with (at 18, four in five failed)
LAST_CAP_LEVEL = 6
FACE_RING_RATIO = 1.075  # radial cells of the face patches, as a ratio of distances from c
FACE_SECTORS = 32
FACE_SPLITS = 6
GROUP_SHARE = 0.6  # tasks needing at least this share of the most bodies any needs are proven together


class ShellOutcome(NamedTuple):
    """What :func:`prove_beyond` found.

    ``proven``: no point of the cell beyond the radius reaches the threshold. Otherwise
    ``witnesses`` (k, 3) [m]: points of the cell at or beyond the radius where |B| surely
    reaches it (model value minus its error), if any were met; else ``unproven`` (k, 3) [m]:
    the centres of the caps and patches that could not be proven at the finest level.
    """

    proven: bool
    witnesses: np.ndarray
    unproven: np.ndarray


class Cell:
    """Magnet ``index``'s cell among ``centres`` (b, 3) [m]: the half-spaces (x - c) . n_i <= g_i / 2 of
    all other centres.

    ``centre`` c (3,) [m]; per other centre: ``others`` its index among ``centres``,
    ``gaps`` g_i [m], unit ``normals`` n_i towards it, the ``feet`` c + (g_i / 2) n_i of c on
    the bisecting planes [m], and unit vectors ``e1``, ``e2`` in those planes (e1, e2, n_i
    right-handed).
    """

    def __init__(self, centres, index: int):
        centres = np.asarray(centres, dtype=float).reshape(-1, 3)
        self.centre = centres[index]
        offsets = np.delete(centres, index, axis=0) - self.centre
        gaps = np.linalg.norm(offsets, axis=1)
        keep = gaps > 0  # a body at the same centre has no bisecting plane
        self.others = np.delete(np.arange(len(centres)), index)[keep]
        self.gaps = gaps[keep]
        self.normals = offsets[keep] / self.gaps[:, None]
        self.feet = self.centre + 0.5 * self.gaps[:, None] * self.normals
        self.e1, self.e2 = plane_basis(self.normals)

    def excess(self, points):
        """Largest (x - c) . n_i - g_i / 2 over the other centres (n,) [m]: > 0 outside the cell."""
        return self.excess_and_face(points)[0]

    def excess_and_face(self, points):
        """:meth:`excess` and the row of the face that gives it (n,) (0 where there is none)."""
        if not len(self.gaps):
            return np.full(len(points), -np.inf), np.zeros(len(points), np.intp)
        beyond = (points - self.centre) @ self.normals.T - 0.5 * self.gaps
        row = np.argmax(beyond, axis=1)
        return beyond[np.arange(len(points)), row], row


def clipped_caps(axes, half_angles, normals, heights):
    """Smaller caps holding the part of each cap (``axes`` n, ``half_angles`` delta) inside the
    half-space u . v <= h of the unit sphere (``normals`` v (n, 3), ``heights`` h (n,) >= 0).

    For a cap that the plane cuts, that part is bounded by an arc of the cap's circle (from
    one corner, where the two circles meet, through the point p farthest from the plane) and
    an arc of the plane's circle between the corners. Both arcs lie in the great circle
    through n and v's mirror image, so seen from any point n' of that great circle the
    distance along each arc grows towards its ends: the farthest points of the part are p
    and the corners. n' is taken halfway (along the chord) between p and the corners' middle,
    and the new half-angle is its larger angle to them. Caps the plane does not cut, and
    those for which this is not smaller, are returned as they were. Returns the axes (n, 3),
    the half-angles (n,) [rad] and which caps lie wholly beyond the plane (n,) bool: their
    nearest point to it, at the angle theta + delta from v (theta the centre's), has
    cos(theta + delta) > h.
    """
    cosine, sine = np.cos(half_angles), np.sin(half_angles)
    tilt = np.sum(axes * normals, axis=1)
    side = np.sqrt(np.maximum(1 - tilt**2, 0.0))
    with np.errstate(invalid="ignore", divide="ignore"):
        across = (normals - tilt[:, None] * axes) / side[:, None]  # unit, from n towards the plane
        towards = (heights - cosine * tilt) / side  # the corners' component along it
        height = 1 - cosine**2 - towards**2  # the square of their component across both
    # h >= 0 (a plane that keeps the sphere's centre on the inner side, as the cell's faces
    # do) and delta <= pi / 2: the plane's circle then meets the cap in one short arc
    cut = (side > 1e-9) & (height > 0) & (heights >= 0) & (half_angles <= np.pi / 2)
    # In the coordinates (along n, along ``across``) of their great circle: the farthest
    # point p = (cos delta, -sin delta), the corners' middle direction (cos delta, towards)
    # normalized, the new centre n' = (a, b) halfway between them; the corners themselves are
    # (cos delta, towards, +-sqrt(height)), so cos(angle(n', corner)) = a cos delta + b towards.
    towards = np.where(cut, towards, 0.0)
    middle = np.sqrt(cosine**2 + towards**2)
    a, b = cosine + cosine / middle, towards / middle - sine
    size = np.hypot(a, b)
    a, b = a / size, b / size
    angle = np.arccos(np.clip(np.minimum(a * cosine - b * sine, a * cosine + b * towards), -1.0, 1.0))
    angle = angle * (1 + 1e-9) + 1e-12
    smaller = cut & (angle < half_angles)
    with np.errstate(invalid="ignore"):  # NaN only in rows that are not cut, which keep their cap
        centre = a[:, None] * axes + b[:, None] * across
    beyond = np.cos(np.minimum(np.arccos(np.clip(tilt, -1, 1)) + half_angles, np.pi)) > heights
    return np.where(smaller[:, None], centre, axes), np.where(smaller, angle, half_angles), beyond


def source_free(table: BodyTable, index: int, radius: float) -> bool:
    """Whether the cell of body ``index`` beyond ``radius`` [m] holds no magnet.

    True when the body lies within ``radius`` of its centre and every other body either lies
    wholly on its own side of the bisecting plane (bounding radius below half the gap) or
    wholly within ``radius`` of the centre. Where this fails (magnets touching or stacked)
    the maximum principle does not apply and the caller proves the cell another way.
    """
    gaps = np.linalg.norm(table.centres - table.centres[index], axis=1)
    reach = table.reach
    others = np.arange(len(gaps)) != index
    clear = (reach < 0.5 * gaps) | (gaps + reach < radius)
    return bool(reach[index] < radius and np.all(clear[others]))


def _dipole_cap_holds(model: LocalModel, moment, radius, axes, half_angles, rest_second, threshold):
    """The cap bound of the module docstring, with the magnet's own dipole taken exactly.

    ``moment`` [A m^2]: the magnet's, (3,), or each cap's own magnet's, (n, 3); ``radius`` [m]
    and ``threshold`` [T]: one value or one per cap; ``rest_second`` (n,) [T/m^2]: a bound on
    ||D^2 V|| along each cap's chords (the own magnet minus its dipole, and the other
    bodies). Returns (n,) bool.
    """
    n = axes
    radius = np.broadcast_to(np.asarray(radius, dtype=float), half_angles.shape)
    moment = np.broadcast_to(np.asarray(moment, dtype=float), n.shape)
    chord = 2 * np.sin(half_angles / 2)
    rho = radius * chord
    cosine, sine = np.cos(half_angles), np.sin(half_angles)
    scale = 3 * K / radius**3
    along_moment = np.sum(n * moment, axis=1)
    # A = R DV(y)^T + 3 k (n m^T + (m.n) I) / R^3 with DV the model Jacobian less the own
    # dipole's, 3 k [(m.n)(I - 5 n n^T) + n m^T + m n^T] / R^4 at y: it comes to
    # A = R DB(y) + (3 k / R^3) (5 (m.n) n - m) n^T, DB[i, j] = dB_i/dx_j = jacobian[j, i].
    # So A n = R DB n + (3 k / R^3)(5 (m.n) n - m), A w = R DB w across n, and the part of
    # A^T P across n is R (DB^T P) across n.
    jacobian, p0 = model.jacobian, model.field
    a_n = (radius[:, None] * np.einsum("nji,nj->ni", jacobian, n)
           + scale[:, None] * (5 * along_moment[:, None] * n - moment))
    at_p = np.einsum("nji,ni->nj", jacobian, p0)
    at_p_across = radius[:, None] * (at_p - np.sum(at_p * n, axis=1)[:, None] * n)
    # the norm of A on the plane across n: the largest eigenvalue of the 2 x 2 Gram matrix
    e1, e2 = plane_basis(n)
    a1, a2 = np.einsum("nji,nj->ni", jacobian, e1), np.einsum("nji,nj->ni", jacobian, e2)
    g11, g22, g12 = np.sum(a1 * a1, axis=1), np.sum(a2 * a2, axis=1), np.sum(a1 * a2, axis=1)
    across_norm = radius * np.sqrt(0.5 * (g11 + g22) + np.sqrt(0.25 * (g11 - g22)**2 + g12**2))
    linear = _largest_first_order(np.sum(p0 * a_n, axis=1), np.linalg.norm(at_p_across, axis=1), half_angles)
    step = (1 - cosine) * np.linalg.norm(a_n, axis=1) + sine * across_norm
    moment_across = np.sqrt(np.maximum(np.sum(moment * moment, axis=1) - along_moment**2, 0.0))
    quadratic = scale * chord * ((1 - cosine) * np.abs(along_moment) + sine * moment_across)
    with np.errstate(invalid="ignore", over="ignore"):
        bound = (np.sqrt(np.sum(p0 * p0, axis=1) + 2 * linear + step**2) + quadratic
                 + 0.5 * rest_second * rho**2 + model.error + model.jacobian_error * rho)
    return bound < threshold * (1 - 1e-9)  # False where the bound is NaN or infinite


def _largest_first_order(a, b, half_angles):
    """max over 0 <= theta <= delta of -(1 - cos theta) a + sin theta b (b >= 0), per cap (n,).

    The bracket rises while tan theta < b / a and falls after (for a > 0; for a <= 0 it
    only rises), so its largest value is at theta = min(arctan2(b, a), delta)."""
    theta = np.minimum(np.arctan2(b, a), half_angles)
    return -(1 - np.cos(theta)) * a + np.sin(theta) * b


class _Task:
    """One radius and threshold to prove on the caps or on the face patches, and how far it has got."""

    def __init__(self, radius, outer, threshold, left_out, phase, cell, limits=None, own=0):
        self.radius, self.outer, self.threshold, self.left_out = radius, outer, threshold, left_out
        self.proof_threshold = threshold - left_out
        self.phase, self.outcome, self.cell, self.own = phase, None, cell, own
        if phase == "caps":
            self.level = FIRST_CAP_LEVEL
            self.triangles = np.arange(20 * 4**FIRST_CAP_LEVEL)  # indices into the level's tiling
        else:
            self.level = 0
            self.cells = _face_cells(cell, radius, outer, limits)  # rows, s1, s2, phi1, phi2
            if self.cells is None:
                self.outcome = _PROVEN

    def patches(self):
        """This task's patches of the current phase that reach into its cell, as a dict of
        arrays (advancing past phases with nothing left to prove); None once decided."""
        cell = self.cell
        while self.outcome is None:
            if self.phase == "caps":
                cones = (part[self.triangles] for part in icosahedron_cones(self.level))
                keep, axes, half_angles = _caps_in_cell(cell, self.radius, *cones)
                if keep.any():
                    self.triangles = self.triangles[keep]
                    points = cell.centre + self.radius * axes
                    excess = cell.excess(points)
                    return dict(points=points, axes=axes, chord=2 * self.radius * np.sin(half_angles / 2),
                                along=self.radius * (1 - np.cos(half_angles)), across=self.radius * np.sin(half_angles),
                                half_angles=half_angles, excess=excess, cap=np.ones(len(axes), bool))
                self.outcome = _PROVEN
            else:
                rows, s1, s2, phi1, phi2 = self.cells
                s_mid, phi_mid = 0.5 * (s1 + s2), 0.5 * (phi1 + phi2)
                points = cell.feet[rows] + s_mid[:, None] * (np.cos(phi_mid)[:, None] * cell.e1[rows]
                                                             + np.sin(phi_mid)[:, None] * cell.e2[rows])
                # every point (s, phi) of the cell is within this of its centre point
                reach = 0.5 * (s2 - s1) + 2 * s2 * np.sin(0.25 * (phi2 - phi1))
                excess = cell.excess(points)
                inside = excess - reach <= 0
                if inside.any():
                    self.cells = tuple(part[inside] for part in self.cells)
                    count = int(inside.sum())
                    # the centre is on the plane of its own face; any other plane it crosses is outside
                    return dict(points=points[inside], axes=cell.normals[rows[inside]], chord=reach[inside],
                                along=np.zeros(count), across=reach[inside], half_angles=np.zeros(count),
                                excess=excess[inside] - 1e-12 * cell.gaps[rows[inside]],
                                cap=np.zeros(count, bool))
                self.outcome = _PROVEN
        return None

    def settle(self, points, witness, hopeless, holds):
        """Take the verdicts on this task's patches: decide, or split the open ones."""
        if witness.any():
            self.outcome = ShellOutcome(False, points[witness], _NONE)
        elif hopeless.any():
            self.outcome = ShellOutcome(False, _NONE, points[hopeless])
        elif holds.all():
            self.outcome = _PROVEN
        elif self.level == (LAST_CAP_LEVEL if self.phase == "caps" else FACE_SPLITS):
            self.outcome = ShellOutcome(False, _NONE, points[~holds])
        elif self.phase == "caps":
            self.triangles = child_indices(self.triangles[~holds], self.level)
            self.level += 1
        else:
            rows, s1, s2, phi1, phi2 = (part[~holds] for part in self.cells)
            s_mid, phi_mid = 0.5 * (s1 + s2), 0.5 * (phi1 + phi2)
            self.cells = (np.tile(rows, 4), np.concatenate([s1, s_mid, s1, s_mid]),
                          np.concatenate([s_mid, s2, s_mid, s2]), np.concatenate([phi1, phi1, phi_mid, phi_mid]),
                          np.concatenate([phi_mid, phi_mid, phi2, phi2]))
            self.level += 1


def _caps_in_cell(cell, radius, axes, half_angles):
    """The caps (``axes``, ``half_angles``) of the sphere of ``radius`` [m] that reach into the cell.

    Returns which caps reach in (n,) bool, and the axes and half-angles of those, each cut
    by the face nearest its centre replaced by the smaller cap of :func:`clipped_caps`, which
    holds only its part inside (the cell's part is all the proof needs).
    """
    excess, face = cell.excess_and_face(cell.centre + radius * axes)
    chord = 2 * radius * np.sin(half_angles / 2)
    keep = excess - chord <= 0  # caps wholly in another cell have nothing to prove
    axes, half_angles = axes[keep].copy(), half_angles[keep].copy()
    cut = np.flatnonzero(excess[keep] + chord[keep] > 0)
    face = face[keep][cut]
    axes[cut], half_angles[cut], beyond = clipped_caps(axes[cut], half_angles[cut], cell.normals[face],
                                                       0.5 * cell.gaps[face] / radius)
    inside = np.ones(len(axes), bool)
    inside[cut[beyond]] = False  # wholly outside after all
    keep[np.flatnonzero(keep)[~inside]] = False
    return keep, axes[inside], half_angles[inside]


_NONE = np.empty((0, 3))
_PROVEN = ShellOutcome(True, _NONE, _NONE)


def _face_cells(cell, radius, outer, limits=None):
    """The first polar cells of every face between ``radius`` and ``outer`` [m].

    ``limits`` (b,) [m], per body index: the face towards that body is covered only out to
    that distance from the centre, if smaller than ``outer``. Returns per cell: face row (into
    cell.normals), s1, s2 [m] (distances from the foot of c on the plane) and phi1, phi2
    [rad]; None if no face comes within its outer distance.
    """
    rows, inner_s, outer_s, first, last = [], [], [], [], []
    for row, gap in enumerate(cell.gaps):
        half = 0.5 * gap
        low = max(radius, half)
        end = outer if limits is None else min(outer, float(limits[cell.others[row]]))
        if low >= end:
            continue
        rings = max(int(np.ceil(np.log(end / low) / np.log(FACE_RING_RATIO))), 1)
        distances = geometric_steps(low, end, rings + 1)
        s = np.sqrt(np.maximum(distances**2 - half**2, 0.0))
        phi = np.linspace(0.0, 2 * np.pi, FACE_SECTORS + 1)
        ring, sector = np.meshgrid(np.arange(rings), np.arange(FACE_SECTORS), indexing="ij")
        rows.append(np.full(ring.size, row))
        inner_s.append(s[ring.ravel()])
        outer_s.append(s[ring.ravel() + 1])
        first.append(phi[sector.ravel()])
        last.append(phi[sector.ravel() + 1])
    if not rows:
        return None
    return tuple(np.concatenate(parts) for parts in (rows, inner_s, outer_s, first, last))


def prove_beyond(bodies, index: int, radius: float, outer: float, threshold: float,
                 table: BodyTable | None = None) -> ShellOutcome:
    """Prove |B| < ``threshold`` in the whole cell of body ``index`` between ``radius`` and ``outer``.

    Parameters
    ----------
    bodies : list of MagnetBody
        All magnets; their total field is used.
    index : int
        The magnet whose cell and centre are meant.
    radius, outer : float
        Radii [m] about its centre, radius < outer; beyond ``outer`` the caller has proven
        the cell below the threshold already.
    threshold : float
        Flux density [T], > 0.
    table : BodyTable, optional
        The bodies' constants, if the caller has them.

    Returns
    -------
    ShellOutcome
        Proven, or the points found at the threshold, or the centres left unproven.

    Notes
    -----
    Valid only where :func:`source_free` holds for ``radius``; the caller checks it. The
    method and its bounds: the module docstring. :func:`prove_all_beyond` does several
    radii and thresholds at once.
    """
    return prove_all_beyond(bodies, index, [(radius, outer, threshold)], table)[0]


def prove_all_beyond(bodies, index: int, tasks, table: BodyTable | None = None,
                     phases=("caps", "faces")) -> list[ShellOutcome]:
    """:func:`prove_beyond` for several ``tasks`` (radius, outer, threshold) of one magnet at once.

    The tasks' caps and face patches at each step share one evaluation of the field model,
    with the bodies any of them needs: the same verdicts as one by one, in fewer and larger
    numpy calls.

    A task may carry a fourth item, ``limits`` (len(bodies),) [m]: the face towards body j is
    then proven only out to ``limits[j]`` from the centre (where it is smaller than outer),
    for a caller that knows the cell of j proven below the threshold beyond that distance
    (:func:`planner.physics.zones.table.keep_out_table`). ``phases``: "caps" (the sphere),
    "faces", or both in turn (the faces only of the tasks whose caps were proven).
    """
    return prove_many(bodies, [(index, tasks)], table, phases)[0]


def prove_many(bodies, jobs, table: BodyTable | None = None, phases=("caps", "faces")) -> list[list[ShellOutcome]]:
    """:func:`prove_all_beyond` for several magnets at once: ``jobs`` a list of (index, tasks);
    returns the outcomes of each job's tasks.

    Each step of the proofs is one evaluation of the field model for the patches of every
    magnet's tasks (in groups of tasks that need about as many bodies), so a worker with
    several magnets makes a few large numpy calls where one magnet at a time would make
    many small ones, whose fixed cost dominated.
    """
    table = body_table(bodies, table)
    entries = []  # (job, position, index, cell, task)
    for job, (index, tasks) in enumerate(jobs):
        cell = Cell(table.centres, index)
        for position, task in enumerate(tasks):
            entries.append((job, position, index, cell, tuple(task) + (None,) * (4 - len(task))))
    outcomes = [[_PROVEN] * len(tasks) for _, tasks in jobs]
    if "caps" in phases:
        for (job, position, *_), outcome in zip(entries, _prove_phase(bodies, table, entries, "caps")):
            outcomes[job][position] = outcome
    if "faces" in phases:
        faces = [entry for entry in entries if outcomes[entry[0]][entry[1]].proven]
        for (job, position, *_), outcome in zip(faces, _prove_phase(bodies, table, faces, "faces")):
            outcomes[job][position] = outcome
    return outcomes


def _prove_phase(bodies, table, entries, phase):
    """The caps (``phase`` "caps") or the face patches ("faces") of every entry (job, position,
    magnet index, its cell, task (radius, outer, threshold, limits)), in groups of tasks that
    need about as many bodies modelled."""
    bounds, needed = [], []
    for _, _, index, _, task in entries:
        bound = cell_field_bounds(table, index, task[0], on_sphere=phase == "caps")
        bound[index] = np.inf  # the magnet itself is always modelled
        order = np.argsort(bound, kind="stable")
        bounds.append(bound)
        needed.append(set(order[np.cumsum(bound[order]) > IGNORED_SHARE * task[2]].tolist()) | {index})
    outcomes = [None] * len(entries)
    # Tasks that need about as many bodies share their evaluations; a task that needs far
    # fewer would pay for the others' bodies at every point, so it goes in a group of its own.
    by_size = sorted(range(len(entries)), key=lambda k: -len(needed[k]))
    while by_size:
        largest = len(needed[by_size[0]])
        group = by_size[:1] + [k for k in by_size[1:] if len(needed[k]) >= GROUP_SHARE * largest]
        by_size = [k for k in by_size if k not in group]
        first = entries[group[0]][2]
        kept = np.array([first] + sorted(set().union(*(needed[k] for k in group)) - {first}), dtype=np.intp)
        column = {int(body): position for position, body in enumerate(kept)}
        left_out = np.ones(len(bodies), bool)
        left_out[kept] = False
        work = []
        for k in group:
            _, _, index, cell, task = entries[k]
            work.append(_Task(*task[:3], float(np.sum(bounds[k][left_out])), phase, cell, task[3], column[index]))
        for k, outcome in zip(group, _prove_tasks([bodies[i] for i in kept], table.subset(kept), work)):
            outcomes[k] = outcome
    return outcomes


def _prove_tasks(members, part, work):
    """Run the tasks ``work`` to their outcomes; ``members`` the bodies modelled and ``part``
    their table (each task's magnet at its column ``own``)."""
    while True:
        open_ = [(task, task.patches()) for task in work]
        open_ = [(task, patches) for task, patches in open_ if patches is not None]
        if not open_:
            return [task.outcome for task in work]
        sizes = [len(patches["points"]) for _, patches in open_]
        batch = {key: np.concatenate([patches[key] for _, patches in open_]) for key in open_[0][1]}
        per_task = lambda name: np.repeat([getattr(task, name) for task, _ in open_], sizes)  # noqa: E731
        threshold, proof_threshold, left, radius, own = (per_task(name) for name in
                                                         ("threshold", "proof_threshold", "left_out", "radius", "own"))
        points, axes, chord, cap = batch["points"], batch["axes"], batch["chord"], batch["cap"]
        model = local_model(members, points, MODEL_SHARE * threshold, part)
        size = np.sqrt(np.sum(model.field**2, axis=1))
        inside = batch["excess"] <= 0
        witness = (size - model.error - left >= threshold) & inside
        # a centre in the cell that no smaller patch can prove (the proof needs the kept
        # bodies' field below proof_threshold there)
        hopeless = (size - model.error >= proof_threshold) & inside
        first_each, second_each = derivative_bounds(model.geometry, chord, (1, 2), per_body=True)
        holds = np.zeros(len(points), bool)
        if cap.any():
            rows = np.flatnonzero(cap)
            mine = own[rows]
            others = np.arange(len(members))[None, :] != mine[:, None]
            rest_second = (np.sum(np.where(others, second_each[rows], 0.0), axis=1)
                           + _own_remainder(part, mine, radius[rows] * np.cos(0.5 * batch["half_angles"][rows])))
            holds[rows] = _dipole_cap_holds(model.take(rows), part.vectors[mine], radius[rows],
                                            axes[rows], batch["half_angles"][rows], rest_second,
                                            proof_threshold[rows])
        rows = np.flatnonzero(~holds)  # faces, and caps beside the magnet: the general bound
        if len(rows):
            holds[rows] = patch_below(model.take(rows), axes[rows], batch["along"][rows], batch["across"][rows],
                                      proof_threshold[rows],
                                      (np.sum(first_each[rows], axis=1), np.sum(second_each[rows], axis=1)))
        start = 0
        for (task, _), count in zip(open_, sizes):
            span = slice(start, start + count)
            task.settle(points[span], witness[span], hopeless[span], holds[span])
            start += count


def _own_remainder(part, columns, distance):
    """The dipole remainder of order 2 [T/m^2] of body ``columns[i]`` of ``part`` at ``distance[i]`` [m]
    (:func:`~planner.physics.zones.bounds.dipole_remainder`), each point's own magnet."""
    result = np.empty(len(columns))
    for column in np.unique(columns):
        rows = columns == column
        result[rows] = dipole_remainder(part.subset([column]), distance[rows, None], 2)[:, 0]
    return result
