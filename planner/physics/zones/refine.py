"""Plane grid of the upper value |B| + error, evaluated only where a contour line can pass.

A map is contoured at a few thresholds, so its value matters only near them. The grid is
first evaluated on a coarse lattice (every ``step``-th point); each coarse cell then either
is *settled*, proven to hold no point on the far side of any threshold from its corners, and
is filled by bilinear interpolation of its corner values, or is split into cells of half
the step whose corners are evaluated, down to the grid itself.

The proof (why a settled cell cannot hide a contour). Let B be the true field, B_m the model
of :func:`~planner.physics.zones.bounds.field_with_error` (exact near each body, point dipole
far away) with |B - B_m| <= e <= a at every point (a the allowed error), and f = |B_m| + e the
value contoured, so |B| <= f <= |B| + 2a. On a cell of sides h_u x h_v let P be the bilinear
interpolant of B from its four corners c. Along any unit w, |w . (B - P)| <= (h_u^2 + h_v^2)
M2 / 8 =: E2 (the linear-interpolation remainder h^2/8 max|g''| applied along u, then along
v), M2 a bound on ||D^2 B|| over the ball holding the cell (:func:`interpolation_remainder`,
4! k m / e^5 per body from the Legendre expansion of 1/r). P(x) is a convex combination of
the B(c), each within a of B_m(c); with n the direction of the mean of the B_m(c), for every
x in the cell

    min_c n . B_m(c) - a - E2  <=  n . B(x)  <=  |B(x)|  <=  max_c |B_m(c)| + a + E2,

so f(x) lies in [L, U] = [min_c n . B_m(c) - a - E2, max_c |B_m(c)| + 3a + E2], widened by a
relative 1e-6 for the rounding of the field routines. If no threshold lies in [L, U], f is
on the same side of every threshold at every point of the cell as at its corners. The cell
is then settled: its other grid points get |P_m(x)|, P_m interpolating the B_m(c), which lies
between min n . B_m(c) and max |B_m(c)|, so in [L, U] too. A cell whose ball meets a body
(M2 infinite) or with a corner on a body's edge (not finite) is never settled.

Consequence: the grid holds the exact f at every corner of every grid cell that any
threshold line crosses, and values on the right side of every threshold everywhere else.
Marching squares draws a line only through cells whose corners straddle the level, from
those corner values alone, so the lines are the same as from evaluating f at every point.

References
----------
J. D. Jackson, Classical Electrodynamics, 3rd ed., Wiley (1999), eq. 3.70 (Legendre
generating function) and eq. 5.56 (dipole field).
M. Abramowitz, I. A. Stegun, Handbook of Mathematical Functions (1964), 25.2.4 (error of
linear interpolation, h^2/8 max|f''|).
"""
from __future__ import annotations

import numpy as np

from planner.physics.zones.bounds import (_ball_geometry, body_table, derivative_bound,
                                          field_vector_with_error)

VIEWS = {"plan": (0, 1, 2), "elevation": (0, 2, 1)}  # (across-page, up-page, normal) axes
INSIDE_VALUE = 1e3  # [T] written where the field is not finite (on a body's edge)
ROUNDING = 1e-6  # relative widening of the proven interval for the field routines' rounding


def plane_points(view, offset, u, v):
    """Points (n, 3) [m] of a plane at plane coordinates u (n,), v (n,) [m].

    Plan: (x, y, z) = (u, v, offset); elevation: (x, y, z) = (u, offset, v).

    >>> plane_points("elevation", 0.5, np.array([1.0]), np.array([2.0])).tolist()
    [[1.0, 0.5, 2.0]]
    """
    across, up, normal = VIEWS[view]
    points = np.empty((len(u), 3))
    points[:, across], points[:, up], points[:, normal] = u, v, offset
    return points


def lattice(count, step):
    """Grid indices 0, step, 2 step, ... and the last one, count - 1.

    >>> lattice(10, 4).tolist()
    [0, 4, 8, 9]
    """
    return np.unique(np.r_[np.arange(0, max(count - 1, 1), step), count - 1])


def coarsest_step(resolution, cells=8, largest=32):
    """Power-of-two step leaving at least ``cells`` coarse cells per side (at most ``largest``)."""
    step = 1
    while step * 2 <= min(largest, (resolution - 1) / cells):
        step *= 2
    return step


def interpolation_remainder(bodies, centres, width, depth, table=None):
    """Bound on |B - P| over rectangles, P the bilinear interpolant of B from the corners.

    Parameters
    ----------
    bodies : list of MagnetBody
    centres : array (n, 3)
        Rectangle centres [m].
    width, depth : arrays (n,)
        Side lengths h_u, h_v [m] (the rectangles lie in any plane).
    table : BodyTable, optional
        Constants of ``bodies`` built beforehand.

    Returns
    -------
    ndarray (n,)
        E2 [T]; +inf where the ball around a rectangle touches a body.

    Notes
    -----
    E2 = (h_u^2 + h_v^2) M2 / 8 with M2 a bound on ||D^2 B|| over the ball of radius
    rho = hypot(h_u, h_v) / 2 about the centre. Along any unit vector w, w . B - w . P =
    (g - I_u g) + I_u (g - I_v g) with g = w . B and I_u, I_v linear interpolation along u
    and v; each part is at most h^2/8 max|g''| (remainder of linear interpolation), and
    |g''| <= M2. Outside a body B is the sum of the fields of its volume elements M dV,
    each a point dipole whose second derivative is at most 4! k |M| dV / r^5 (the fourth
    derivative of 1/r along a unit vector is 4! P_4(cos g) / r^5 with |P_4| <= 1, and a
    symmetric form's norm is its largest value on equal unit vectors), so
    M2 <= sum_i 24 k m_i / (d_i - a_i - rho)^5 with d_i the centre distance and a_i the
    bounding radius (0 for a sphere, whose outside field is its centre dipole's). Valid
    where every ball stays outside every bounding sphere (a sphere: outside the body);
    +inf elsewhere. Computed by :func:`planner.physics.zones.bounds.derivative_bound` of
    order 2, which takes the surface-charge or multipole-series form instead where that is
    smaller.

    References
    ----------
    Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 25.2.4; Jackson,
    Classical Electrodynamics, 3rd ed. (1999), eq. 3.70; S. Banach, Studia Math. 7, 36-44
    (1938).

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> e2 = interpolation_remainder([ball], np.array([[0.1, 0, 0], [0, 0, 0]]), np.full(2, 0.01), np.full(2, 0.01))
    >>> bool(0 < e2[0] < 1e-5), bool(np.isinf(e2[1]))
    (True, True)
    """
    centres = np.asarray(centres, dtype=float).reshape(-1, 3)
    width, depth = np.asarray(width, dtype=float), np.asarray(depth, dtype=float)
    table = body_table(bodies, table)
    spread = 0.5 * np.hypot(width, depth)
    # The shared bound on ||D^2 B|| (its volume form is the sum above; the surface and series
    # forms can only lower it).
    geometry = _ball_geometry(bodies, centres, table)
    return (width**2 + depth**2) / 8 * derivative_bound(geometry, spread, 2)


def _bilinear(corners, s, t):
    """Bilinear blend of corner values (4, n, ...) ordered (v0 u0, v0 u1, v1 u0, v1 u1); s, t (n,)."""
    shape = s.shape + (1,) * (corners.ndim - 2)
    s, t = s.reshape(shape), t.reshape(shape)
    return (1 - t) * ((1 - s) * corners[0] + s * corners[1]) + t * ((1 - s) * corners[2] + s * corners[3])


def _settled(vectors, remainder, allowed_error, thresholds):
    """True where no threshold lies in the proven range of f over a cell (module docstring).

    ``vectors`` (4, n, 3): corner model fields of each cell [T]; ``remainder`` (n,): the bound
    E2 on |B - P| over the cell [T]. NaN inputs (edges, cells touching a body) give False.
    """
    mean = vectors.sum(axis=0)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        direction = mean / np.sqrt(np.einsum("nk,nk->n", mean, mean))[:, None]
        along = np.min(np.einsum("cnk,nk->cn", vectors, direction), axis=0)
        largest = np.max(np.sqrt(np.einsum("cnk,cnk->cn", vectors, vectors)), axis=0)
        lower = (np.maximum(along, 0.0) - allowed_error - remainder) * (1 - ROUNDING)
        upper = (largest + 3 * allowed_error + remainder) * (1 + ROUNDING)
        clear = (thresholds[:, None] < lower) | (thresholds[:, None] > upper)
    return np.all(clear, axis=0)


class _PlaneGrid:
    """Values f = |B_m| + e and model fields B_m on a square plane grid, filled as they are known.

    A level is a lattice of grid indices (the same along u and v); its cell (a, b) spans rows
    nodes[a]..nodes[a + 1] and columns nodes[b]..nodes[b + 1].
    """

    def __init__(self, bodies, view, offset, u, v, allowed_error):
        self.bodies, self.view, self.offset, self.u, self.v = bodies, view, offset, u, v
        self.allowed_error = allowed_error
        self.table = body_table(bodies)
        shape = (len(v), len(u))
        self.value = np.zeros(shape)
        self.vector = np.full(shape + (3,), np.nan)
        self.exact = np.zeros(shape, bool)
        self.known = np.zeros(shape, bool)
        self.evaluated = 0

    def evaluate(self, rows, columns):
        """f at grid points (rows, columns) not evaluated yet, as ``bounds.field_with_error``."""
        new = ~self.exact[rows, columns]
        rows, columns = rows[new], columns[new]
        if not len(rows):
            return
        points = plane_points(self.view, self.offset, self.u[columns], self.v[rows])
        vector, error = field_vector_with_error(self.bodies, points, self.allowed_error, self.table)
        value = np.sqrt(np.einsum("nk,nk->n", vector, vector)) + error
        finite = np.isfinite(value)
        self.value[rows, columns] = np.where(finite, value, INSIDE_VALUE)
        self.vector[rows, columns] = np.where(finite[:, None], vector, np.nan)
        self.exact[rows, columns] = self.known[rows, columns] = True
        self.evaluated += len(rows)

    def corners(self, nodes, a, b):
        """Corner model fields (4, n, 3) of cells (a, b) of the level ``nodes``."""
        r0, r1, c0, c1 = nodes[a], nodes[a + 1], nodes[b], nodes[b + 1]
        return np.stack([self.vector[r0, c0], self.vector[r0, c1], self.vector[r1, c0], self.vector[r1, c1]])

    def fractions(self, nodes, a, b, rows, columns):
        """Positions s (along u) and t (along v) in [0, 1] of grid points within cells (a, b)."""
        u, v = self.u, self.v
        s = (u[columns] - u[nodes[b]]) / (u[nodes[b + 1]] - u[nodes[b]])
        t = (v[rows] - v[nodes[a]]) / (v[nodes[a + 1]] - v[nodes[a]])
        return s, t

    def remainder(self, nodes, a, b):
        """E2 = (h_u^2 + h_v^2) max||D^2 B|| / 8 [T] over cells (a, b) (inf if one touches a body)."""
        u, v = self.u, self.v
        centres = plane_points(self.view, self.offset, (u[nodes[b]] + u[nodes[b + 1]]) / 2,
                               (v[nodes[a]] + v[nodes[a + 1]]) / 2)
        return interpolation_remainder(self.bodies, centres, u[nodes[b + 1]] - u[nodes[b]],
                                       v[nodes[a + 1]] - v[nodes[a]], self.table)

    def fill(self, nodes, settled):
        """Give the unknown points whose cell of level ``nodes`` is ``settled`` (mask) the size
        of the bilinear interpolation of that cell's corner fields: it lies in the cell's proven
        range (between the smallest projection on the mean direction and the largest size).

        A point on the edge of several cells is assigned to one (rows and columns in
        [nodes[a], nodes[a + 1])); a settled neighbour's value would be as good.
        """
        cell = np.clip(np.searchsorted(nodes, np.arange(len(self.u)), "right") - 1, 0, len(nodes) - 2)
        rows, columns = np.nonzero(~self.known & settled[cell[:, None], cell[None, :]])
        if not len(rows):
            return
        a, b = cell[rows], cell[columns]
        s, t = self.fractions(nodes, a, b, rows, columns)
        inside = _bilinear(self.corners(nodes, a, b), s, t)
        self.value[rows, columns] = np.sqrt(np.einsum("nk,nk->n", inside, inside))
        self.known[rows, columns] = True


def refined_plane_grid(bodies, thresholds, view, offset, extent, resolution, allowed_error, step=None,
                       border_limit=None):
    """|B| upper values on a plane grid, exact wherever a threshold line can pass.

    Parameters
    ----------
    bodies : list of MagnetBody
    thresholds : array_like
        Flux densities whose lines the grid is for [T].
    view : {"plan", "elevation"}
        Plan: the plane z = offset, coordinates (x, y); elevation: y = offset, (x, z).
    offset : float
        Position of the plane along its normal [m].
    extent : (u_min, u_max, v_min, v_max)
        Plane coordinates [m].
    resolution : int
        Grid points along each side.
    allowed_error : float
        Accepted error of the far-field dipole model [T].
    step : int, optional
        Coarsest lattice step, a power of two (default :func:`coarsest_step`).
    border_limit : float, optional
        If some coarse point on the border has a value at or above it, stop early and
        return None (the caller will try a larger extent).

    Returns
    -------
    u, v, magnitude, evaluated : (resolution,), (resolution,), (resolution, resolution), int
        Plane coordinates [m], values [T] with ``magnitude[j, i]`` at (u[i], v[j]), and the
        number of points at which the field was evaluated; None if ``border_limit`` was
        reached. ``magnitude`` is the value |B| + error of ``bounds.field_with_error`` at
        every corner of every grid cell a threshold line crosses (1e3 T where the field is
        not finite, as in ``contours.plane_grid``), and elsewhere the size of the
        bilinearly interpolated model field, proven to lie on the same side of every
        threshold as that value.

    Notes
    -----
    See the module docstring for the proof that a filled cell hides no line: on a cell
    with corner model fields B_m(c), f = |B_m| + e lies within
    [min n . B_m(c) - a - E2, max |B_m(c)| + 3a + E2] (n the corners' mean direction, a the
    allowed error, E2 = (h_u^2 + h_v^2) max||D^2 B|| / 8), widened by a relative 1e-6;
    a cell whose interval holds no threshold is filled. Valid for any bodies; cells
    whose ball meets a body's bounding sphere are always refined.

    References
    ----------
    Jackson, Classical Electrodynamics, 3rd ed. (1999), eqs. 3.70, 5.56; Abramowitz & Stegun
    (1964), 25.2.4.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> u, v, grid, count = refined_plane_grid([ball], [1e-3], "plan", 0.0, (-0.1, 0.1, -0.1, 0.1), 101, 2e-6)
    >>> bool(count < 101 * 101), bool(grid[50, 0] < 1e-3 < grid[50, 50])
    (True, True)
    """
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    u = np.linspace(extent[0], extent[1], resolution)
    v = np.linspace(extent[2], extent[3], resolution)
    grid = _PlaneGrid(bodies, view, offset, u, v, allowed_error)
    step = coarsest_step(resolution) if step is None else int(step)
    if step < 1 or step & (step - 1):
        raise ValueError(f"the coarsest step must be a power of two, not {step}")  # halves must nest
    nodes = lattice(resolution, step)
    rows, columns = np.meshgrid(nodes, nodes, indexing="ij")
    grid.evaluate(rows.ravel(), columns.ravel())
    if border_limit is not None:
        values = grid.value[np.ix_(nodes, nodes)]
        if max(values[0].max(), values[-1].max(), values[:, 0].max(), values[:, -1].max()) >= border_limit:
            return None
    active = np.ones((len(nodes) - 1, len(nodes) - 1), bool)
    while step > 1:
        a, b = np.nonzero(active)
        corners = grid.corners(nodes, a, b)
        # A cell whose corners alone straddle a threshold cannot settle: its bound is not needed.
        settled = _settled(corners, np.zeros(len(a)), allowed_error, thresholds)
        remainder = np.full(len(a), np.inf)
        remainder[settled] = grid.remainder(nodes, a[settled], b[settled])
        settled &= _settled(corners, remainder, allowed_error, thresholds)
        mask = np.zeros_like(active)
        mask[a[settled], b[settled]] = True
        grid.fill(nodes, mask)
        # The halves of the open cells become the next level; their corners are evaluated.
        step //= 2
        finer = lattice(resolution, step)
        parent = np.clip(np.searchsorted(nodes, finer[:-1], "right") - 1, 0, len(nodes) - 2)
        open_cells = np.zeros_like(active)
        open_cells[a[~settled], b[~settled]] = True
        active = open_cells[parent[:, None], parent[None, :]]
        corner = np.zeros((len(finer), len(finer)), bool)
        corner[:-1, :-1] |= active
        corner[1:, :-1] |= active
        corner[:-1, 1:] |= active
        corner[1:, 1:] |= active
        corner_rows, corner_columns = np.nonzero(corner)
        grid.evaluate(finer[corner_rows], finer[corner_columns])
        nodes = finer
    if not grid.known.all():  # every point is a corner of an open cell or inside a settled one
        raise RuntimeError("refined plane grid left points without a value")
    return u, v, grid.value, grid.evaluated
