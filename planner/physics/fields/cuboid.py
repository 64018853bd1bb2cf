"""Field of a uniformly magnetized rectangular block (cuboid), in the body frame.

Body frame: origin at the centre, axes along the edges. Points (n, 3) [m], polarization
J (3,) [T] in that frame, B [T].
"""
from __future__ import annotations

import numpy as np

from planner.physics.fields.chunking import in_blocks, without_rounding_noise

_FOUR_PI = 4.0 * np.pi
_TINY = np.finfo(float).tiny


def block_field(points, size, polarization):
    """Flux density of a uniformly magnetized cuboid, any magnetization direction.

    Parameters
    ----------
    points : array (n, 3)
        Field points in the body frame (origin at the centre, axes along the edges) [m].
    size : array (3,)
        Edge lengths along body x, y, z [m].
    polarization : array (3,)
        J = mu0 M in the body frame [T].

    Returns
    -------
    ndarray (n, 3)
        B in the body frame [T].

    Notes
    -----
    With half-sides h, corners x_i = -+h_x (i = 0, 1) etc., X = x - x_i, Y, Z likewise,
    r = sqrt(X^2 + Y^2 + Z^2) and corner sign s = (-1)^(i+j+k), B = T J + J inside with

        T_xx = -(1/4 pi) sum s atan(Y Z / (X r))   (and cyclically for yy, zz)
        T_xy = (1/4 pi) sum s ln(Z + r)            (T_xz with Y, T_yz with X)

    The point is first reflected into the octant x, y, z >= 0 (the diagonal of T is even
    in each coordinate, T_xy odd in x and in y); there every log argument that can be
    negative is taken in the cancellation-free form Z + r = (X^2 + Y^2)/(r - Z) for Z < 0,
    and the only remaining singular points are those on the block's own edges
    (Cichon et al. 2019). When J has all three components, T_zz is taken from Poisson's
    equation for the shape's potential, T_xx + T_yy + T_zz = -1 inside (1/2 on a face),
    0 outside. Exact everywhere else. On a face the normal component is exact
    and the tangential components (which jump there) are the mean of the two sides; on an
    edge or corner the field diverges and NaN is returned.

    References
    ----------
    R. Engel-Herbert and T. Hesjedal, J. Appl. Phys. 97, 074504 (2005).
    Z. J. Yang et al., Supercond. Sci. Technol. 3, 591 (1990).
    D. Cichon, R. Psiuk, H. Brauer and H. Toepfer, IEEE Sensors J. 19, 2509-2516 (2019).

    Examples
    --------
    Unit cube, J = (0, 0, 1) T, point (1, 1, 1) m (physics.md check value):

    >>> B = block_field([[1.0, 1.0, 1.0]], [1.0, 1.0, 1.0], [0.0, 0.0, 1.0])
    >>> [round(float(v), 5) for v in B[0]]
    [0.01561, 0.01561, 0.0]
    """
    half = np.asarray(size, dtype=float).reshape(3) / 2.0
    polarization = without_rounding_noise(polarization)
    return in_blocks(_block_field_block, points, half, polarization)


_PAIRS = ((0, 1), (0, 2), (1, 2))


def _block_field_block(points, half, polarization):
    """:func:`block_field` for one block of points (see there); ``half`` = half-sides."""
    folded = np.abs(points)
    # differences to the minus corner (x + h > 0) and to the plus corner (x - h, any sign)
    diff = [(folded[:, axis] + half[axis], folded[:, axis] - half[axis]) for axis in range(3)]
    squares = [(d[0] * d[0], d[1] * d[1]) for d in diff]
    # rows inside the slab |x| < h of each axis: there x - h < 0, and ln(x - h + r) is taken
    # in the cancellation-free form ln((r^2 - (x - h)^2) / (r - (x - h))) on those rows only
    within = [np.flatnonzero(diff[axis][1] < 0) for axis in range(3)]
    active = polarization != 0.0
    diagonal_axes = [axis for axis in range(3) if active[axis]]
    # with all three needed, T_zz follows from Poisson's equation, trace T = -inside
    from_trace = len(diagonal_axes) == 3
    if from_trace:
        diagonal_axes = [0, 1]
    pairs = [pair for pair in _PAIRS if active[pair[0]] or active[pair[1]]]
    # running sums over the corners, started by the first corner that contributes
    diagonal = dict.fromkeys(diagonal_axes)
    products = {pair: [None, None] for pair in pairs}  # corner sign s = +1, s = -1
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for i in range(2):
            for j in range(2):
                xy = diff[0][i] * diff[1][j]
                r_squared_xy = squares[0][i] + squares[1][j]
                for k in range(2):
                    index = (i, j, k)
                    negative = (i + j + k) % 2
                    r = np.add(r_squared_xy, squares[2][k])
                    np.sqrt(r, out=r)
                    xyz = xy * diff[2][k] if diagonal_axes else None
                    for axis in diagonal_axes:
                        # atan(u v / (w r)) = atan(x y z / (w^2 r)); the tiny term makes it 0
                        # for w = 0, the mean of the two sides of that face plane
                        angle = np.multiply(squares[axis][index[axis]], r)
                        angle += _TINY
                        np.divide(xyz, angle, out=angle)
                        np.arctan(angle, out=angle)
                        if diagonal[axis] is None:
                            diagonal[axis] = angle if negative else np.negative(angle, out=angle)
                        elif negative:
                            diagonal[axis] += angle
                        else:
                            diagonal[axis] -= angle
                    for pair in pairs:
                        along = 3 - pair[0] - pair[1]
                        d = diff[along][index[along]]
                        term = np.add(d, r)  # d > 0 for the minus corner
                        rows = within[along]
                        if index[along] == 1 and rows.size:
                            across = (squares[pair[0]][index[pair[0]]][rows]
                                      + squares[pair[1]][index[pair[1]]][rows])
                            term[rows] = across / (r[rows] - d[rows])
                        if products[pair][negative] is None:
                            products[pair][negative] = term
                        else:
                            products[pair][negative] *= term
        flipped = points < 0  # T_xy is odd in x and in y
        offdiagonal = {}
        for pair in pairs:
            value = np.divide(products[pair][0], products[pair][1])
            np.log(value, out=value)
            value *= 1.0 / _FOUR_PI
            offdiagonal[pair] = np.where(flipped[:, pair[0]] ^ flipped[:, pair[1]], -value, value)
    with np.errstate(invalid="ignore"):  # NaN rows (edges) are expected here
        inside = ((folded[:, 0] < half[0]) & (folded[:, 1] < half[1])
                  & (folded[:, 2] < half[2])).astype(float)
        if np.any(folded == half):  # on a face: the mean of inside (1) and outside (0)
            inside = np.ones(len(points))
            for axis in range(3):
                inside *= np.heaviside(half[axis] - folded[:, axis], 0.5)
        field = np.empty_like(points)
        if from_trace:
            diagonal[2] = -_FOUR_PI * inside - diagonal[0] - diagonal[1]
            diagonal_axes = [0, 1, 2]
        for axis in range(3):
            column = field[:, axis]
            if axis in diagonal:
                np.multiply(diagonal[axis], polarization[axis] / _FOUR_PI, out=column)
                column += inside * polarization[axis]
            else:
                column[...] = 0.0
        for first, second in pairs:
            field[:, first] += offdiagonal[(first, second)] * polarization[second]
            field[:, second] += offdiagonal[(first, second)] * polarization[first]
        finite = np.isfinite(field[:, 0] + field[:, 1] + field[:, 2])
        if not finite.all():
            field[~finite] = np.nan
    return field


def block_on_axis_field(distance, width, depth, length, remanence):
    """Flux density on the magnetization axis of a block, outside a pole face [T].

    Parameters
    ----------
    distance : float or ndarray
        Distance from the pole face along the axis through its centre, d >= 0 [m].
    width, depth : float
        Sides a, b of the pole face [m].
    length : float
        Length L of the block along J [m].
    remanence : float
        Br = J [T].

    Returns
    -------
    float or ndarray
        Axial B [T].

    Notes
    -----
    B(d) = (Br/pi) [atan(a b / (2 d sqrt(4 d^2 + a^2 + b^2)))
    - atan(a b / (2 (d + L) sqrt(4 (d + L)^2 + a^2 + b^2)))]; the first term is pi/2 at
    the face (d = 0). Exact on the axis for uniform magnetization.

    References
    ----------
    A. Camacho and V. Sosa, Rev. Mex. Fis. E 59, 8-17 (2013).

    Examples
    --------
    A long block: at the face B tends to Br/2.

    >>> round(float(block_on_axis_field(0.0, 1.0, 1.0, 1e6, 1.0)), 6)
    0.5
    """
    d = np.asarray(distance, dtype=float)
    area = width * depth
    sides_squared = width**2 + depth**2

    def angle(s):
        return np.arctan2(area, 2.0 * s * np.sqrt(4.0 * s * s + sides_squared))

    value = remanence / np.pi * (angle(d) - angle(d + length))
    return value if value.ndim else float(value)
