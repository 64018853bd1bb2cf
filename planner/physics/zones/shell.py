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
centre. Bodies whose summed dipole bound there, 2 k m / e^3 plus the dipole remainder with
e = max(R, gap / 2) (:func:`~planner.physics.zones.bounds.dipole_remainders`), fits in
``IGNORED_SHARE`` of the threshold are left out of the per-patch work, and the patches are
proven against the threshold less that sum.

**Caps: the magnet's own dipole taken exactly.** On the sphere x = c + R u (|u| = 1) the
field of the magnet's own point dipole m is D(u) = k (3 (u.m) u - m) / R^3, a quadratic
polynomial in u. Write B = D + V, V the rest (the magnet minus its dipole, and the other
kept bodies). Over a cap of half-angle delta about the unit vector n, with y = c + R n and
rho = 2 R sin(delta / 2) >= |x - y|, Taylor's theorem gives V(x) = V(y) + DV(y)^T (x - y) + r,
|r| <= L2 rho^2 / 2 (L2 a bound on ||D^2 V|| over the ball: the dipole remainder of order
2 of the own magnet, :func:`~planner.physics.zones.bounds.dipole_remainder`, and the
derivative bounds of the others). Then B(x) = P(u) + r with the quadratic polynomial
P(u) = D(u) + V(y) + R DV(y)^T (u - n), whose expansion about n is exact:
P(u) = P(n) + A d + 3 k (m.d) d / R^3, d = u - n = -(1 - cos theta) n + sin theta w (w a unit
vector across n, theta <= delta), A = 3 k (n m^T + (m.n) I) / R^3 + R DV(y)^T. So

    |P(n) + A d|^2 <= |P(n)|^2 + 2 [(1 - cos delta) |P(n).A n| + sin delta |(A^T P(n))_across|]
                      + [(1 - cos delta) |A n| + sin delta ||A||_across]^2,

||A||_across the norm of A on the plane across n, and |3 k (m.d) d / R^3| <= 3 k |m| |d|^2 / R^3.
Unlike a bound through ||D^2 B|| over the whole ball, which carries the steep fall of the
field along the radius (about 24 k m / R^5 against a field of 2 k m / R^3), this one sees
that the field hardly changes *across* the radius near its strongest direction: a cap of
9 degrees is proven where the sphere's largest |B| is 12 % below the threshold. The model's
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

from planner.physics.zones.bounds import K, BodyTable, derivative_bounds, dipole_remainder
from planner.physics.zones.certify import (LocalModel, _dipole_field_and_jacobian, axis_parts, gradient_parts,
                                           local_model, patch_below, taylor_holds)
from planner.physics.zones.sampling import cone_of_triangle, icosahedron_triangles, subdivide

__all__ = ["ShellOutcome", "source_free", "prove_beyond"]

IGNORED_SHARE = 0.01  # of the threshold, for the bodies left out of the per-patch work
MODEL_SHARE = 2e-3  # of the threshold, for the dipole stand-ins' error at each patch centre
FIRST_CAP_LEVEL = 1  # 80 caps of about 18 degrees to begin with
LAST_CAP_LEVEL = 6
FACE_RING_RATIO = 1.15  # radial cells of the face patches, as a ratio of distances from c
FACE_SECTORS = 16
FACE_SPLITS = 6


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


class _Cell:
    """Magnet ``index``'s cell: the half-spaces (x - c) . n_i <= g_i / 2 of all other centres."""

    def __init__(self, table: BodyTable, index: int):
        self.centre = table.centres[index]
        offsets = np.delete(table.centres, index, axis=0) - self.centre
        gaps = np.linalg.norm(offsets, axis=1)
        keep = gaps > 0  # a body at the same centre has no bisecting plane
        self.others = np.delete(np.arange(len(table.centres)), index)[keep]
        self.gaps = gaps[keep]
        self.normals = offsets[keep] / self.gaps[:, None]

    def excess(self, points):
        """Largest (x - c) . n_i - g_i / 2 over the other centres (n,) [m]: > 0 outside the cell."""
        if not len(self.gaps):
            return np.full(len(points), -np.inf)
        return np.max((points - self.centre) @ self.normals.T - 0.5 * self.gaps, axis=1)


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


def _kept_bodies(table, index, radius, budget):
    """Indices of the bodies to model at the patches (``index`` first) and the summed bound [T]
    on the field of the others anywhere in the cell beyond ``radius``."""
    gaps = np.linalg.norm(table.centres - table.centres[index], axis=1)
    distance = np.maximum(radius, 0.5 * gaps)
    bound = 2 * K * table.moments / distance**3 + dipole_remainder(table, distance, 0)
    bound[index] = np.inf
    order = np.argsort(bound, kind="stable")
    left_out = order[np.cumsum(bound[order]) <= budget]
    kept = np.setdiff1d(np.arange(len(gaps)), left_out)
    kept = np.concatenate([[index], kept[kept != index]])
    return kept, float(np.sum(bound[left_out]))


def _dipole_cap_holds(model: LocalModel, own_jacobian, moment, radius, axes, half_angles, rest_second, threshold):
    """The cap bound of the module docstring, with the magnet's own dipole taken exactly.

    ``own_jacobian`` (n, 3, 3): the own point dipole's at the cap centres; ``moment`` (3,)
    [A m^2]; ``rest_second`` (n,) [T/m^2]: a bound on ||D^2 V|| over each cap's ball (the
    own magnet minus its dipole, and the other bodies). Returns (n,) bool.
    """
    n = axes
    chord = 2 * np.sin(half_angles / 2)
    rho = radius * chord
    cosine, sine = np.cos(half_angles), np.sin(half_angles)
    scale = 3 * K / radius**3
    rest_jacobian = model.jacobian - own_jacobian
    along_moment = n @ moment
    a = (scale * (n[:, :, None] * moment[None, None, :] + along_moment[:, None, None] * np.eye(3))
         + radius * np.swapaxes(rest_jacobian, 1, 2))
    p0 = model.field
    a_n = np.einsum("nij,nj->ni", a, n)
    at_p = np.einsum("nji,nj->ni", a, p0)
    at_p_across = at_p - np.sum(at_p * n, axis=1)[:, None] * n
    # an orthonormal pair across n, and the norm of A on that plane (largest eigenvalue of
    # the 2 x 2 Gram matrix)
    helper = np.where(np.abs(n[:, :1]) < 0.9, np.array([[1.0, 0.0, 0.0]]), np.array([[0.0, 1.0, 0.0]]))
    e1 = np.cross(n, helper)
    e1 /= np.linalg.norm(e1, axis=1)[:, None]
    e2 = np.cross(n, e1)
    a1, a2 = np.einsum("nij,nj->ni", a, e1), np.einsum("nij,nj->ni", a, e2)
    g11, g22, g12 = np.sum(a1 * a1, axis=1), np.sum(a2 * a2, axis=1), np.sum(a1 * a2, axis=1)
    across_norm = np.sqrt(0.5 * (g11 + g22) + np.sqrt(0.25 * (g11 - g22)**2 + g12**2))
    linear = (1 - cosine) * np.abs(np.sum(p0 * a_n, axis=1)) + sine * np.linalg.norm(at_p_across, axis=1)
    step = (1 - cosine) * np.linalg.norm(a_n, axis=1) + sine * across_norm
    with np.errstate(invalid="ignore", over="ignore"):
        bound = (np.sqrt(np.sum(p0 * p0, axis=1) + 2 * linear + step**2)
                 + scale * float(np.linalg.norm(moment)) * chord**2 + 0.5 * rest_second * rho**2
                 + model.error + model.jacobian_error * rho)
    return np.nan_to_num(bound, nan=np.inf) < threshold * (1 - 1e-9)


def _caps(bodies, table, cell, radius, threshold, proof_threshold, left_out):
    """Cover the sphere of ``radius`` within the cell with proven caps (bodies: the kept ones,
    the magnet first). Returns a :class:`ShellOutcome`."""
    centre, moment = cell.centre, table.vectors[0]
    own = table.subset([0])
    triangles = icosahedron_triangles(FIRST_CAP_LEVEL)
    for level in range(FIRST_CAP_LEVEL, LAST_CAP_LEVEL + 1):
        axes, half_angles = cone_of_triangle(triangles)
        points = centre + radius * axes
        excess = cell.excess(points)
        chord = 2 * radius * np.sin(half_angles / 2)
        inside = excess - chord <= 0  # caps wholly in another cell have nothing to prove
        triangles, axes, half_angles, points = triangles[inside], axes[inside], half_angles[inside], points[inside]
        excess, chord = excess[inside], chord[inside]
        if not len(points):
            return ShellOutcome(True, np.empty((0, 3)), np.empty((0, 3)))
        model = local_model(bodies, points, MODEL_SHARE * threshold, table)
        size, gradient, gradient_error, slope = gradient_parts(model)
        witness = (size - model.error - left_out >= threshold) & (excess <= 0)
        if witness.any():
            return ShellOutcome(False, points[witness], np.empty((0, 3)))
        # a centre in the cell that no smaller cap can prove (the proof needs the kept
        # bodies' field below proof_threshold there)
        hopeless = (size - model.error >= proof_threshold) & (excess <= 0)
        if hopeless.any():
            return ShellOutcome(False, np.empty((0, 3)), points[hopeless])
        first_each, second_each = derivative_bounds(model.geometry, chord, (1, 2), per_body=True)
        _, own_jacobian = _dipole_field_and_jacobian([bodies[0]], points, np.ones((len(points), 1), bool), own)
        rest_second = (np.sum(second_each[:, 1:], axis=1)
                       + dipole_remainder(own, (radius - chord)[:, None], 2)[:, 0])
        holds = _dipole_cap_holds(model, own_jacobian, moment, radius, axes, half_angles, rest_second,
                                  proof_threshold)
        if not holds.all():
            rest = ~holds
            along, across = axis_parts(gradient[rest], gradient_error[rest], axes[rest])
            bulge = radius * (1 - np.cos(half_angles[rest]))
            holds[rest] = taylor_holds(size[rest] + model.error[rest], along, across, slope[rest],
                                       np.sum(first_each[rest], axis=1), np.sum(second_each[rest], axis=1),
                                       bulge, radius * np.sin(half_angles[rest]), proof_threshold)
        if holds.all():
            return ShellOutcome(True, np.empty((0, 3)), np.empty((0, 3)))
        if level < LAST_CAP_LEVEL:
            triangles = subdivide(triangles[~holds])
    return ShellOutcome(False, np.empty((0, 3)), points[~holds])


def _face_cells(cell, radius, outer):
    """The first polar cells of every face between ``radius`` and ``outer`` [m].

    Returns per cell: face row (into cell.normals), s1, s2 [m] (distances from the foot of c
    on the plane) and phi1, phi2 [rad].
    """
    rows, inner_s, outer_s, first, last = [], [], [], [], []
    for row, gap in enumerate(cell.gaps):
        half = 0.5 * gap
        low = max(radius, half)
        if low >= outer:
            continue
        rings = max(int(np.ceil(np.log(outer / low) / np.log(FACE_RING_RATIO))), 1)
        distances = low * (outer / low) ** np.linspace(0.0, 1.0, rings + 1)
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


def _faces(bodies, table, cell, radius, outer, threshold, proof_threshold, left_out):
    """Cover the cell's faces between ``radius`` and ``outer`` with proven flat patches."""
    cells = _face_cells(cell, radius, outer)
    if cells is None:
        return ShellOutcome(True, np.empty((0, 3)), np.empty((0, 3)))
    rows, s1, s2, phi1, phi2 = cells
    normals = cell.normals
    helper = np.where(np.abs(normals[:, :1]) < 0.9, np.array([[1.0, 0.0, 0.0]]), np.array([[0.0, 1.0, 0.0]]))
    e1 = np.cross(normals, helper)
    e1 /= np.linalg.norm(e1, axis=1)[:, None]
    e2 = np.cross(normals, e1)
    feet = cell.centre + 0.5 * cell.gaps[:, None] * normals
    for split in range(FACE_SPLITS + 1):
        s_mid, phi_mid = 0.5 * (s1 + s2), 0.5 * (phi1 + phi2)
        points = (feet[rows] + s_mid[:, None] * (np.cos(phi_mid)[:, None] * e1[rows]
                                                  + np.sin(phi_mid)[:, None] * e2[rows]))
        # every point (s, phi) of the cell is within this of its centre point
        reach = 0.5 * (s2 - s1) + 2 * s2 * np.sin(0.25 * (phi2 - phi1))
        excess = cell.excess(points)
        inside = excess - reach <= 0
        rows, s1, s2, phi1, phi2 = rows[inside], s1[inside], s2[inside], phi1[inside], phi2[inside]
        points, reach, excess = points[inside], reach[inside], excess[inside]
        if not len(points):
            break
        model = local_model(bodies, points, MODEL_SHARE * threshold, table)
        size = np.sqrt(np.sum(model.field**2, axis=1))
        # the centre is on the plane of its own face; any other plane it crosses is outside
        witness = (size - model.error - left_out >= threshold) & (excess <= 1e-12 * cell.gaps[rows])
        if witness.any():
            return ShellOutcome(False, points[witness], np.empty((0, 3)))
        hopeless = (size - model.error >= proof_threshold) & (excess <= 1e-12 * cell.gaps[rows])
        if hopeless.any():
            return ShellOutcome(False, np.empty((0, 3)), points[hopeless])
        holds = patch_below(model, normals[rows], np.zeros(len(points)), reach, proof_threshold)
        if holds.all():
            break
        if split == FACE_SPLITS:
            return ShellOutcome(False, np.empty((0, 3)), points[~holds])
        keep = ~holds
        rows, s1, s2, phi1, phi2 = rows[keep], s1[keep], s2[keep], phi1[keep], phi2[keep]
        s_mid, phi_mid = 0.5 * (s1 + s2), 0.5 * (phi1 + phi2)
        rows = np.tile(rows, 4)
        s1, s2 = np.concatenate([s1, s_mid, s1, s_mid]), np.concatenate([s_mid, s2, s_mid, s2])
        phi1, phi2 = np.concatenate([phi1, phi1, phi_mid, phi_mid]), np.concatenate([phi_mid, phi_mid, phi2, phi2])
    return ShellOutcome(True, np.empty((0, 3)), np.empty((0, 3)))


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
    method and its bounds: the module docstring.
    """
    table = BodyTable(bodies) if table is None else table
    kept, left_out = _kept_bodies(table, index, radius, IGNORED_SHARE * threshold)
    part = table.subset(kept)
    members = [bodies[i] for i in kept]
    cell = _Cell(table, index)
    proof_threshold = threshold - left_out
    outcome = _caps(members, part, cell, radius, threshold, proof_threshold, left_out)
    if not outcome.proven:
        return outcome
    return _faces(members, part, cell, radius, outer, threshold, proof_threshold, left_out)
