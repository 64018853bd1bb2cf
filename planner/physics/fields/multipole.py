"""Exterior multipole series of uniformly magnetized axially symmetric bodies (cylinder, ring).

Outside a body, B = (grad grad Phi) J with Phi(r) = (1/4 pi) integral dV' / |r - r'| the
Newtonian potential of its shape (see :mod:`planner.physics.fields.cylinder`). For a body
symmetric about the z axis and about its mid-plane, beyond its bounding sphere (radius R)

    Phi = sum_{l = 0, 2, 4, ...} c_l P_l(x) / r^(l+1),   x = z / r,
    c_l = (1/4 pi) integral r'^l P_l(cos theta') dV'     (zonal moments of the volume).

The field needs four second derivatives of Phi, each a series of polynomials in x times
powers of s = R / r (derived in :func:`axisymmetric_series_field`). The series converges
geometrically in s; it is cut where a proven bound on the rest falls below a relative
1e-10 of the dipole field (:func:`terms_needed`), so within its range (s <= ``MAX_RATIO``)
it serves as the exact field at a fraction of the cost of the elliptic integrals: a few
matrix products whatever the number of terms.

The same series bound the derivatives of the field (:func:`derivative_bound_factors`), and
for blocks, which have no zonal series, their degree-by-degree analogue does
(:func:`block_bound_factors`).

References
----------
J. D. Jackson, *Classical Electrodynamics*, 3rd ed., Wiley (1999), sec. 3.6 (expansion of
1/|r - r'| in Legendre polynomials) and 4.1 (multipole expansion).
M. Abramowitz and I. A. Stegun, *Handbook of Mathematical Functions*, NBS (1964), 8.5
and 22.7 (recurrences and derivatives of Legendre polynomials), 22.14.7 (|P'_n| <= n(n+1)/2
on [-1, 1], from Markov's inequality).
"""
from __future__ import annotations

import math
from functools import lru_cache

import numpy as np
from numpy.polynomial import legendre, polynomial

__all__ = ["MAX_RATIO", "zonal_moments", "cached_zonal_moments", "terms_needed",
           "axisymmetric_series_field", "derivative_bound_factors", "block_bound_factors"]

#: Largest bounding radius / distance at which the series is used (it runs to degree 28 there).
MAX_RATIO = 0.3
#: Relative size of the neglected rest, as a fraction of J V / (4 pi r^3) (the smallest
#: magnitude of the dipole field at r).
SERIES_TOLERANCE = 1e-10


def zonal_moments(radius: float, inner_radius: float, half_height: float, order: int,
                  with_rounding: bool = False):
    """Zonal moments c_0, c_2, ..., c_order of a cylinder or ring volume [m^(l+3)].

    Parameters
    ----------
    radius, inner_radius : float
        Outer and bore radii [m] (bore 0 for a solid cylinder).
    half_height : float
        Half the length [m].
    order : int
        Highest even degree l.

    with_rounding : bool
        Also return a bound on the rounding error of each moment.

    Returns
    -------
    ndarray (order // 2 + 1,)
        c_l = (1/4 pi) integral r^l P_l(cos theta) dV for l = 0, 2, ..., order.
    ndarray (order // 2 + 1,), only if ``with_rounding``
        (l + 2) eps times the sum of the terms' magnitudes: a bound on the rounding error
        of the alternating sum, which grows with l (1e-13 of c_0 at l = 40, 1e-7 at
        l = 120 for a flat disc).

    Notes
    -----
    The solid harmonic r^l P_l(cos theta) = sum_k (-1)^k l! / (4^k (k!)^2 (l-2k)!)
    z^(l-2k) rho^(2k) (Jackson 1999, sec. 3.6, from Rodrigues' formula) integrates over
    the cylinder term by term: integral z^n dz over [-h, h] = 2 h^(n+1)/(n+1) for even n,
    integral rho^(2k) 2 pi rho d rho over [0, a] = pi a^(2k+2)/(k+1). A ring is the outer
    cylinder minus its bore. Odd moments vanish by the mid-plane symmetry.

    Examples
    --------
    >>> c = zonal_moments(1.0, 0.0, 1.0, 2)
    >>> bool(np.isclose(c[0], 2 * np.pi / (4 * np.pi)))  # V / 4 pi
    True
    """
    moments, rounding = [], []
    # the integrals over z and over the cross-section, by the powers they need
    along = [2.0 * half_height ** (n + 1) / (n + 1) for n in range(order + 1)]
    across = [math.pi * (radius ** (2 * k + 2) - inner_radius ** (2 * k + 2)) / (k + 1) for k in range(order // 2 + 1)]
    for degree in range(0, order + 1, 2):
        total = magnitude = 0.0
        # l! / ((l - 2k)! k!^2), a multinomial coefficient: an exact integer at every step
        multinomial = 1
        for k in range(degree // 2 + 1):
            coefficient = (-1) ** k * (multinomial / 4**k)  # rounded once, as from the factorials
            term = coefficient * along[degree - 2 * k] * across[k]
            total += term
            magnitude += abs(term)
            multinomial = multinomial * (degree - 2 * k) * (degree - 2 * k - 1) // (k + 1) ** 2
        moments.append(total / (4.0 * math.pi))
        rounding.append((degree + 2) * np.finfo(float).eps * magnitude / (4.0 * math.pi))
    if with_rounding:
        return np.array(moments), np.array(rounding)
    return np.array(moments)


@lru_cache(maxsize=256)
def cached_zonal_moments(radius: float, inner_radius: float, half_height: float,
                         order: int) -> tuple:
    """:func:`zonal_moments` as a tuple, remembered for the bodies met again and again."""
    return tuple(zonal_moments(radius, inner_radius, half_height, order).tolist())


def terms_needed(ratio: float, tolerance: float = SERIES_TOLERANCE, shape: tuple | None = None) -> int:
    """Highest even degree L after which the series' rest is below ``tolerance`` [-].

    Parameters
    ----------
    ratio : float
        s = R / r at the nearest point, 0 <= s <= ``MAX_RATIO``.
    tolerance : float
        Bound on the rest, relative to |J| V / (4 pi r^3).
    shape : (radius, inner_radius, half_height), optional
        The cylinder or ring [m]: its own moments then replace the bound |c_l| <= c_0 R^l,
        which shortens the series by about six degrees at s = 0.25.

    Returns
    -------
    int
        Even L such that sum over even l > L of b_l mu_l s^l <= tolerance, with
        b_l = (l+1)(l+2) [(l+3)(l+4)/8 + l + 9/2] and mu_l = 1, or with ``shape``
        mu_l = |c_l| / (c_0 R^l) (plus its rounding bound, at most 1).

    Notes
    -----
    |c_l| <= V R^l / (4 pi) since |r'^l P_l| <= R^l inside the bounding sphere. On [-1, 1]
    |P_n| <= 1, |P'_n| <= n(n+1)/2 and |P''_n| <= (n-1)n(n+1)(n+2)/8 (Abramowitz & Stegun
    22.14.7 and Markov's inequality). In units of V / (4 pi r^3) and with rho / r <= 1, the
    degree-l terms of |W|, |G| rho^2, 2 |K| rho and |F| are then at most (l+1)(l+2)/2,
    (l+1)(l+2)(l+3)(l+4)/8, (l+1)(l+2)(l+3) and (l+1)(l+2) times s^l, and
    |B| <= (|W| + |G| rho^2 + 2 |K| rho + |F|) |J|; b_l is their sum. The dipole field at
    r is at least |J| V / (4 pi r^3) in magnitude, so the rest is also relative to it.
    The bound is far from tight (Markov's bound is reached only at x = +-1, and the moments
    of real shapes are smaller than V R^l / 4 pi): two degrees fewer than L still leave a
    rest of 1e-13 or less in the tests. The ratio is rounded up to a grid of 1/200 (a
    larger s only lengthens the series), so the answer is looked up once per grid value.

    Examples
    --------
    >>> terms_needed(0.1)
    14
    """
    if not 0.0 <= ratio < 1.0:
        raise ValueError(f"the series needs points beyond the bounding sphere; R/r = {ratio}")
    if shape is not None and ratio > 0.5:  # the shape's moments are summed to degree 600 only
        shape = None
    return _terms_on_grid(math.ceil(ratio * 200.0) / 200.0, tolerance,
                          None if shape is None else tuple(float(v) for v in shape))


@lru_cache(maxsize=512)
def _terms_on_grid(ratio: float, tolerance: float, shape: tuple | None) -> int:
    if shape is None:
        degrees = np.arange(0.0, 2000.0, 2.0)
        ratios = 1.0
    else:  # beyond degree 600 the terms are below 0.5^600 600^4: nothing
        degrees, ratios = _TAIL_DEGREES, _moment_ratios(*shape)
    bounds = (degrees + 1) * (degrees + 2) * ((degrees + 3) * (degrees + 4) / 8 + degrees + 4.5)
    with np.errstate(under="ignore"):
        terms = bounds * ratios * ratio**degrees
    rest = np.cumsum(terms[::-1])[::-1]  # rest[j] = sum over degrees >= 2j
    # L = 2j is enough when the terms from 2j + 2 on sum to at most the tolerance
    enough = np.flatnonzero(rest[1:] <= tolerance)
    if not len(enough):
        raise ValueError(f"R/r = {ratio} is too close to 1 for the series")
    return int(2 * enough[0])


#: Degrees whose moments enter :func:`derivative_bound_factors` exactly; beyond, |c_l| <= c_0 R^l.
EXACT_DEGREES = 100


#: Largest R / r and number of grid cells of the tabulated derivative-bound factors.
FACTOR_MAX_RATIO = 0.85
FACTOR_CELLS = 512


@lru_cache(maxsize=256)
def derivative_bound_factors(radius: float, inner_radius: float, half_height: float,
                             orders: tuple = (0, 1, 2, 3), max_ratio: float = FACTOR_MAX_RATIO,
                             cells: int = FACTOR_CELLS) -> np.ndarray:
    """Factors S_n(q) of the bounds ||D^n B|| <= (n+2)! k m S_n(R/r) / r^(n+3), tabulated.

    Parameters
    ----------
    radius, inner_radius, half_height : float
        The cylinder or ring [m] (only their ratios to the bounding radius R matter).
    orders : tuple of int
        Derivative orders n [-].
    max_ratio : float
        Largest q = R / r tabulated [-].
    cells : int
        Grid cells on [0, max_ratio].

    Returns
    -------
    ndarray (len(orders), cells + 1)
        Row n, column j: S_n at q_j = max_ratio j / cells, which bounds S_n(q) for every
        q in (q_{j-1}, q_j] because S_n grows with q. Look up column ceil(q / max_ratio cells).

    Notes
    -----
    With Phi = sum c_l u_l, u_l = P_l(cos theta) / r^(l+1) = ((-1)^l / l!) d^l/dz^l (1/r)
    (Jackson 1999, eq. 3.70 and sec. 3.6), and B = (D^2 Phi) J outside the body,
    ||D^n B|| <= |J| sum_l |c_l| ||D^(n+2) u_l|| <= |J| sum_l |c_l| (n+2+l)! / (l! r^(n+l+3)),
    the n-th derivative norm of 1/r being n!/r^(n+1) (Legendre generating function, |P_n| <= 1,
    and Banach's theorem on symmetric multilinear forms; see planner.physics.zones.bounds).
    With k m = |J| c_0 and mu_l = |c_l| / (c_0 R^l) <= 1:
    S_n(q) = sum over even l of mu_l C(n+2+l, l) q^l. The moments are exact (plus their
    rounding bound, capped at 1) up to degree ``EXACT_DEGREES``; beyond, mu_l = 1. For q
    near 1 this is far below the bound (1 - q)^-(n+3) that |c_l| <= c_0 R^l alone gives:
    at q = 0.8, S_2 is about 3 for a flat disc instead of 3125.

    References
    ----------
    J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), eq. 3.70 and sec. 3.6.
    S. Banach, Studia Math. 7, 36-44 (1938).
    """
    return _factor_table(_moment_ratios(radius, inner_radius, half_height), orders, max_ratio, cells)


def _factor_table(ratio, orders, max_ratio, cells):
    """S_n on the grid (len(orders), cells + 1) from the moment ratios ``ratio`` over ``_TAIL_DEGREES``."""
    powers = _ratio_powers(max_ratio, cells)
    table = np.empty((len(orders), cells + 1))
    for row, order in enumerate(orders):
        # C(n+2+l, l) = (l+1)(l+2)...(l+n+2) / (n+2)!, a polynomial in l
        binomial = np.prod([(_TAIL_DEGREES + j) / j for j in range(1, order + 3)], axis=0)
        table[row] = powers @ (ratio * binomial)
    # the terms beyond the last degree summed here are below 1e-25 of the first at q <= 0.85
    return table * (1 + 1e-12)  # summation rounding, outward


@lru_cache(maxsize=256)
def block_bound_factors(size: tuple, orders: tuple = (0, 1, 2, 3), max_ratio: float = FACTOR_MAX_RATIO,
                        cells: int = FACTOR_CELLS) -> np.ndarray:
    """The factors of :func:`derivative_bound_factors` for a block of edges ``size`` (3,) [m].

    Parameters
    ----------
    size : tuple of float
        Edge lengths [m] (only their ratios to the bounding radius R, the half-diagonal, matter).
    orders, max_ratio, cells : as for :func:`derivative_bound_factors`.

    Returns
    -------
    ndarray (len(orders), cells + 1)
        S_n on the same grid, looked up the same way.

    Notes
    -----
    A block has no zonal series, but the same argument holds term by term in the expansion
    1/|r - r'| = sum_l ((-r' . grad)^l / l!) (1/r): the degree-l part of Phi is
    (1/4 pi) integral ((-r' . grad)^l / l!) (1/r) dV', whose (n+2)-th derivative has norm at
    most (n+2+l)!/(l! r^(n+l+3)) times (1/4 pi) integral |r'|^l dV' (the (n+2+l)-th
    derivative of 1/r has norm (n+2+l)!/r^(n+l+3)). So mu_l = mean of |r'|^l / R^l, from the
    means of the coordinates' even powers (edge half-lengths h_i: mean of x_i^(2k) =
    h_i^(2k) / (2k + 1), combined multinomially); odd degrees vanish, the block being
    symmetric about its centre. For l = 2 the degree-2 part is (1/2) sum S_ij d_i d_j (1/r)
    (S the second moments of the volume); as 1/r is harmonic, S may be replaced by its
    traceless part S0, whose eigenvalues give (n+4)!/2 sum |lambda| / r^(n+5) instead: mu_2
    is the smaller of trace(S) and sum |lambda|, over V R^2 (zero for a cube, whose degree-2
    part vanishes). Exact to degree ``_BLOCK_EXACT_DEGREES``; beyond, mu_l = 1 (|r'| <= R).
    At R / r = 0.4 this bounds the second derivatives of a 30 x 20 x 8 mm block's field
    beyond its dipole about 30 times tighter than the Taylor remainder
    (order + 4)!/2 k m s^2 / (r - R)^(order + 5).
    """
    half = np.asarray(size, dtype=float) / 2
    reach = float(np.linalg.norm(half))
    count = _BLOCK_EXACT_DEGREES // 2 + 1
    # per axis, the mean of (x / R)^(2k) for k = 0 .. count - 1
    axes = [[(h / reach) ** (2 * k) / (2 * k + 1) for k in range(count)] for h in half]
    ratio = np.ones(len(_TAIL_DEGREES))
    for j in range(count):
        ratio[j] = math.fsum(math.factorial(j) / (math.factorial(a) * math.factorial(b) * math.factorial(j - a - b))
                             * axes[0][a] * axes[1][b] * axes[2][j - a - b]
                             for a in range(j + 1) for b in range(j - a + 1))
    second = np.array([axes[0][1], axes[1][1], axes[2][1]])  # S / (V R^2) on the diagonal
    ratio[1] = min(float(np.sum(second)), float(np.sum(np.abs(second - np.sum(second) / 3))))
    return _factor_table(np.minimum(ratio * (1 + 1e-13), 1.0), orders, max_ratio, cells)


#: Degrees whose moments enter :func:`block_bound_factors` exactly; beyond, mu_l = 1.
_BLOCK_EXACT_DEGREES = 40


#: Degrees summed in the derivative-bound factors (even; beyond 600 the terms are negligible).
_TAIL_DEGREES = np.arange(0, 601, 2, dtype=float)


@lru_cache(maxsize=256)
def _moment_ratios(radius: float, inner_radius: float, half_height: float) -> np.ndarray:
    """mu_l = |c_l| / (c_0 R^l) (plus rounding, at most 1) for ``_TAIL_DEGREES``; 1 beyond degree 100."""
    reach = math.hypot(radius, half_height)
    moments, rounding = zonal_moments(radius / reach, inner_radius / reach, half_height / reach,
                                      EXACT_DEGREES, with_rounding=True)
    ratio = np.ones(len(_TAIL_DEGREES))
    ratio[:len(moments)] = np.minimum((np.abs(moments) + rounding) / moments[0], 1.0)
    return ratio


@lru_cache(maxsize=8)
def _ratio_powers(max_ratio: float, cells: int) -> np.ndarray:
    """q_j^l on the grid q_j = max_ratio j / cells, for the degrees ``_TAIL_DEGREES`` (cells + 1, L)."""
    grid = max_ratio * np.arange(cells + 1) / cells
    with np.errstate(under="ignore"):
        return grid[:, None] ** _TAIL_DEGREES[None, :]


@lru_cache(maxsize=64)
def _series_matrix(order: int) -> np.ndarray:
    """Monomial coefficients (degree in x, series) of the four series' polynomials.

    Column blocks, each over l = 0, 2, ..., order (without the moments c_l R^l):
    F: (l+1)(l+2) P_{l+2}; K: (l+1) P'_{l+2}; W: -P'_{l+1}; G: x P''_{l+1} + (l+3) P'_{l+1}.
    """
    degrees = range(0, order + 1, 2)
    rows = order + 3
    matrix = np.zeros((rows, 4, len(degrees)))
    x_poly = np.array([0.0, 1.0])
    for column, l in enumerate(degrees):
        p_next = legendre.leg2poly(np.eye(l + 3)[l + 2])
        p_one = legendre.leg2poly(np.eye(l + 2)[l + 1])
        blocks = [
            (l + 1) * (l + 2) * p_next,
            (l + 1) * polynomial.polyder(p_next),
            -polynomial.polyder(p_one),
            polynomial.polyadd(polynomial.polymul(x_poly, polynomial.polyder(p_one, 2)),
                               (l + 3) * polynomial.polyder(p_one)),
        ]
        for block, coefficients in enumerate(blocks):
            matrix[:len(coefficients), block, column] = coefficients
    return matrix


def _powers(values, count):
    """Rows values^0 ... values^(count-1), shape (count, n), by doubling (few array operations)."""
    table = np.empty((count, len(values)))
    table[0] = 1.0
    if count > 1:
        table[1] = values
    filled, step = 2, values * values
    while filled < count:
        width = min(filled, count - filled)
        np.multiply(table[:width], step, out=table[filled:filled + width])
        filled += width
        step = step * step if filled == 2 * width else step
    return table


@lru_cache(maxsize=256)
def _scaled_series(moments: tuple, bounding_radius: float) -> np.ndarray:
    """(4 series x even degrees, powers of x) coefficients with c_l / R^l folded in."""
    order = 2 * (len(moments) - 1)
    scaled = np.asarray(moments) / bounding_radius ** np.arange(0, order + 1, 2)
    matrix = _series_matrix(order) * scaled  # (powers of x, series, degrees)
    return np.ascontiguousarray(matrix.reshape(order + 3, -1).T)


def axisymmetric_series_field(points, moments, bounding_radius: float, polarization) -> np.ndarray:
    """B of an axially symmetric body from its zonal moments, outside its bounding sphere.

    Parameters
    ----------
    points : array (n, 3)
        Field points in the body frame (origin at the centre, z on the axis) [m], all at
        least ``bounding_radius`` / s from the centre, where s < 1 sets the length of
        series needed (see :func:`terms_needed`).
    moments : sequence (L // 2 + 1,)
        c_0, c_2, ..., c_L from :func:`zonal_moments` [m^(l+3)]; L from
        :func:`terms_needed` at the nearest point's s.
    bounding_radius : float
        R [m].
    polarization : array (3,)
        J in the body frame [T].

    Returns
    -------
    ndarray (n, 3)
        B in the body frame [T].

    Notes
    -----
    With u_l = P_l(x)/r^(l+1): d/dz u_l = -(l+1) u_{l+1} and d/drho u_l = -rho P'_{l+1}(x)
    / r^(l+3) (Jackson 1999, sec. 3.6; Abramowitz & Stegun 8.5.3-8.5.4). The Hessian of an
    axially symmetric Phi at q = (x, y, 0) across the axis is

        H = W (e_x e_x + e_y e_y) + G q q^T + K (q e_z^T + e_z q^T) + F e_z e_z^T,

    W = Phi_rho / rho = -sum c_l P'_{l+1} / r^(l+3),
    G = (1/rho) dW/drho = sum c_l [x P''_{l+1} + (l+3) P'_{l+1}] / r^(l+5),
    K = Phi_rho_z / rho = sum c_l (l+1) P'_{l+2} / r^(l+4),
    F = Phi_zz = sum c_l (l+1)(l+2) P_{l+2} / r^(l+3),

    so that B = H J = W J_t + G (q . J) q + K (J_z q + (q . J) e_z) + F J_z e_z. Laplace's
    equation, 2 W + G rho^2 + F = 0, holds term by term (checked in the tests). Each
    series is sum_l sum_j a_jl x^j s^l with s = R/r: two tables of powers, one matrix
    product and one contraction, whatever the number of terms.

    Examples
    --------
    A sphere is its l = 0 term alone: the dipole field, on the axis 2 J V / (4 pi r^3).

    >>> c = [4 / 3 * np.pi / (4 * np.pi)]  # unit sphere, c_0 = V / 4 pi
    >>> B = axisymmetric_series_field([[0.0, 0.0, 2.0]], c, 1.0, [0.0, 0.0, 1.0])
    >>> bool(np.isclose(B[0, 2], 2 * (4 / 3 * np.pi) / (4 * np.pi * 8)))
    True
    """
    points = np.asarray(points, dtype=float).reshape(-1, 3)
    moments = tuple(float(c) for c in moments)
    jx, jy, jz = np.asarray(polarization, dtype=float).reshape(3).tolist()
    degrees = len(moments)
    x, y, z = points[:, 0], points[:, 1], points[:, 2]
    r2 = x * x + y * y + z * z
    inverse_r = 1.0 / np.sqrt(r2)
    polynomials = _scaled_series(moments, float(bounding_radius)) @ _powers(z * inverse_r, 2 * degrees + 1)
    ratio_powers = _powers((bounding_radius * bounding_radius) / r2, degrees)  # s^l, even l
    f, k, w, g = np.einsum("qln,ln->qn", polynomials.reshape(4, degrees, -1), ratio_powers)
    inverse_r3 = inverse_r * inverse_r * inverse_r
    w *= inverse_r3
    g *= inverse_r3 * inverse_r * inverse_r
    k *= inverse_r3 * inverse_r
    f *= inverse_r3
    q_dot_j = x * jx + y * jy
    across = g * q_dot_j + k * jz
    field = np.empty_like(points)
    field[:, 0] = w * jx + across * x
    field[:, 1] = w * jy + across * y
    field[:, 2] = k * q_dot_j + f * jz
    return field
