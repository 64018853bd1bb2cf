"""Proven bounds on the field of uniformly magnetized bodies, used to certify safety lines.

Notation: k = mu0 / 4 pi; for body i, m_i = |moment| [A m^2], c_i its centre, a_i its
bounding radius, s_i^2 the mean of |y - c_i|^2 over its volume, d_i = |x - c_i| and D_i the
distance from x to the body itself.

Outside a body, B(x) = k * integral over V of grad grad (1/|x - y|) . M dV. The n-th
directional derivative of 1/r along a unit vector is n! P_n(cos g) / r^(n+1) (generating
function of the Legendre polynomials, |P_n| <= 1), and for a symmetric multilinear form the
norm equals the largest value on equal unit vectors (Banach 1938). Hence, for d_i > a_i:

* |B_i(x)| <= 2 k m_i / (d_i - a_i)^3;
* ||grad B_i(x)|| <= 6 k m_i / (d_i - a_i)^4;
* |B_i(x) - B_dipole,i(x)| <= 12 k m_i s_i^2 / (d_i - a_i)^5 (second-order Taylor remainder;
  the first-order term vanishes because every shape here is symmetric about its centre);
  zero for a sphere, whose outside field is exactly a dipole's.

Near a body the surface-charge picture gives a bound that only grows like 1/D: with surface
charge sigma = J . n / mu0, ||grad B|| <= (1/2 pi) integral |J . n| dA / r^3, and for a flat face
integral dA / r^3 <= 2 pi / D, for a cylindrical face of radius R it is <= 4 pi R / D^2, so

* ||grad B_i(x)|| <= A_i / D_i + C_i / D_i^2,  A_i = sum over flat faces of |J . n|,
  C_i = 2 R |J_radial| per curved face.

For cylinders and rings, whose exterior multipole moments are known in closed form, the
same Legendre argument applied term by term to the series of their potential gives, for
d_i >= a_i / 0.85,

* ||D^n B_i(x)|| <= (n+2)! k m_i S_n(a_i / d_i) / d_i^(n+3), S_n(q) = sum over even l of
  (|c_l| / (c_0 a^l)) C(n+2+l, l) q^l (:func:`planner.physics.fields.multipole.derivative_bound_factors`),

which near the body is far below the form in d - a: at d = 1.25 a, S_2 is about 3 where
(d / (d - a))^5 is 3125; beside a disc the first-derivative bound comes to about 3.5 times
the true slope instead of about 20 (tests). Blocks have the same form with |c_l| replaced
by the mean of |y - c|^l over the volume times c_0, and for l = 2 by the traceless second
moments (:func:`planner.physics.fields.multipole.block_bound_factors`): their field beyond
the dipole is then bounded about 30 times tighter at d = 2.5 a than by the remainder in
d - a below. The smallest of the forms is used.

References
----------
J. D. Jackson, Classical Electrodynamics, 3rd ed., Wiley (1999): eq. 3.70 (Legendre generating
function), eq. 5.56 (dipole field), section 5.9 (magnetic surface charge).
S. Banach, Studia Math. 7, 36-44 (1938) (norm of symmetric multilinear forms).
"""
from __future__ import annotations

from math import factorial, pi

import numpy as np

from planner.physics.bodies import distance_to_body
from planner.physics.constants import mu_0

K = mu_0 / (4 * np.pi)
# b_n of the curved-face term of the near-field derivative bounds (see derivative_bounds)
_CURVED = {0: 0.0, 1: 2.0, 2: pi / 2, 3: 4.0 / 3.0}


def exact_body_field(body, points):
    """Exact field of one body at points (n, 3) [T]; the fields module, imported late."""
    from planner.physics.fields import field_of_body

    return np.asarray(field_of_body(body, points), dtype=float).reshape(-1, 3)


class BodyTable:
    """Per-body constants gathered once for a list of bodies (arrays over bodies).

    ``vectors`` moments (b, 3) [A m^2], ``moments`` their sizes, ``centres`` (b, 3) [m],
    ``reach`` bounding radii a [m], ``square`` mean square radii s^2 [m^2], ``shift`` the
    a used in the far-field bounds (0 for spheres, whose outside field is a dipole's),
    ``flat`` and ``curved`` the coefficients A [T] and C [T m] of the near-field bound,
    ``series`` the multipole-series factors of the cylinders, rings and blocks (:class:`SeriesFactors`).
    Building it once per keep-out search rather than per batch of points saves reading
    each body's properties thousands of times; the numbers are the same.
    """

    def __init__(self, bodies):
        self.bodies = list(bodies)
        self.vectors = np.array([b.moment for b in self.bodies], dtype=float).reshape(-1, 3)
        self.moments = np.linalg.norm(self.vectors, axis=1)
        self.centres = np.array([b.center for b in self.bodies], dtype=float).reshape(-1, 3)
        self.reach = np.array([b.bounding_radius for b in self.bodies], dtype=float)
        self.square = np.array([_mean_square_radius(b) for b in self.bodies], dtype=float)
        self.shift = np.where([b.shape == "sphere" for b in self.bodies], 0.0, self.reach)
        coefficients = np.array([_surface_coefficients(b) for b in self.bodies], dtype=float).reshape(-1, 2)
        self.flat, self.curved = coefficients.T
        self.series = SeriesFactors(self.bodies)

    def centre_distances(self, points):
        """|x - c_i| (n, b) [m]."""
        # coordinate by coordinate on (n, b) arrays: about three times faster than an
        # einsum over the (n, b, 3) offsets, which is called for every batch of points
        square = points[:, 0:1] - self.centres[:, 0]
        square *= square
        for axis in (1, 2):
            along = points[:, axis:axis + 1] - self.centres[:, axis]
            along *= along
            square += along
        return np.sqrt(square, out=square)

    def subset(self, indices):
        """The table of the bodies ``indices`` (in that order), sharing this one's series tables."""
        indices = np.asarray(indices, dtype=np.intp)
        part = object.__new__(BodyTable)
        part.bodies = [self.bodies[i] for i in indices]
        for name in ("vectors", "moments", "centres", "reach", "square", "shift", "flat", "curved"):
            setattr(part, name, getattr(self, name)[indices])
        part.series = self.series.subset(indices)
        return part


class SeriesFactors:
    """Multipole-series factors of the derivative bounds, for the cylinders, rings and blocks of a list.

    ``row`` (b,) [-]: each body's row in ``table`` as a float, -1 for spheres (whose outside
    field is exactly a dipole's); ``table`` (rows, orders 0-3, cells + 1): S_n on the grid of
    :func:`planner.physics.fields.multipole.derivative_bound_factors` (and
    :func:`~planner.physics.fields.multipole.block_bound_factors`).
    """

    def __init__(self, bodies):
        from planner.physics.fields.multipole import (FACTOR_CELLS, FACTOR_MAX_RATIO, block_bound_factors,
                                                      derivative_bound_factors)

        self.max_ratio, self.cells = FACTOR_MAX_RATIO, FACTOR_CELLS
        rows, tables = [], []
        for body in bodies:
            if body.shape in ("cylinder", "ring"):
                bore = body.inner_diameter / 2 if body.shape == "ring" else 0.0
                tables.append(derivative_bound_factors(body.diameter / 2, bore, body.height / 2,
                                                       max_ratio=self.max_ratio, cells=self.cells))
            elif body.shape == "block":
                tables.append(block_bound_factors(tuple(float(x) for x in body.size), max_ratio=self.max_ratio,
                                                  cells=self.cells))
            else:
                rows.append(-1)
                continue
            rows.append(len(tables) - 1)
        self.row = np.array(rows, dtype=float)
        self._own_rows_usable = None
        self.scale = self.cells / self.max_ratio
        # per order, all bodies' rows end to end, then one sentinel row of inf
        table = np.array(tables).reshape(len(tables), 4, self.cells + 1)
        self.flat = [np.concatenate([table[:, order].ravel(), np.full(self.cells + 1, np.inf)])
                     for order in range(4)]
        self.sentinel = len(tables) * (self.cells + 1)

    def subset(self, indices):
        """The factors of the bodies ``indices`` (their rows; the tables are shared, not copied)."""
        part = object.__new__(SeriesFactors)
        part.__dict__.update(self.__dict__)
        part.row = self.row[np.asarray(indices, dtype=np.intp)]
        part._own_rows_usable = None
        return part

    def usable(self, rows):
        """Whether any of these bodies (rows, as gathered per point) has a series."""
        if rows is self.row:  # this table's own bodies, asked for every batch: kept once known
            if self._own_rows_usable is None:
                self._own_rows_usable = self.sentinel > 0 and bool(np.any(rows >= 0))
            return self._own_rows_usable
        return self.sentinel > 0 and bool(np.any(rows >= 0))

    def index(self, rows, ratio):
        """Flat indices into ``flat[n]`` for bodies ``rows`` seen at R / r = ``ratio``.

        The grid node at or above the ratio (S_n grows with it); the sentinel (inf) where
        the body has no series or the ratio exceeds ``max_ratio`` (NaN and inf included).
        """
        with np.errstate(invalid="ignore"):
            position = ratio * self.scale
            fits = (rows >= 0) & (position <= self.cells)
            node = rows * (self.cells + 1) + np.ceil(position)
        node[~fits] = self.sentinel
        return node.astype(np.intp)


def body_table(bodies, table=None):
    """``table`` if given (built for these bodies), else the bodies' :class:`BodyTable`.

    The last one built is kept for the next call with the same bodies: a keep-out search, a
    worker's rounds over several magnets and a map all ask for it many times, and the bodies
    may arrive as new objects (from a worker's queue), so they are recognised by their values.
    """
    global _LAST_TABLE
    if table is not None:
        return table
    key = tuple((body.shape, body.diameter, body.height, body.inner_diameter,
                 *np.concatenate([np.ravel(body.center), np.ravel(body.rotation), np.ravel(body.polarization),
                                  np.ravel(body.size)]).tolist()) for body in bodies)
    last = _LAST_TABLE
    if last is not None and last[0] == key:
        return last[1]
    table = BodyTable(bodies)
    _LAST_TABLE = (key, table)  # one set of bodies at a time; replaced whole, so safe across threads
    return table


_LAST_TABLE = None


def _mean_square_radius(body):
    """s^2, the mean of |y - c|^2 over the volume [m^2]: the trace of the fields module's second
    moments over the volume; 0 for a sphere, whose outside field is exactly its dipole's."""
    if body.shape == "sphere":
        return 0.0
    from planner.physics.fields import second_moments

    return float(np.trace(second_moments(body)) / body.volume)


def _surface_coefficients(body):
    """(A, C) of the near-field gradient bound A / D + C / D^2 [T], [T m]."""
    if body.shape == "sphere":
        return np.inf, np.inf  # the exact dipole bound is used instead
    along = body.polarization_body
    if body.shape == "block":
        return 2 * float(np.sum(np.abs(along))), 0.0
    axial, radial = abs(along[2]), float(np.hypot(along[0], along[1]))
    radii = body.diameter / 2 + (body.inner_diameter / 2 if body.shape == "ring" else 0.0)
    return 2 * axial, 2 * radial * radii


def dipole_assignment(bodies, points, allowed_error, table=None, distance=None, with_gradient=True):
    """Which bodies may be taken as point dipoles at each point, and what that costs.

    Returns ``far`` (n, b) bool, the summed field error bound (n,) [T] and the summed
    gradient error bound (n,) [T/m] of the dipole stand-ins (:func:`dipole_remainders`, orders
    0, 1; ``with_gradient=False`` leaves the gradient out and returns None in its place,
    for callers that need the field only). At each point the bodies with the smallest
    remainders are dipoles as long as their summed field error stays within
    ``allowed_error`` [T] (one value or one per point (n,)). ``table`` (a :class:`BodyTable`
    of ``bodies``) and ``distance`` (the centre distances (n, b)) may be passed to save work.
    """
    table = body_table(bodies, table)
    if distance is None:
        distance = table.centre_distances(points)
    if with_gradient:
        remainder, gradient_remainder = dipole_remainders(table, distance, (0, 1))
    else:
        (remainder,), gradient_remainder = dipole_remainders(table, distance, (0,)), None
    with np.errstate(invalid="ignore"):
        # Spend the allowance greedily, smallest remainders first: a body is a dipole while
        # the running sum of the remainders stays within allowed_error (any choice is sound,
        # as the sum is the error bound returned; this one leaves the fewest bodies to
        # evaluate exactly, about half as many as an equal share per body).
        # A body whose remainder alone exceeds the allowance is never chosen; where the
        # others' remainders together fit, every one of them is (the same choice, without
        # sorting: beside a magnet, the magnet itself is often the only exact body).
        allowed = np.broadcast_to(np.asarray(allowed_error, dtype=float), (len(remainder),))
        far = remainder <= allowed[:, None]
        rows = np.flatnonzero(~(np.sum(np.where(far, remainder, 0.0), axis=1) <= allowed))
        if len(rows):
            some = remainder[rows]
            order = np.argsort(some, axis=1, kind="stable")
            running = np.cumsum(np.take_along_axis(some, order, axis=1), axis=1)
            chosen = np.empty(some.shape, dtype=bool)
            np.put_along_axis(chosen, order, running <= allowed[rows, None], axis=1)
            far[rows] = chosen
        error = np.sum(np.where(far, remainder, 0.0), axis=1)
        gradient_error = None if gradient_remainder is None else np.sum(np.where(far, gradient_remainder, 0.0), axis=1)
    return far, error, gradient_error


def dipole_remainder(table, distance, order):
    """Bound on ||D^order (B - B_dipole)|| [T/m^order] of each body at ``distance`` (..., b) [m].

    Notes
    -----
    The Taylor remainder of the multipole expansion, (order + 4)!/2 k m s^2 / (d - a)^(order + 5)
    (12 and 60 for the field and its gradient; a = 0 for a sphere, whose s^2 is 0), and for
    cylinders, rings and blocks the smaller sum of the series' terms of degree 2 and up,
    (order + 2)! k m (S_order - 1) / d^(order + 3) (the dipole is the l = 0 term; often 100x
    smaller); see the module docstring. Both fall as d grows, so a bound at the smallest
    distance of a region holds over all of it; +inf within a body's bounding sphere.
    """
    return dipole_remainders(table, distance, (order,))[0]


def dipole_remainders(table, distance, orders):
    """:func:`dipole_remainder` for each of ``orders``, sharing the distances' powers and the
    series look-up between them."""
    moments, reach, square, shift = table.moments, table.reach, table.square, table.shift
    series = table.series
    results = []
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        outside = distance > reach * (1 + 1e-9)
        inverse_gap = np.where(outside, 1.0 / (distance - shift), np.nan)  # divisions inside dropped
        inverse = 1.0 / distance
        with_series = series.usable(series.row)
        if with_series:
            index = series.index(series.row, reach * inverse)
        for order in orders:
            bound = factorial(order + 4) / 2 * K * moments * square * _power(inverse_gap, order + 5)
            if with_series:
                bound = np.fmin(bound, factorial(order + 2) * K * moments
                                * (np.take(series.flat[order], index) - 1.0) * _power(inverse, order + 3))
            results.append(np.where(np.isnan(bound), np.inf, bound))
    return results


def _power(base, exponent):
    """base ** exponent for a small positive integer exponent, by repeated squaring (np.power on
    floats is several times slower)."""
    result, square = None, base
    while exponent:
        if exponent & 1:
            result = square if result is None else result * square
        exponent >>= 1
        if exponent:
            square = square * square
    return result


def cell_field_bounds(table, index, radius, on_sphere=False):
    """Bound [T] on each body's field in the cell of body ``index`` beyond ``radius`` (..., b).

    Every point of the cell at least ``radius`` [m] (scalar or (...,)) from its centre c is at
    least that far from every other centre too (none is nearer), and at least half the gap
    from each; with ``on_sphere``, for points at exactly that radius, also at least
    |gap - radius| from each (triangle inequality). At the smallest such distance e each
    body's field is at most its dipole's largest, 2 k m / e^3 (Jackson eq. 5.56), plus the
    dipole remainder (:func:`dipole_remainder`), both falling with distance. The body
    ``index`` itself is included (at e = radius).
    """
    gaps = np.linalg.norm(table.centres - table.centres[index], axis=1)
    radius = np.asarray(radius, dtype=float)[..., None]
    distance = np.maximum(radius, np.abs(gaps - radius) if on_sphere else 0.5 * gaps)
    return 2 * K * table.moments / distance**3 + dipole_remainder(table, distance, 0)


def dipole_sums(offset, inverse, moments, with_jacobian=True):
    """Field (n, 3) [T] and Jacobian (n, 3, 3) [T/m], [j, l] = dB_l/dx_j, summed over point dipoles.

    ``moments`` (b, 3) [A m^2] seen at ``offset`` (n, b, 3) [m] from each, with the reciprocal
    distances ``inverse`` (n, b) [1/m] (0 leaves a pair out). B = k (3 (m.u) u - m) / r^3 and
    dB_l/dx_j = 3 k / r^4 [(m.u)(delta_jl - 5 u_j u_l) + m_j u_l + m_l u_j] (Jackson eq. 5.56
    and its derivative). ``with_jacobian=False`` returns the field alone.
    """
    unit = offset * inverse[..., None]
    along = np.einsum("nbk,bk->nb", unit, moments)
    weight = K * inverse**3
    # sum_b w (3 (m.u) u - m), without the (n, b, 3) term
    field = 3 * np.matmul((weight * along)[:, None, :], unit)[:, 0] - weight @ moments
    if not with_jacobian:
        return field
    scaled = 3 * weight * inverse
    along_scaled = scaled * along
    outer = np.matmul(np.swapaxes(along_scaled[..., None] * unit, 1, 2), unit)  # sum_b c (m.u) u_j u_l
    mixed = np.matmul(np.swapaxes(scaled[..., None] * moments[None], 1, 2), unit)  # sum_b c m_j u_l
    jacobian = (np.sum(along_scaled, axis=1)[:, None, None] * np.eye(3) - 5 * outer
                + mixed + np.swapaxes(mixed, 1, 2))
    return field, jacobian


def model_field(bodies, points, far, table=None, distance=None):
    """B (n, 3) [T]: point dipoles for the (point, body) pairs in ``far``, exact otherwise.

    ``distance``: the points' distances from the bodies' centres (n, b) [m], if the caller
    has them."""
    table = body_table(bodies, table)
    total = np.empty_like(points)
    # the far dipoles in blocks of points whose (points, bodies, 3) arrays stay in the cache
    rows = max(_DENSE_PAIRS // max(len(bodies), 1), 1)
    for start in range(0, len(points), rows):
        span = slice(start, start + rows)
        total[span] = far_dipoles(points[span], far[span], table, None if distance is None else distance[span])
    for i in np.flatnonzero(~far.all(axis=0)):  # the bodies exact somewhere
        near = ~far[:, i]
        if near.all():
            total += exact_body_field(bodies[i], points)
        else:
            total[near] += exact_body_field(bodies[i], points[near])
    return total


# The far dipoles are summed over blocks of about this many (point, body) pairs, each in one
# set of (n, b, 3) arrays that stays in the processor cache (about 0.3 MB): against summing
# body by body over all points, 2.5 to 5 times faster for the 50-800 points of the keep-out
# searches among 30 magnets and 1.8 times for the 160 000 points of a 400 x 400 map (the sums
# alone; the whole map 5-10 % faster, benchmarks/zones.py).
_DENSE_PAIRS = 12000


def far_dipoles(points, far, table, distance=None, with_jacobian=False):
    """Summed point-dipole field (n, 3) [T] of the (point, body) pairs in ``far`` (n, b), and with
    ``with_jacobian`` their Jacobian (n, 3, 3) [T/m] (:func:`dipole_sums`), in one set of
    (n, b, 3) arrays. ``distance``: the centre distances (n, b) [m], if the caller has them."""
    offset = points[:, None, :] - table.centres[None]
    if distance is None:
        distance = np.sqrt(np.sum(offset**2, axis=2))
    inverse = np.where(far, 1.0 / np.where(far, distance, 1.0), 0.0)  # 0 for the pairs left out
    return dipole_sums(offset, inverse, table.vectors, with_jacobian)


def field_with_error(bodies, points, allowed_error, table=None, distance=None):
    """Total |B| at points with a proven bound on its error.

    Parameters
    ----------
    bodies : list of MagnetBody
    points : array (n, 3)
        [m].
    allowed_error : float or array (n,)
        Largest error [T] the caller accepts (one value, or one per point); at each point
        the bodies with the smallest dipole errors are taken as dipoles while their sum
        stays within it (:func:`dipole_assignment`).
    table : BodyTable, optional
        Constants of ``bodies`` built beforehand (same result, less work).
    distance : array (n, b), optional
        The points' distances from the bodies' centres [m], if the caller has them.

    Returns
    -------
    magnitude, error : arrays (n,)
        |B| [T] of the model used and a bound on |true |B| - magnitude| [T]. Non-finite
        values (points on a body's edge) come back as +inf.
    """
    vector, error = field_vector_with_error(bodies, points, allowed_error, table, distance)
    magnitude = np.linalg.norm(vector, axis=1)
    magnitude[~np.isfinite(magnitude)] = np.inf
    return magnitude, error


def field_vector_with_error(bodies, points, allowed_error, table=None, distance=None):
    """B (n, 3) [T] of the model of :func:`field_with_error` and the bound (n,) [T] on |B| error.

    The same model (exact near each body, dipoles where their remainder fits the allowed
    error); for callers that need the vector, such as the map's interpolation guard.
    """
    points = np.asarray(points, dtype=float).reshape(-1, 3)
    table = body_table(bodies, table)
    far, error, _ = dipole_assignment(bodies, points, allowed_error, table, distance, with_gradient=False)
    return model_field(bodies, points, far, table, distance), error


def _ball_geometry(bodies, points, table=None, centre_distance=None):
    """Per point and body: centre distance d, distance D to the solid, and body constants.

    D is computed exactly only for bodies that some point sees within ten bounding radii
    of their centre; for the others its lower bound d - a is used (the body lies inside
    its bounding sphere), which can only make the bounds built on it larger, by at most
    a factor (d / (d - a))^(n+1) <= 1.12^(n+1) in far terms that are themselves small.
    """
    table = body_table(bodies, table)
    if centre_distance is None:
        centre_distance = table.centre_distances(points)
    solid_distance = np.maximum(centre_distance - table.reach, 0.0)
    near = np.any(centre_distance < 10 * table.reach, axis=0)
    for i in np.flatnonzero(near):
        solid_distance[:, i] = distance_to_body(table.bodies[i], points)
    return (centre_distance, solid_distance, table.moments, table.reach, table.shift, table.flat,
            table.curved, table.series.row, table.series)


def derivative_bounds(geometry, spread, orders, per_body=False, series_form=True):
    """Bounds on ||D^n B|| [T/m^n] for each n in ``orders`` over balls of radius ``spread`` [m].

    ``spread`` is (n,) or (n, m) (m candidate radii per point); each result has its shape.
    The orders share the distances and their reciprocals, which are computed once, and
    the powers are products of them. ``per_body``: the bound of each body (last axis)
    instead of their sum. The forms and their derivation: the module docstring of
    :mod:`planner.physics.zones.certify`, which uses them most, and this module's (the
    multipole-series form of cylinders, rings and blocks, taken where the ball keeps R / r <= 0.85).
    ``series_form=False`` leaves the series form out: for bounds at a point that a caller
    grows to a ball by the factor (1 - rho / D)^-(n+3), which holds for the volume and
    surface forms but not for the series form (its factor S_n also grows with R / r).
    """
    centre_distance, solid_distance, moments, reach, shift, flat, curved, series_row, series = geometry
    spread = np.asarray(spread, dtype=float)
    if spread.ndim == 2:  # per-point columns (n, k) gain the candidate axis
        centre_distance, solid_distance, moments, reach, shift, flat, curved, series_row = (
            a[:, None, :] if np.ndim(a) == 2 else a
            for a in (centre_distance, solid_distance, moments, reach, shift, flat, curved, series_row))
    # Far form: distance e - rho with e = max(d - a, D), or d for a sphere (shift 0).
    reach_out = np.maximum(centre_distance - shift, solid_distance) - spread[..., None]
    gap = solid_distance - spread[..., None]
    far_ok = near_ok = gap > 0  # the whole ball outside the body
    # Series form for cylinders, rings and blocks whose bounding sphere the ball clears by a ratio
    # R / r <= max_ratio: (n+2)! k m S_n(R/r) / r^(n+3), r = d - rho.
    use_series = series_form and series.usable(series_row)
    if use_series:
        # flat index into each order's table: the sentinel row (all inf) where the ball
        # is too close to the body or the body has no series
        with np.errstate(divide="ignore", invalid="ignore"):
            inverse_nearest = np.maximum(1.0 / (centre_distance - spread[..., None]), 0.0)
            index = series.index(series_row, np.where(inverse_nearest > 0, reach * inverse_nearest, np.inf))
        powers_series = {3: inverse_nearest**2 * inverse_nearest}
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        inverse_far = np.where(far_ok, 1.0 / np.where(far_ok, reach_out, 1.0), 0.0)
        inverse_gap = np.where(near_ok, 1.0 / np.where(near_ok, gap, 1.0), 0.0)
        powers_far = {3: inverse_far**2 * inverse_far}
        powers_gap = {1: inverse_gap, 2: inverse_gap * inverse_gap}
        results = []
        for order in orders:
            while order + 3 not in powers_far:
                top = max(powers_far)
                powers_far[top + 1] = powers_far[top] * inverse_far
            while order + 1 not in powers_gap:
                top = max(powers_gap)
                powers_gap[top + 1] = powers_gap[top] * inverse_gap
            far = np.where(far_ok, factorial(order + 2) * K * moments * powers_far[order + 3], np.inf)
            if use_series:
                while order + 3 not in powers_series:
                    top = max(powers_series)
                    powers_series[top + 1] = powers_series[top] * inverse_nearest
                factor = np.take(series.flat[order], index)  # inf where no series applies
                # fmin skips the NaN of inf * 0 (padding columns with no body, balls over
                # a centre); every other product is a non-negative bound
                far = np.fmin(far, factorial(order + 2) * K * moments * factor * powers_series[order + 3])
            if order == 0:
                bound = far
            else:
                near = (factorial(order + 1) / (2 * order) * flat * powers_gap[order]
                        + factorial(order + 1) * _CURVED[order] / 4 * curved * powers_gap[order + 1])
                bound = np.minimum(far, np.where(near_ok, near, np.inf))
            total = bound if per_body else np.sum(bound, axis=-1)
            total[np.isnan(total)] = np.inf  # only from non-finite inputs
            results.append(total)
    return results


def derivative_bound(geometry, spread, order):
    """Bound on ||D^order B|| [T/m^order] over balls of radius ``spread`` (n,) [m]."""
    return derivative_bounds(geometry, spread, (order,))[0]


def gradient_bound(bodies, points, spread, table=None):
    """Bound on ||grad B|| [T/m] of the total field over balls of radius ``spread`` (n,) [m].

    :func:`derivative_bound` of order 1 on the points' geometry; infinite where a ball
    touches a body (no bound is claimed there). ``table``: the bodies' :class:`BodyTable`,
    if the caller has it (same result, less work).
    """
    points = np.asarray(points, dtype=float).reshape(-1, 3)
    spread = np.broadcast_to(np.asarray(spread, dtype=float), (len(points),))
    return derivative_bound(_ball_geometry(bodies, points, table), spread, 1)
